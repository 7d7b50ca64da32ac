// The server actions of plain <form action>s (the mailed links' token forms and sign-out) go through
// the one action boundary (lib/http/action.ts): schema and roles as data; a refusal goes to the page
// the action names (`refused`), since a form posted without JavaScript shows no result; a token form
// works signed out. Actions called as Next.js calls them, with a real session in the test database.
// All data invented.
import { eq } from "drizzle-orm";
import { NextRequest } from "next/server";
import { beforeEach, describe, expect, it, vi } from "vitest";
import { z } from "zod";
import { getDb } from "@/db/client";
import { auditLog, memberships, sessions, users } from "@/db/schema";
import type { StudioRole } from "@/lib/care/vocabulary";
import { SESSION_COOKIE } from "@/lib/auth/lucia";
import { unsubscribeToken } from "@/lib/reminders/tokens";
import { form, jar, redirectOf, signInToJar } from "../support/session-jar";
import { createStudio, createUser } from "../support/fixtures";

// next/headers outside a Next.js request: the cookie jar holds the session token of whoever signed in (tests/support/session-jar.ts).
vi.mock("next/headers", () => import("../support/session-jar").then((m) => m.nextHeaders));

beforeEach(() => jar.clear());

async function signInMember(role: StudioRole) {
  const user = await createUser();
  getDb().insert(memberships).values({ studioId: createStudio().id, userId: user.id, role }).run();
  await signInToJar(user.id);
  return user;
}

const remindersOn = (userId: string) => getDb().select({ on: users.remindersEnabled }).from(users).where(eq(users.id, userId)).get()!.on;

describe("token forms work signed out; the token is the authority", () => {
  it("the unsubscribe page's button, signed out: turns reminders off with the mailed token and says so; on again", async () => {
    const { setRemindersAction } = await import("@/app/(public)/unsubscribe/actions");
    const owner = await createUser();
    const t = unsubscribeToken(owner.id);
    expect(await redirectOf(setRemindersAction(form({ t, enable: "false" })))).toBe(`/unsubscribe?t=${encodeURIComponent(t)}&done=off`);
    expect(remindersOn(owner.id)).toBe(false);
    expect(getDb().select({ data: auditLog.data }).from(auditLog).where(eq(auditLog.subjectId, owner.id)).all().map((a) => a.data)).toContainEqual({ via: "page" });
    expect(await redirectOf(setRemindersAction(form({ t, enable: "true" })))).toBe(`/unsubscribe?t=${encodeURIComponent(t)}&done=on`);
    expect(remindersOn(owner.id)).toBe(true);
  });

  it("bad input goes to the page the action names, and changes nothing", async () => {
    const { setRemindersAction } = await import("@/app/(public)/unsubscribe/actions");
    const { confirmSignOffAction } = await import("@/app/(public)/visit-sign-off/actions");
    const { confirmEmailAction } = await import("@/app/(public)/verify-email/actions");
    const { acceptOfferAction } = await import("@/app/(public)/offers/[token]/actions");
    const owner = await createUser();
    expect(await redirectOf(setRemindersAction(form({ t: "short", enable: "false" })))).toBe("/unsubscribe?invalid=1");
    expect(await redirectOf(setRemindersAction(form({ t: unsubscribeToken(owner.id), enable: "maybe" })))).toBe("/unsubscribe?invalid=1");
    expect(remindersOn(owner.id)).toBe(true);
    expect(await redirectOf(confirmSignOffAction(form({})))).toBe("/visit-sign-off?failed=1");
    expect(await redirectOf(confirmEmailAction(form({ token: "x".repeat(201) })))).toBe("/verify-email/sent?failed=1");
    expect(await redirectOf(acceptOfferAction(form({})))).toBe("/");
  });

  it("a well-formed token that is not ours: each flow says so on its own page, signed out", async () => {
    const { confirmSignOffAction } = await import("@/app/(public)/visit-sign-off/actions");
    const { confirmEmailAction } = await import("@/app/(public)/verify-email/actions");
    const { acceptOfferAction } = await import("@/app/(public)/offers/[token]/actions");
    expect(await redirectOf(confirmSignOffAction(form({ token: "not-a-real-sign-off-token" })))).toBe("/visit-sign-off?failed=1");
    expect(await redirectOf(confirmEmailAction(form({ token: "not-a-real-verification-token" })))).toBe("/verify-email/sent?failed=1");
    expect(await redirectOf(acceptOfferAction(form({ token: "not-a-real-offer-token" })))).toBe("/offers/not-a-real-offer-token?result=invalid");
  });
});

