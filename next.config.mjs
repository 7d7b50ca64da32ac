import { securityHeaders } from "./lib/http/security-headers.mjs";

const dev = process.env.NODE_ENV !== "production";
// `npm run bench` builds with GRAINWARD_BENCH_BUILD=1, which adds the files named *.bench.ts under app/
// (the benchmark's bare-route floor, app/api/bench/same-json/route.bench.ts); every other build leaves
// them out. "bench.ts" comes first so that it, not "ts", is the extension of route.bench.ts.
const pageExtensions = process.env.GRAINWARD_BENCH_BUILD === "1" ? ["bench.ts", "tsx", "ts", "jsx", "js"] : ["tsx", "ts", "jsx", "js"];

/**
 * The hosts (name[:port]) whose pages may call server actions besides the host a request was sent
 * to: APP_URL's and ALLOWED_ORIGINS' (comma-separated origins, lib/env.ts), the same addresses route
 * handlers accept (lib/http/origin.ts). Read when the server starts: set ALLOWED_ORIGINS there.
 */
export function actionOrigins(env = process.env) {
  const origins = [env.APP_URL, ...(env.ALLOWED_ORIGINS ?? "").split(",")].map((s) => s?.trim()).filter(Boolean);
  const hosts = [];
  for (const origin of origins) {
    try {
      hosts.push(new URL(origin).host);
    } catch {
      // lib/env.ts refuses it at start-up with a message saying how to write it.
    }
  }
  return [...new Set(hosts)];
}

/** @type {import('next').NextConfig} */
const nextConfig = {
  reactStrictMode: true,
  poweredByHeader: false,
  pageExtensions,
  // Native modules stay outside the server bundle.
  serverExternalPackages: ["better-sqlite3", "@node-rs/argon2", "sharp", "@react-email/render", "@react-email/components", "nodemailer"],
  experimental: {
    // Server actions here take short forms (no files: uploads go to the API routes, read by
    // lib/http/body.ts), so a body over 256 kB is refused with a 413. The proxy's copy of a page
    // request's body must stay above it: a body cut off at the proxy's limit would reach the action
    // truncated instead of refused.
    serverActions: { bodySizeLimit: "256kb", allowedOrigins: actionOrigins() },
    proxyClientMaxBodySize: "512kb",
  },
  async headers() {
    // APP_URL as the build sees it decides HSTS; build with the same APP_URL the server runs with.
    return [{ source: "/:path*", headers: securityHeaders({ appUrl: process.env.APP_URL, dev }) }];
  },
};

export default nextConfig;
