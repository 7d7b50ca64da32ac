// The headers every answer carries (next.config.mjs applies them to every path). Plain JavaScript
// because next.config.mjs loads it before TypeScript is compiled; tests/unit/security-headers.test.ts
// checks it.

/**
 * @param {{ appUrl: string | undefined; dev: boolean }} opts
 * @returns {{ key: string; value: string }[]}
 */
export function securityHeaders({ appUrl, dev }) {
  // Next.js inlines small scripts, hence 'unsafe-inline' for scripts; 'unsafe-eval' only for the
  // development server. A per-request nonce instead would make every page render per request,
  // including the public pages that are built once today, and every prefetch pass through proxy.ts.
  const csp = [
    "default-src 'self'",
    `script-src 'self' 'unsafe-inline'${dev ? " 'unsafe-eval'" : ""}`,
    "style-src 'self' 'unsafe-inline'",
    "img-src 'self' data: blob:",
    "font-src 'self'",
    "connect-src 'self'",
    "frame-src 'self'",
    "frame-ancestors 'none'",
    "base-uri 'self'",
    "object-src 'none'",
  ].join("; ");
  const headers = [
    { key: "Content-Security-Policy", value: csp },
    { key: "X-Content-Type-Options", value: "nosniff" },
    { key: "Referrer-Policy", value: "strict-origin-when-cross-origin" },
    { key: "X-Frame-Options", value: "DENY" },
    { key: "Permissions-Policy", value: "camera=(self), microphone=(), geolocation=()" },
  ];
  // Browsers ignore HSTS over plain http; it is sent only where the app is served over https, so a
  // local http run never pins localhost. Two years, the preload lists' minimum (hstspreload.org).
  if (appUrl && new URL(appUrl).protocol === "https:") {
    headers.push({ key: "Strict-Transport-Security", value: "max-age=63072000; includeSubDomains" });
  }
  return headers;
}
