// Account flows against a real SQLite file and the real SMTP sink (tests/support/global-setup.ts).
import http from "node:http";
import type { AddressInfo } from "node:net";
import { and, eq } from "drizzle-orm";
import { describe, expect, it } from "vitest";
import { getDb } from "@/db/client";
import { sessions, userTokens, users } from "@/db/schema";
import { changePassword, isTokenUsable, requestPasswordReset, resetPassword, signIn, signUp, verifyEmail } from "@/lib/auth/accounts";
import { settleAfterAnswer } from "@/lib/auth/after-answer";
import { CLIENT_ADDRESS_HEADER, clientAddressFromHeader, resolveClientAddress, stampClientAddresses } from "@/lib/auth/client-address";
import { safeNextPath } from "@/lib/auth/next-path";
import { verifyPassword } from "@/lib/auth/password";
import { getLucia } from "@/lib/auth/lucia";
import { SIGN_IN_LIMITS } from "@/lib/auth/rate-limit";
import { sha256Hex } from "@/lib/crypto";
import { AppError } from "@/lib/errors";
import { extractLinks, listMail, waitForMail } from "../support/mail";
import { createUser, unique } from "../support/fixtures";

const tokenFrom = (link: string) => new URL(link).searchParams.get("token")!;

async function expectAppError(p: Promise<unknown>, status: number) {
  const e = await p.then(
    () => null,
    (err: unknown) => err,
  );
  expect(e).toBeInstanceOf(AppError);
  expect((e as AppError).status).toBe(status);
  return e as AppError;
}

let ipSeq = 0;
/** A fresh address per call, so tests never share a rate-limit bucket (the limiters live in this process). */
const freshIp = () => `10.9.${(++ipSeq >> 8) & 255}.${ipSeq & 255}`;

async function resetLinkFor(email: string, ip: string, since?: Date) {
  await requestPasswordReset({ email }, ip);
  const mail = await waitForMail({ to: email, subject: /reset/i, since });
  return tokenFrom(extractLinks(mail.text).find((l) => l.includes("/reset-password?"))!);
}

describe("sign up and e-mail verification", () => {
  it("sends a verification e-mail whose link verifies the address once", async () => {
    const email = `${unique("newowner")}@test.example`;
    await signUp({ name: "New Owner", email, password: "a long enough password" }, freshIp());
    const user = getDb().select().from(users).where(eq(users.email, email)).get()!;
    expect(user.emailVerifiedAt).toBeNull();

    const mail = await waitForMail({ to: email, subject: /confirm your e-mail/i });
    const link = extractLinks(mail.text).find((l) => l.includes("/verify-email?"));
    expect(link).toBeDefined();
    expect(mail.html).toContain("/verify-email?");

    // Looking at the token (what the link's page does on a GET) does not use it up.
    expect(isTokenUsable(tokenFrom(link!), "verify_email")).toBe(true);
    expect(isTokenUsable(tokenFrom(link!), "verify_email")).toBe(true);
    expect(verifyEmail(tokenFrom(link!))).toBe(user.id);
    const row = getDb().select().from(users).where(eq(users.id, user.id)).get();
    expect(row?.emailVerifiedAt).toBeInstanceOf(Date);
    // Single use.
    expect(isTokenUsable(tokenFrom(link!), "verify_email")).toBe(false);
    expect(verifyEmail(tokenFrom(link!))).toBeNull();
  });

  it("answers a sign-up for an address that has an account exactly as for a new one, and mails the owner instead", async () => {
    const existing = await createUser({ name: "Existing Owner (invented)", password: "the owner's own password" });
    const since = new Date();
    await expect(signUp({ name: "Somebody Else", email: existing.email, password: "a long enough password" }, freshIp())).resolves.toBeUndefined();
    const fresh = `${unique("fresh")}@test.example`;
    await expect(signUp({ name: "Fresh Owner", email: fresh, password: "a long enough password" }, freshIp())).resolves.toBeUndefined();

    const mail = await waitForMail({ to: existing.email, subject: /tried to create/i, since });
    expect(mail.text).toContain("Existing Owner (invented)");
    expect(mail.text).toMatch(/already has an account/);
    expect(extractLinks(mail.text).some((l) => l.endsWith("/forgot-password"))).toBe(true);
    // Nothing about the account changed: same name, same password, still one row.
    const rows = getDb().select().from(users).where(eq(users.email, existing.email)).all();
    expect(rows).toHaveLength(1);
    expect(rows[0]!.name).toBe("Existing Owner (invented)");
    expect(await verifyPassword(rows[0]!.passwordHash, "the owner's own password")).toBe(true);
    await waitForMail({ to: fresh, subject: /confirm your e-mail/i, since });

    // Sign-ups for the address can't be used to flood its owner: one such mail a window.
    for (let i = 0; i < 3; i++) await signUp({ name: "Again", email: existing.email, password: "a long enough password" }, freshIp());
    await settleAfterAnswer();
    expect((await listMail({ to: existing.email })).filter((m) => /tried to create/i.test(m.subject))).toHaveLength(1);
  });

  it("stores only the hash of the verification token", async () => {
    const email = `${unique("hashcheck")}@test.example`;
    await signUp({ name: "Hash Check", email, password: "a long enough password" }, freshIp());
    const user = getDb().select().from(users).where(eq(users.email, email)).get()!;
    const mail = await waitForMail({ to: email });
    const token = tokenFrom(extractLinks(mail.text).find((l) => l.includes("token="))!);
    const rows = getDb().select().from(userTokens).where(eq(userTokens.userId, user.id)).all();
    expect(rows).toHaveLength(1);
    expect(rows[0]!.tokenHash).toBe(sha256Hex(token));
    expect(JSON.stringify(rows)).not.toContain(token);
  });
});

