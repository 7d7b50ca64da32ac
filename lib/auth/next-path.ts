import { env } from "@/lib/env";

// The one check for every place a path to go back to arrives from outside (`next` after signing in,
// signing up or confirming an address). Browsers drop tabs and newlines from URLs and read "\" as
// "/", so "/\t/evil.example" is "//evil.example" to them: such characters are refused outright, and
// what remains is resolved against APP_URL the way a browser resolves a Location header.

// C0 controls, DEL, and the backslash.
const REFUSED = /[\u0000-\u001f\u007f\\]/;

/** A same-origin path (with its query and fragment) to send someone to, or undefined. */
export function safeNextPath(next: string | undefined | null): string | undefined {
  if (typeof next !== "string" || next.length === 0 || next.length > 500) return undefined;
  if (!next.startsWith("/") || REFUSED.test(next)) return undefined;
  let url: URL;
  try {
    url = new URL(next, env.APP_URL);
  } catch {
    return undefined;
  }
  if (url.origin !== new URL(env.APP_URL).origin) return undefined;
  const path = `${url.pathname}${url.search}${url.hash}`;
  // "/..//x" resolves to the path "//x", which a browser would again read as another host.
  if (path.startsWith("//")) return undefined;
  return path;
}
