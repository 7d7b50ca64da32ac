// Account flows against a real SQLite file and the real SMTP sink (tests/support/global-setup.ts).
import { eq } from "drizzle-orm";
import { describe, expect, it } from "vitest";
import { getDb } from "@/db/client";
import { sessions, userTokens, users } from "@/db/schema";
import { changePassword, requestPasswordReset, resetPassword, signIn, signUp, verifyEmail } from "@/lib/auth/accounts";
import { verifyPassword } from "@/lib/auth/password";
import { getLucia } from "@/lib/auth/lucia";
import { sha256Hex } from "@/lib/crypto";
import { AppError } from "@/lib/errors";
import { extractLinks, waitForMail } from "../support/mail";
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

describe("sign up and e-mail verification", () => {
  it("sends a verification e-mail whose link verifies the address once", async () => {
    const email = `${unique("newowner")}@test.example`;
    const user = await signUp({ name: "New Owner", email, password: "a long enough password" }, "10.0.0.1");
    expect(user.emailVerifiedAt).toBeNull();

    const mail = await waitForMail({ to: email, subject: /confirm your e-mail/i });
    const link = extractLinks(mail.text).find((l) => l.includes("/verify-email?"));
    expect(link).toBeDefined();
    expect(mail.html).toContain("/verify-email?");

    expect(verifyEmail(tokenFrom(link!))).toBe(user.id);
    const row = getDb().select().from(users).where(eq(users.id, user.id)).get();
    expect(row?.emailVerifiedAt).toBeInstanceOf(Date);
    // Single use.
    expect(verifyEmail(tokenFrom(link!))).toBeNull();
  });

  it("refuses a second account for the same address, with a field error", async () => {
    const existing = await createUser();
    const e = await expectAppError(signUp({ name: "Again", email: existing.email, password: "a long enough password" }, "10.0.0.2"), 400);
    expect(e.fieldErrors?.email?.[0]).toMatch(/already exists/);
  });

  it("stores only the hash of the verification token", async () => {
    const email = `${unique("hashcheck")}@test.example`;
    const user = await signUp({ name: "Hash Check", email, password: "a long enough password" }, "10.0.0.3");
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

    await requestPasswordReset({ email: user.email }, "10.0.1.1");
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
    await requestPasswordReset({ email: user.email }, "10.0.1.2");
    const mail = await waitForMail({ to: user.email, subject: /reset/i });
    const token = tokenFrom(extractLinks(mail.text).find((l) => l.includes("/reset-password?"))!);
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
    await expect(requestPasswordReset({ email }, "10.0.1.3")).resolves.toBeUndefined();
    await expect(waitForMail({ to: email, timeoutMs: 800 })).rejects.toThrow();
  });
});

describe("sign-in", () => {
  it("gives a wrong password and an unknown e-mail the same answer", async () => {
    const user = await createUser({ password: "right password here" });
    const wrong = await expectAppError(signIn({ email: user.email, password: "wrong password" }, "10.0.2.1"), 401);
    const unknown = await expectAppError(signIn({ email: `${unique("ghost")}@test.example`, password: "whatever" }, "10.0.2.1"), 401);
    expect(wrong.message).toBe(unknown.message);
    await expect(signIn({ email: user.email, password: "right password here" }, "10.0.2.1")).resolves.toMatchObject({ id: user.id });
  });

  it("trips the per-account limit after 5 attempts and recovers when the window passes", async () => {
    const user = await createUser({ password: "right password here" });
    for (let i = 0; i < 5; i++) await expectAppError(signIn({ email: user.email, password: `wrong ${i}` }, "10.0.2.2"), 401);
    const limited = await expectAppError(signIn({ email: user.email, password: "right password here" }, "10.0.2.2"), 429);
    expect(limited.retryAfterSec).toBeGreaterThan(0);
    // RATE_LIMIT_WINDOW_SEC is 2 in tests (900 in the product).
    await new Promise((r) => setTimeout(r, 2200));
    await expect(signIn({ email: user.email, password: "right password here" }, "10.0.2.2")).resolves.toMatchObject({ id: user.id });
  });
});

describe("password change", () => {
  it("needs the current password and ends every session", async () => {
    const user = await createUser({ password: "first password here" });
    await getLucia().createSession(user.id, {}, { sessionId: sha256Hex("laptop") });
    await getLucia().createSession(user.id, {}, { sessionId: sha256Hex("phone") });
    const wrong = await expectAppError(changePassword(user.id, { current: "not it", password: "second password here", confirm: "second password here" }, "10.0.3.1"), 400);
    expect(wrong.fieldErrors?.current).toBeDefined();
    expect(getDb().select().from(sessions).where(eq(sessions.userId, user.id)).all()).toHaveLength(2);

    await changePassword(user.id, { current: "first password here", password: "second password here", confirm: "second password here" }, "10.0.3.1");
    expect(getDb().select().from(sessions).where(eq(sessions.userId, user.id)).all()).toHaveLength(0);
    const row = getDb().select().from(users).where(eq(users.id, user.id)).get()!;
    expect(await verifyPassword(row.passwordHash, "second password here")).toBe(true);
  });
});