describe("password reset", () => {
  it("works end to end through the sink, ends other sessions, and the link cannot be reused", async () => {
    const user = await createUser({ password: "the old password" });
    await getLucia().createSession(user.id, {}, { sessionId: sha256Hex("some-other-device") });

    await requestPasswordReset({ email: user.email }, freshIp());
    const mail = await waitForMail({ to: user.email, subject: /reset/i });
    expect(mail.text).toMatch(/1 hour/);
    const token = tokenFrom(extractLinks(mail.text).find((l) => l.includes("/reset-password?"))!);

    await resetPassword({ token, password: "the new password!", confirm: "the new password!" });
    const row = getDb().select().from(users).where(eq(users.id, user.id)).get()!;
    expect(await verifyPassword(row.passwordHash, "the new password!")).toBe(true);
    expect(await verifyPassword(row.passwordHash, "the old password")).toBe(false);
    expect(getDb().select().from(sessions).where(eq(sessions.userId, user.id)).all()).toHaveLength(0);

    const reused = await expectAppError(resetPassword({ token, password: "third password!!", confirm: "third password!!" }), 400);
    expect(reused.message).toMatch(/expired or was already used/);
  });

  it("refuses an expired token", async () => {
    const user = await createUser();
    const token = await resetLinkFor(user.email, freshIp());
    // One hour and a second later.
    getDb()
      .update(userTokens)
      .set({ expiresAt: new Date(Date.now() - 1000) })
      .where(eq(userTokens.tokenHash, sha256Hex(token)))
      .run();
    await expectAppError(resetPassword({ token, password: "another password", confirm: "another password" }), 400);
  });

  it("answers the same for an unknown address and sends nothing", async () => {
    const email = `${unique("nobody")}@test.example`;
    await expect(requestPasswordReset({ email }, freshIp())).resolves.toBeUndefined();
    await settleAfterAnswer();
    await expect(waitForMail({ to: email, timeoutMs: 800 })).rejects.toThrow();
  });

  it("after a reset, every other reset link of the account stops working", async () => {
    const user = await createUser({ password: "the old password" });
    const first = await resetLinkFor(user.email, freshIp());
    const second = await resetLinkFor(user.email, freshIp(), new Date());
    const third = await resetLinkFor(user.email, freshIp(), new Date());
    expect(new Set([first, second, third]).size).toBe(3);

    await resetPassword({ token: second, password: "the new password!", confirm: "the new password!" });
    for (const old of [first, third]) {
      const e = await expectAppError(resetPassword({ token: old, password: "an attacker's password", confirm: "an attacker's password" }), 400);
      expect(e.message).toMatch(/expired or was already used/);
    }
    const row = getDb().select().from(users).where(eq(users.id, user.id)).get()!;
    expect(await verifyPassword(row.passwordHash, "the new password!")).toBe(true);
  });

  it("after a password change, reset links sent before it stop working", async () => {
    const user = await createUser({ password: "first password here" });
    const token = await resetLinkFor(user.email, freshIp());
    await changePassword(user.id, { current: "first password here", password: "second password here", confirm: "second password here" }, freshIp());
    await expectAppError(resetPassword({ token, password: "an attacker's password", confirm: "an attacker's password" }), 400);
    const row = getDb().select().from(users).where(eq(users.id, user.id)).get()!;
    expect(await verifyPassword(row.passwordHash, "second password here")).toBe(true);
    // A link asked for after the change works.
    const later = await resetLinkFor(user.email, freshIp(), new Date());
    await expect(resetPassword({ token: later, password: "third password here", confirm: "third password here" })).resolves.toBe(user.id);
  });

  it("does the same work before answering whether or not the address has an account", async () => {
    // The link and its mail are made after the answer: when the call returns, nothing exists yet.
    const known = await createUser();
    await requestPasswordReset({ email: known.email }, freshIp());
    expect(getDb().select().from(userTokens).where(and(eq(userTokens.userId, known.id), eq(userTokens.purpose, "password_reset"))).all()).toHaveLength(0);
    expect(await listMail({ to: known.email })).toHaveLength(0);
    await waitForMail({ to: known.email, subject: /reset/i });

    // And the time to answer does not tell the two apart (medians of interleaved calls). Before the
    // link and mail moved after the answer, a known address took 3-4 times as long.
    const knowns = await Promise.all(Array.from({ length: 9 }, () => createUser()));
    const t = { known: [] as number[], unknown: [] as number[] };
    for (const [i, user] of knowns.entries()) {
      for (const kind of i % 2 ? (["known", "unknown"] as const) : (["unknown", "known"] as const)) {
        const email = kind === "known" ? user.email : `${unique("nobody")}@test.example`;
        const t0 = performance.now();
        await requestPasswordReset({ email }, freshIp());
        t[kind].push(performance.now() - t0);
      }
    }
    await settleAfterAnswer();
    const median = (xs: number[]) => xs.sort((a, b) => a - b)[Math.floor(xs.length / 2)]!;
    expect(Math.abs(median(t.known) - median(t.unknown))).toBeLessThan(3);
  });
});

