// next/headers outside a Next.js request, for tests that call route handlers and server actions as
// Next.js calls them: its cookie jar holds the session token of whoever signed in (signInToJar). A test
// file mocks next/headers with it and empties the jar before each test:
//   vi.mock("next/headers", () => import("../support/session-jar").then((m) => m.nextHeaders));
//   beforeEach(() => jar.clear());
import { expect } from "vitest";
import { getLucia, SESSION_COOKIE } from "@/lib/auth/lucia";
import { randomToken, sha256Hex } from "@/lib/crypto";

export const jar = new Map<string, string>();

export const nextHeaders = {
  cookies: async () => ({
    get: (name: string) => (jar.has(name) ? { name, value: jar.get(name)! } : undefined),
    set: (name: string, value: string) => (value ? jar.set(name, value) : jar.delete(name)),
  }),
  headers: async () => new Headers(),
};

/**
 * A real session of the user's in the test database, its token in the jar (or, with `inJar: false`, a
 * session of another device of theirs). Returns the session's id.
 */
export async function signInToJar(userId: string, { inJar = true }: { inJar?: boolean } = {}): Promise<string> {
  const token = randomToken(24);
  await getLucia().createSession(userId, {}, { sessionId: sha256Hex(token) });
  if (inJar) jar.set(SESSION_COOKIE, token);
  return sha256Hex(token);
}

/** A form's fields as a server action receives them. */
export function form(fields: Record<string, string>): FormData {
  const f = new FormData();
  for (const [k, v] of Object.entries(fields)) f.set(k, v);
  return f;
}

/** Where a form action sent the browser (Next.js's redirect() throws with the target in its digest). */
export async function redirectOf(run: Promise<unknown>): Promise<string> {
  const e = (await run.then(
    () => null,
    (err: unknown) => err,
  )) as { digest?: string } | null;
  expect(e?.digest, "the action should end in a redirect").toMatch(/^NEXT_REDIRECT;/);
  return e!.digest!.split(";")[2]!;
}
