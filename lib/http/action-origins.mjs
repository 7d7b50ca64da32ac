// Read by next.config.mjs (plain JavaScript, no path aliases), typed by action-origins.d.mts.

/**
 * The largest server-action request body: actions take short forms (uploads go to the API routes, read
 * by lib/http/body.ts). next.config.mjs gives it to Next.js, and proxy.ts refuses a declared longer
 * body with a 413 first (Next.js itself answers one with a 500).
 */
export const ACTION_BODY_LIMIT_BYTES = 256 * 1024;

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