describe("sign-in", () => {
  it("gives a wrong password and an unknown e-mail the same answer", async () => {
    const user = await createUser({ password: "right password here" });
    const ip = freshIp();
    const wrong = await expectAppError(signIn({ email: user.email, password: "wrong password" }, ip), 401);
    const unknown = await expectAppError(signIn({ email: `${unique("ghost")}@test.example`, password: "whatever" }, ip), 401);
    expect(wrong.message).toBe(unknown.message);
    await expect(signIn({ email: user.email, password: "right password here" }, ip)).resolves.toMatchObject({ id: user.id });
  });

  it("five wrong passwords hold back the address that made them, not the owner signing in from elsewhere", async () => {
    const user = await createUser({ password: "right password here" });
    const guesser = freshIp();
    for (let i = 0; i < SIGN_IN_LIMITS.pairFailures; i++) await expectAppError(signIn({ email: user.email, password: `wrong ${i}` }, guesser), 401);
    // The guessing address is refused before its password is even checked, the right one included.
    const limited = await expectAppError(signIn({ email: user.email, password: "right password here" }, guesser), 429);
    expect(limited.retryAfterSec).toBeGreaterThan(0);
    // The owner, from their own address, is not locked out.
    await expect(signIn({ email: user.email, password: "right password here" }, freshIp())).resolves.toMatchObject({ id: user.id });
    // The guessing address may try again once the window has passed (RATE_LIMIT_WINDOW_SEC is 2 in tests, 900 in the product).
    await new Promise((r) => setTimeout(r, 2200));
    await expect(signIn({ email: user.email, password: "right password here" }, guesser)).resolves.toMatchObject({ id: user.id });
  });

  it("guessing from many addresses slows each guessing address down, while a right password from a clean address gets in", async () => {
    const user = await createUser({ password: "right password here" });
    const guessers = Array.from({ length: SIGN_IN_LIMITS.accountFailuresFree + 2 }, () => freshIp());
    for (const ip of guessers) await expectAppError(signIn({ email: user.email, password: "a guess" }, ip), 401);
    // Past the account's free failures, an address that has failed on the account waits before its next try.
    const waiting = await expectAppError(signIn({ email: user.email, password: "another guess" }, guessers[0]!), 429);
    expect(waiting.retryAfterSec).toBeGreaterThan(0);
    // The owner's address has not failed: it is not held back.
    await expect(signIn({ email: user.email, password: "right password here" }, freshIp())).resolves.toMatchObject({ id: user.id });
    // A new address that guesses wrong is checked once, then waits like the others.
    const newcomer = freshIp();
    await expectAppError(signIn({ email: user.email, password: "a new guess" }, newcomer), 401);
    await expectAppError(signIn({ email: user.email, password: "a new guess" }, newcomer), 429);
  });
});

describe("password change", () => {
  it("needs the current password and ends every session", async () => {
    const user = await createUser({ password: "first password here" });
    await getLucia().createSession(user.id, {}, { sessionId: sha256Hex("laptop") });
    await getLucia().createSession(user.id, {}, { sessionId: sha256Hex("phone") });
    const wrong = await expectAppError(changePassword(user.id, { current: "not it", password: "second password here", confirm: "second password here" }, freshIp()), 400);
    expect(wrong.fieldErrors?.current).toBeDefined();
    expect(getDb().select().from(sessions).where(eq(sessions.userId, user.id)).all()).toHaveLength(2);

    await changePassword(user.id, { current: "first password here", password: "second password here", confirm: "second password here" }, freshIp());
    expect(getDb().select().from(sessions).where(eq(sessions.userId, user.id)).all()).toHaveLength(0);
    const row = getDb().select().from(users).where(eq(users.id, user.id)).get()!;
    expect(await verifyPassword(row.passwordHash, "second password here")).toBe(true);
  });
});

