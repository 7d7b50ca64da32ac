import "server-only";
import { env } from "@/lib/env";
import { forbidden } from "@/lib/errors";

// Which addresses of this install may send state-changing requests: APP_URL, every origin in
// ALLOWED_ORIGINS (a second name, the address on the studio's own network), and the address the
// request itself was sent to (what Next.js checks for server actions too, next.config.mjs). A request
// that sends no Origin (a script, an old client) carries no browser cookies of another site's making
// and is let through, as Next.js does.

const SAFE_METHODS = new Set(["GET", "HEAD", "OPTIONS"]);

/** APP_URL's origin first (the address we point people to), then ALLOWED_ORIGINS. */
export function installOrigins(): string[] {
  return [...new Set([new URL(env.APP_URL).origin, ...env.ALLOWED_ORIGINS])];
}

/** Refuses a state-changing request sent from a page of another address, saying which address to use. */
export function checkOrigin(req: Request, ownOrigin: string): void {
  if (SAFE_METHODS.has(req.method)) return;
  const origin = req.headers.get("origin");
  if (!origin) return;
  if (origin === ownOrigin || installOrigins().includes(origin)) return;
  throw forbidden(
    `This was sent from a page at ${origin === "null" ? "an address we can't see" : origin}, which isn't an address of this Grainward. Open ${env.APP_URL} and try again there.`,
  );
}
