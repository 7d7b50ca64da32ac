import { cookies, headers } from "next/headers";
import { cache } from "react";
import type { Session, User } from "lucia";
import { sha256Hex, randomToken } from "@/lib/crypto";
import { CLIENT_ADDRESS_HEADER, clientAddressFromHeader } from "./client-address";
import { getLucia, SESSION_COOKIE } from "./lucia";

export type SessionResult = { user: User; session: Session } | { user: null; session: null };

// The cookie holds a random token; the session row's id is its SHA-256 (lucia accepts a given id).
export const getCurrentSession = cache(async (): Promise<SessionResult> => {
  // cookies() first: it marks the page dynamic before anything opens the database at build time.
  const jar = await cookies();
  const token = jar.get(SESSION_COOKIE)?.value;
  if (!token || token.length > 100) return { user: null, session: null };
  const lucia = getLucia();
  const result = await lucia.validateSession(sha256Hex(token));
  try {
    if (result.session?.fresh) setCookie(jar, lucia.createSessionCookie(token));
    if (!result.session) setCookie(jar, lucia.createBlankSessionCookie());
  } catch {
    // Server components cannot set cookies; the next action or route handler will.
  }
  return result;
});

type Jar = Awaited<ReturnType<typeof cookies>>;
type LuciaCookie = ReturnType<ReturnType<typeof getLucia>["createSessionCookie"]>;
function setCookie(jar: Jar, cookie: LuciaCookie) {
  jar.set(cookie.name, cookie.value, cookie.attributes);
}

/** Starts a new session (a new id every sign-in) and sets its cookie. */
export async function startSession(userId: string): Promise<void> {
  const lucia = getLucia();
  const token = randomToken(24);
  await lucia.createSession(userId, {}, { sessionId: sha256Hex(token) });
  setCookie(await cookies(), lucia.createSessionCookie(token));
}

export async function endCurrentSession(): Promise<void> {
  const lucia = getLucia();
  const { session } = await getCurrentSession();
  if (session) await lucia.invalidateSession(session.id);
  setCookie(await cookies(), lucia.createBlankSessionCookie());
}

export async function endAllSessions(userId: string): Promise<void> {
  await getLucia().invalidateUserSessions(userId);
}

/** The caller's address for per-address rate limits (see lib/auth/client-address.ts and TRUST_PROXY). */
export async function clientIp(): Promise<string> {
  return clientAddressFromHeader((await headers()).get(CLIENT_ADDRESS_HEADER));
}