describe("where to go after signing in", () => {
  // APP_URL is http://localhost:3999 in tests.
  it.each([
    ["/pieces", "/pieces"],
    ["/r/AB12-CD34?x=1#top", "/r/AB12-CD34?x=1#top"],
    ["/invite/abc%2Fdef", "/invite/abc%2Fdef"],
    ["/pieces/../studio", "/studio"],
    ["/caf\u00e9", "/caf%C3%A9"],
  ])("keeps the same-origin path %j as %j", (next, kept) => {
    expect(safeNextPath(next)).toBe(kept);
  });

  it.each([
    ["a tab the browser drops: /<TAB>/evil.example", "/\t/evil.example"],
    ["a newline: /<LF>/evil.example", "/\n/evil.example"],
    ["a carriage return", "/\r/evil.example"],
    ["a NUL", "/pieces\u0000"],
    ["DEL", "/pieces\u007f"],
    ["a backslash the browser reads as /", "/\\evil.example"],
    ["a backslash later on", "/pieces\\..\\..\\evil"],
    ["two slashes", "//evil.example"],
    ["dot segments that resolve to two slashes", "/..//evil.example"],
    ["a single dot segment that resolves to two slashes", "/.//evil.example/x"],
    ["another origin", "https://evil.example/"],
    ["the app's own origin spelled out", "http://localhost:3999/pieces"],
    ["a script URL", "javascript:alert(1)"],
    ["a relative path", "pieces"],
    ["nothing", ""],
    ["a very long path", `/${"a".repeat(600)}`],
  ])("refuses %s", (_, next) => {
    expect(safeNextPath(next)).toBeUndefined();
  });

  it("refuses what isn't a string", () => {
    expect(safeNextPath(undefined)).toBeUndefined();
    expect(safeNextPath(null)).toBeUndefined();
  });
});

describe("the address a request came from", () => {
  it("with no proxy trusted, is the socket's peer whatever X-Forwarded-For says", () => {
    expect(resolveClientAddress("203.0.113.7", undefined, 0)).toBe("203.0.113.7");
    expect(resolveClientAddress("203.0.113.7", "198.51.100.1", 0)).toBe("203.0.113.7");
    expect(resolveClientAddress("::ffff:203.0.113.7", "198.51.100.1, 198.51.100.2", 0)).toBe("203.0.113.7");
  });

  it("with n proxies trusted, is the entry the n-th proxy added, never one further left", () => {
    // client → proxy (appends the client's address) → app
    expect(resolveClientAddress("10.0.0.5", "198.51.100.1, 203.0.113.7", 1)).toBe("203.0.113.7");
    expect(resolveClientAddress("10.0.0.5", ["198.51.100.1", "203.0.113.7"], 1)).toBe("203.0.113.7");
    // client → CDN → proxy → app
    expect(resolveClientAddress("10.0.0.5", "made-up, 198.51.100.1, 203.0.113.7, 10.0.0.4", 2)).toBe("203.0.113.7");
    // Fewer entries than trusted proxies: the furthest one there is.
    expect(resolveClientAddress("10.0.0.5", undefined, 1)).toBe("10.0.0.5");
    expect(resolveClientAddress("10.0.0.5", "203.0.113.7", 3)).toBe("203.0.113.7");
    // A trusted hop that isn't an address is not believed.
    expect(resolveClientAddress("10.0.0.5", "203.0.113.7, not-an-address", 2)).toBe("10.0.0.5");
  });

  it("reaches the app through a real HTTP server as the peer's address, and a forged stamp is not believed", async () => {
    stampClientAddresses(0);
    const seen: string[] = [];
    const server = http.createServer((req, res) => {
      seen.push(clientAddressFromHeader(req.headers[CLIENT_ADDRESS_HEADER] as string | undefined));
      res.end("ok");
    });
    await new Promise<void>((r) => server.listen(0, "127.0.0.1", r));
    const { port } = server.address() as AddressInfo;
    try {
      const sends: Record<string, string>[] = [{}, { "x-forwarded-for": "198.51.100.1" }, { "x-forwarded-for": "198.51.100.1", [CLIENT_ADDRESS_HEADER]: "guess 198.51.100.9" }];
      for (const headers of sends) {
        await (await fetch(`http://127.0.0.1:${port}/`, { headers })).text();
      }
    } finally {
      server.close();
    }
    expect(seen).toEqual(["127.0.0.1", "127.0.0.1", "127.0.0.1"]);
    expect(clientAddressFromHeader("guess 198.51.100.9")).toBe("unknown");
    expect(clientAddressFromHeader(undefined)).toBe("unknown");
  });
});
