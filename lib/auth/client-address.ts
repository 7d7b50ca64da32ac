import type http from "node:http";
import { randomBytes } from "node:crypto";
import net, { isIP } from "node:net";

// The address a request came from, for per-address rate limits.
//
// Route handlers and server actions see headers only, never the socket, and `next start` fills in
// X-Forwarded-For from the socket only when the request did not bring one (base-server.js:
// `req.headers['x-forwarded-for'] ??= socket.remoteAddress`), so a client that sends its own
// X-Forwarded-For names any address it likes. So the address is taken where the socket is still in
// reach: instrumentation.ts installs stampClientAddresses() at start-up, which puts the socket's
// address (or, with TRUST_PROXY = n, the address the n-th proxy in front reports) into a header of
// our own before Next.js sees the request. The header carries a random per-process key, so a value a
// client sends itself (say, in the moment before the hook is installed) is never believed.

export const CLIENT_ADDRESS_HEADER = "x-grainward-client";
const KEY = Symbol.for("grainward.client-address-key");
type Holder = { [KEY]?: string };

/** "::ffff:203.0.113.9" → "203.0.113.9"; anything that isn't an IP address → undefined. */
function normalise(address: string | undefined): string | undefined {
  const a = address?.trim().replace(/^::ffff:(?=\d+\.\d+\.\d+\.\d+$)/i, "");
  return a && isIP(a) ? a : undefined;
}

/**
 * The client's address: the socket's peer when no proxy is trusted; with `trustProxy` = n proxies in
 * front, the address the outermost of them saw, read from the right of X-Forwarded-For (each proxy
 * appends the address it was reached from, so entries left of the trusted ones can be made up).
 */
export function resolveClientAddress(peer: string | undefined, forwardedFor: string | string[] | undefined, trustProxy: number): string {
  const forwarded = (Array.isArray(forwardedFor) ? forwardedFor.join(",") : (forwardedFor ?? "")).split(",").filter((s) => s.trim());
  // Nearest hop last: [...what the proxies reported, the socket's peer].
  const chain = [...forwarded, peer ?? ""];
  let address = normalise(peer);
  for (let hop = 1; hop <= trustProxy && hop < chain.length; hop++) {
    const reported = normalise(chain[chain.length - 1 - hop]);
    if (!reported) break; // a trusted proxy reports addresses; anything else is not believed
    address = reported;
  }
  return address ?? "unknown";
}

/** Installs the stamp on every HTTP server of this process (instrumentation.ts calls it once). */
export function stampClientAddresses(trustProxy: number): void {
  const holder = globalThis as Holder;
  if (holder[KEY]) return;
  const key = randomBytes(16).toString("hex");
  holder[KEY] = key;
  // net.Server: the parent of both http.Server and https.Server, which emit "request" through it.
  type Emit = (this: net.Server, event: string | symbol, ...args: unknown[]) => boolean;
  const emit = net.Server.prototype.emit as Emit;
  net.Server.prototype.emit = function (this: net.Server, event: string | symbol, ...args: unknown[]) {
    if (event === "request") {
      const req = args[0] as http.IncomingMessage;
      const address = resolveClientAddress(req.socket?.remoteAddress, req.headers["x-forwarded-for"], trustProxy);
      req.headers[CLIENT_ADDRESS_HEADER] = `${key} ${address}`;
    }
    return emit.call(this, event, ...args);
  } as Emit as typeof net.Server.prototype.emit;
}

/** The stamped address from a request's headers; "unknown" when the stamp is missing or forged. */
export function clientAddressFromHeader(value: string | null | undefined): string {
  const key = (globalThis as Holder)[KEY];
  if (!key || !value) return "unknown";
  const [given, address] = value.split(" ");
  return given === key && address ? address : "unknown";
}