describe("sign-out", () => {
  it("ends this session (its row is gone, the cookie blanked) and lands on the sign-in page that says so; signed out already, the same", async () => {
    const { signOutAction } = await import("@/app/actions/session");
    const user = await createUser();
    const sessionId = await signInToJar(user.id);
    expect(await redirectOf(signOutAction(form({})))).toBe("/sign-in?signed-out=1");
    expect(getDb().select().from(sessions).where(eq(sessions.id, sessionId)).get()).toBeUndefined();
    expect(jar.has(SESSION_COOKIE)).toBe(false);
    expect(await redirectOf(signOutAction(form({})))).toBe("/sign-in?signed-out=1");
  });
});

describe("action({ roles, schema, refused })", () => {
  const schema = z.object({ name: z.string().min(1, "Give it a name.") });

  it("a result-answering action: wrong role and bad input are the one error shape, field errors beside the fields", async () => {
    const { action } = await import("@/lib/http/action");
    const save = action({ roles: ["admin"], schema }, ({ name }) => ({ saved: name }));
    expect(await save({ name: "Oak" })).toEqual({ ok: false, message: "Sign in to continue.", fieldErrors: undefined });
    await signInMember("technician");
    expect(await save({ name: "Oak" })).toMatchObject({ ok: false, message: "Your role in this studio doesn't include this." });
    jar.clear();
    await signInMember("admin");
    expect(await save({ name: "" })).toEqual({ ok: false, message: "Some fields need a second look.", fieldErrors: { name: ["Give it a name."] } });
    expect(await save(form({ name: "Oak" }))).toEqual({ ok: true, data: { saved: "Oak" } });
  });

  it("a form action: wrong role, no session and bad input all go to `refused`; the action's own redirect passes through", async () => {
    const { action } = await import("@/lib/http/action");
    const { redirect } = await import("next/navigation");
    const post = action({ roles: ["admin"], schema, refused: "/refused" }, ({ name }) => redirect(`/done/${name}`));
    expect(await redirectOf(post(form({ name: "Oak" })))).toBe("/refused");
    await signInMember("staff");
    expect(await redirectOf(post(form({ name: "Oak" })))).toBe("/refused");
    jar.clear();
    await signInMember("admin");
    expect(await redirectOf(post(form({ name: "" })))).toBe("/refused");
    expect(await redirectOf(post(form({ name: "Oak" })))).toBe("/done/Oak");
  });
});

describe("GET/POST /api/unsubscribe through route()", () => {
  const ctx = { params: Promise.resolve({}) };
  const post = (t: string, body: string, origin?: string) =>
    new NextRequest(`http://localhost:3999/api/unsubscribe?t=${encodeURIComponent(t)}`, {
      method: "POST",
      body,
      headers: { "content-type": "application/x-www-form-urlencoded", ...(origin ? { origin } : {}) },
    });

  it("one-click from the mail provider's own origin unsubscribes (the token is the authority); bad input is a 400 with the field", async () => {
    const { POST } = await import("@/app/api/unsubscribe/route");
    const owner = await createUser();
    const t = unsubscribeToken(owner.id);
    const bad = await POST(post(t, "List-Unsubscribe=Yes", "https://mail.provider.example"), ctx);
    expect(bad.status).toBe(400);
    expect(((await bad.json()) as { error: { code: string; fieldErrors: Record<string, string[]> } }).error).toMatchObject({ code: "bad_request", fieldErrors: { "List-Unsubscribe": [expect.stringContaining("RFC 8058")] } });
    expect(remindersOn(owner.id)).toBe(true);
    const res = await POST(post(t, "List-Unsubscribe=One-Click", "https://mail.provider.example"), ctx);
    expect(res.status).toBe(200);
    expect(res.headers.get("content-type")).toMatch(/^text\/plain/);
    expect(remindersOn(owner.id)).toBe(false);
  });
});
