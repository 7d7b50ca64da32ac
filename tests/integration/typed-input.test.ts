// lib functions take parsed, typed input; the zod schemas run once, at the request boundary
// (route()'s `body`/`query` in lib/http/route.ts, action()'s `schema` in lib/http/action.ts).
// Each area's routes and actions are called here as Next.js calls them, with a real signed-in
// session (a lucia session row in the test database, its token in the cookie jar next/headers
// hands out): bad input is refused at the boundary with its field errors in the one JSON shape
// (or the form's ActionResult), and nothing is saved.
// All data invented.
import { eq } from "drizzle-orm";
import { NextRequest } from "next/server";
import { beforeEach, describe, expect, it, vi } from "vitest";
import { getDb } from "@/db/client";
import { memberships, studios, threadMessages } from "@/db/schema";
import { CLAIM_CATEGORIES, type StudioRole } from "@/lib/care/vocabulary";
import type { PolicyVersionInput } from "@/lib/validation/settings";
import { sha256Hex, randomToken } from "@/lib/crypto";
import { getLucia, SESSION_COOKIE } from "@/lib/auth/lucia";
import { postClaimMessage } from "@/lib/claims/reply";
import { findThread } from "@/lib/messages/store";
import { createStudio, createUser } from "../support/fixtures";
import { claimWorld, fileClaim } from "./claims-helpers";

// next/headers outside a Next.js request: the cookie jar holds the session token of whoever the
// test signed in; headers are empty (no client address, no Accept-Language).
const jar = vi.hoisted(() => new Map<string, string>());
vi.mock("next/headers", () => ({
  cookies: async () => ({
    get: (name: string) => (jar.has(name) ? { name, value: jar.get(name)! } : undefined),
    set: () => undefined,
  }),
  headers: async () => new Headers(),
}));

// Outside a Next.js request there is no page cache to revalidate; a saved setting's action still answers.
vi.mock("next/cache", () => ({ revalidatePath: () => undefined }));

beforeEach(() => jar.clear());

async function signIn(userId: string) {
  const token = randomToken(24);
  await getLucia().createSession(userId, {}, { sessionId: sha256Hex(token) });
  jar.set(SESSION_COOKIE, token);
}

async function signInMember(role: StudioRole, studio = createStudio()) {
  const user = await createUser();
  getDb().insert(memberships).values({ studioId: studio.id, userId: user.id, role }).run();
  await signIn(user.id);
  return { user, studio };
}

type Handler = (req: NextRequest, ctx: { params: Promise<unknown> }) => Promise<Response>;

/** Calls a route handler as Next.js does; the answer's status and JSON. */
async function call(handler: Handler, method: string, path: string, { body, params = {} }: { body?: unknown; params?: Record<string, string> } = {}) {
  const req = new NextRequest(`http://localhost:3999${path}`, {
    method,
    ...(body === undefined ? {} : { body: JSON.stringify(body), headers: { "content-type": "application/json" } }),
  });
  const res = await handler(req, { params: Promise.resolve(params) });
  const text = await res.text();
  return { status: res.status, json: text.startsWith("{") ? (JSON.parse(text) as { error?: { code: string; message: string; fieldErrors?: Record<string, string[]> } }) : null };
}

describe("settings: the profile, reminder timing, visit rules and warranty versions are parsed at the boundary", () => {
  it("PATCH /api/studio/settings: a currency we don't know is a 400 naming the field; nothing is saved", async () => {
    const { PATCH } = await import("@/app/api/studio/settings/route");
    const { studio } = await signInMember("admin");
    const profile = { name: "Typed Studio (invented)", address: "", email: "", timeZone: "Europe/Berlin", currency: "XYZ", unitSystem: "metric", taxRatePct: "0", labourRate: "80", travelFee: "0" };
    const r = await call(PATCH, "PATCH", "/api/studio/settings", { body: { profile, reminders: { sendHour: 24, steps: [] } } });
    expect(r.status).toBe(400);
    expect(r.json?.error?.code).toBe("bad_request");
    expect(Object.keys(r.json?.error?.fieldErrors ?? {}).sort()).toEqual(["profile", "reminders"]);
    expect(getDb().select().from(studios).where(eq(studios.id, studio.id)).get()!.name).toBe("Test Studio (invented)");
  });

  it("POST /api/studio/policy: a date that doesn't exist is a 400 with the field's words", async () => {
    const { POST } = await import("@/app/api/studio/policy/route");
    await signInMember("admin");
    const r = await call(POST, "POST", "/api/studio/policy", { body: { effectiveFrom: "2026-02-30", lines: {} } });
    expect(r.status).toBe(400);
    expect(r.json?.error?.fieldErrors?.effectiveFrom?.length).toBeGreaterThan(0);
  });

  it("the settings actions answer the form's field errors without saving", async () => {
    const { saveProfileAction, saveReminderTimingAction, saveVisitRulesAction } = await import("@/app/studio/settings/actions");
    const { studio } = await signInMember("admin");
    const profile = await saveProfileAction({ name: "Typed Studio (invented)", address: "", email: "", timeZone: "Mars/Olympus", currency: "EUR", unitSystem: "metric", taxRatePct: "0", labourRate: "80", travelFee: "0" });
    expect(profile).toMatchObject({ ok: false, fieldErrors: { timeZone: ["Use a time zone name like America/Los_Angeles or Europe/Berlin."] } });
    expect(await saveReminderTimingAction({ sendHour: 24, steps: [] })).toMatchObject({ ok: false, fieldErrors: { sendHour: ["Pick an hour from 00 to 23."] } });
    expect(await saveVisitRulesAction({ travelBufferMin: 30, leadTimeHours: 337, slotStepMin: 30, ownerChangeCutoffHours: 24 })).toMatchObject({
      ok: false,
      fieldErrors: { leadTimeHours: ["The booking notice is 0 to 336 hours."] },
    });
    const row = getDb().select().from(studios).where(eq(studios.id, studio.id)).get()!;
    expect([row.timeZone, row.reminderSendHour]).toEqual([studio.timeZone, studio.reminderSendHour]);
  });

  it("a saved warranty version says from when it applies, as a date in words", async () => {
    const { createPolicyVersionAction } = await import("@/app/studio/settings/actions");
    await signInMember("admin");
    const line: PolicyVersionInput["lines"]["other"] = { covered: true, label: "Test line (invented)", termMonths: 24, exclusions: [], careLogRequired: false, graceDays: 30, onMissed: "partly_covered", climateCheck: false, partlyCoveredPct: 50, transfersToNewOwner: true };
    const lines = Object.fromEntries(CLAIM_CATEGORIES.map((c) => [c, line])) as PolicyVersionInput["lines"];
    const saved = await createPolicyVersionAction({ effectiveFrom: "2027-03-01", lines });
    expect(saved).toMatchObject({ ok: true, message: "Warranty terms for deliveries from 1 March 2027 saved. Pieces delivered before then keep the terms they had." });
  });
});

describe("studio: set-up steps, team and starting a studio are parsed at the boundary", () => {
  it("the set-up actions refuse an accent outside the set, a publishable Stripe key and a sender name with markup", async () => {
    const { saveAccentAction, saveStripeKeyAction, saveMailSenderAction } = await import("@/app/studio/setup/actions");
    const { studio } = await signInMember("admin");
    const accent = await saveAccentAction({ accent: "neon" as never });
    expect(accent.ok).toBe(false);
    expect(Object.keys(accent.ok ? {} : (accent.fieldErrors ?? {}))).toEqual(["accent"]);
    const key = await saveStripeKeyAction({ secretKey: "pk_test_public" });
    expect(Object.keys(key.ok ? {} : (key.fieldErrors ?? {}))).toEqual(["secretKey"]);
    const sender = await saveMailSenderAction({ senderName: 'Evil "Name" <x@y>', replyTo: "" });
    expect(Object.keys(sender.ok ? {} : (sender.fieldErrors ?? {}))).toEqual(["senderName"]);
    const row = getDb().select().from(studios).where(eq(studios.id, studio.id)).get()!;
    expect([row.accent, row.stripeSecretSealed, row.mailSenderName]).toEqual(["default", null, studio.mailSenderName]);
  });

  it("the team actions refuse a role that doesn't exist and an empty member or invitation", async () => {
    const { changeRoleAction, removeMemberAction, revokeInvitationAction } = await import("@/app/studio/team/actions");
    await signInMember("admin");
    expect(await changeRoleAction({ membershipId: "m1", role: "boss" as never })).toMatchObject({ ok: false, fieldErrors: { role: ["Pick a role."] } });
    expect(await removeMemberAction({ membershipId: " " })).toMatchObject({ ok: false, fieldErrors: { membershipId: ["Pick a member."] } });
    expect(await revokeInvitationAction({ invitationId: "" })).toMatchObject({ ok: false, fieldErrors: { invitationId: ["Pick an invitation."] } });
  });

  it("starting a studio: a time zone that doesn't exist comes back beside its field; no studio is made", async () => {
    const { startStudioAction } = await import("@/app/(public)/start/actions");
    const user = await createUser();
    await signIn(user.id);
    const before = getDb().select().from(studios).all().length;
    const r = await startStudioAction({ name: "Typed Start (invented)", timeZone: "Mars/Olympus", currency: "EUR", unitSystem: "metric" });
    expect(r).toMatchObject({ ok: false, fieldErrors: { timeZone: ["Use a time zone name like America/Los_Angeles or Europe/Berlin."] } });
    expect(getDb().select().from(studios).all()).toHaveLength(before);
  });
});

describe("reminders: the staff view's query, pause and resend are parsed at the boundary", () => {
  it("GET /api/reminders: a ledger status we don't have is a 400 naming the field", async () => {
    const { GET } = await import("@/app/api/reminders/route");
    await signInMember("staff");
    const r = await call(GET, "GET", "/api/reminders?view=ledger&status=nonsense&days=5");
    expect(r.status).toBe(400);
    expect(Object.keys(r.json?.error?.fieldErrors ?? {})).toEqual(["status"]);
    expect((await call(GET, "GET", "/api/reminders?view=upcoming&days=91")).json?.error?.fieldErrors).toHaveProperty("days");
    const ok = await call(GET, "GET", "/api/reminders?view=ledger");
    expect([ok.status, (ok.json as { view?: string } | null)?.view]).toEqual([200, "ledger"]);
  });

  it("POST /api/reminders/pause: no piece and a word for `paused` are a 400 with both fields; an id that is too long to be one is a 400 before any lookup", async () => {
    const pause = (await import("@/app/api/reminders/pause/route")).POST;
    const resend = (await import("@/app/api/reminders/[id]/resend/route")).POST;
    await signInMember("staff");
    const r = await call(pause, "POST", "/api/reminders/pause", { body: { pieceId: " ", paused: "yes" } });
    expect(r.status).toBe(400);
    expect(Object.keys(r.json?.error?.fieldErrors ?? {}).sort()).toEqual(["paused", "pieceId"]);
    const long = "x".repeat(65);
    const again = await call(resend, "POST", `/api/reminders/${long}/resend`, { params: { id: long } });
    expect([again.status, Object.keys(again.json?.error?.fieldErrors ?? {})]).toEqual([400, ["id"]]);
    expect((await call(resend, "POST", "/api/reminders/nope/resend", { params: { id: "nope" } })).status).toBe(404);
  });
});

describe("pieces: the registry query, its CSV export, edits, layers and the CSV import are parsed at the boundary", () => {
  it("GET /api/pieces and /api/pieces/export.csv: a page size we don't offer and a date that doesn't exist are 400s naming the field", async () => {
    const { GET: list } = await import("@/app/api/pieces/route");
    const { GET: exportCsv } = await import("@/app/api/pieces/export.csv/route");
    await signInMember("staff");
    const size = await call(list, "GET", "/api/pieces?pageSize=7");
    expect([size.status, size.json?.error?.fieldErrors]).toEqual([400, { pageSize: ["Page size is 10, 25, 50 or 100."] }]);
    const due = await call(exportCsv, "GET", "/api/pieces/export.csv?dueBefore=2026-02-30");
    expect([due.status, Object.keys(due.json?.error?.fieldErrors ?? {})]).toEqual([400, ["dueBefore"]]);
    // A kind we don't have is named in words (lib/validation/words.ts), not zod's "Invalid option: expected one of …".
    const kind = await call(exportCsv, "GET", "/api/pieces/export.csv?kind=zzz");
    expect([kind.status, kind.json?.error?.fieldErrors]).toEqual([400, { kind: ["Choose one of: dining_table, coffee_table, desk, bench, countertop, console, shelf, other."] }]);
    // Empty values count as absent, as the registry table's links send them.
    const ok = await call(list, "GET", "/api/pieces?q=&kind=&pageSize=10");
    expect([ok.status, (ok.json as { total?: number } | null)?.total]).toEqual([200, 0]);
  });

  it("PATCH /api/pieces/[id], POST its layers and POST /api/pieces/import: bad fields are 400s before any piece is looked up", async () => {
    const { PATCH } = await import("@/app/api/pieces/[id]/route");
    const { POST: addLayerRoute } = await import("@/app/api/pieces/[id]/layers/route");
    const { POST: importRoute } = await import("@/app/api/pieces/import/route");
    await signInMember("staff");
    const params = { id: "no-such-piece" };
    const patch = await call(PATCH, "PATCH", "/api/pieces/no-such-piece", { body: { kind: "spaceship" }, params });
    expect([patch.status, Object.keys(patch.json?.error?.fieldErrors ?? {})]).toEqual([400, ["kind"]]);
    const layer = await call(addLayerRoute, "POST", "/api/pieces/no-such-piece/layers", { body: { surface: "top", finishClass: "hardwax_oil", coats: 0, appliedOn: "2025-01-01" }, params });
    expect([layer.status, Object.keys(layer.json?.error?.fieldErrors ?? {})]).toEqual([400, ["coats"]]);
    expect((await call(PATCH, "PATCH", "/api/pieces/no-such-piece", { body: { title: "Fine (invented)" }, params })).status).toBe(404);
    const empty = await call(importRoute, "POST", "/api/pieces/import", { body: { csv: "", commit: true } });
    expect([empty.status, empty.json?.error?.fieldErrors]).toEqual([400, { csv: ["The file is empty."] }]);
  });
});

describe("reports: the claims CSV's query is parsed at the boundary", () => {
  it("GET /api/studio/reports/claims.csv: a period that ends before it starts and a kind of claim we don't have are 400s naming the fields", async () => {
    const { GET } = await import("@/app/api/studio/reports/claims.csv/route");
    await signInMember("staff");
    const r = await call(GET, "GET", "/api/studio/reports/claims.csv?from=2026-06-30&to=2026-01-01");
    expect([r.status, r.json?.error?.fieldErrors]).toEqual([400, { to: ["The period must start on or before its end."] }]);
    const kind = await call(GET, "GET", "/api/studio/reports/claims.csv?category=termites");
    expect([kind.status, kind.json?.error?.fieldErrors]).toEqual([400, { category: ["Pick a kind of claim from the list."] }]);
    const ok = await call(GET, "GET", "/api/studio/reports/claims.csv?from=2026-01-01&to=2026-06-30&category=");
    expect(ok.status).toBe(200);
  });
});

describe("owner: registering, handing on, care-log entries and preferences are parsed at the boundary", () => {
  it("a malformed code, an unticked hand-on, an impossible care date and an empty preferences patch are 400s with their fields, before any lookup", async () => {
    const { POST: register } = await import("@/app/api/registrations/route");
    const { POST: release } = await import("@/app/api/me/pieces/[id]/release/route");
    const { POST: addEntry } = await import("@/app/api/me/pieces/[id]/care-log/route");
    const { PATCH: fixEntry } = await import("@/app/api/me/pieces/[id]/care-log/[entryId]/route");
    const { PATCH: preferences } = await import("@/app/api/me/preferences/route");
    const user = await createUser({ emailVerifiedAt: new Date() });
    await signIn(user.id);
    const code = await call(register, "POST", "/api/registrations", { body: { code: "not-a-code" } });
    expect([code.status, code.json?.error?.fieldErrors]).toEqual([400, { code: ["A registration code has 13 symbols, like 7K3M-Q9XD-2HRT-P. Check the card in the piece's drawer."] }]);
    const params = { id: "no-such-piece", entryId: "no-such-entry" };
    const handOn = await call(release, "POST", "/api/me/pieces/no-such-piece/release", { body: { confirm: false }, params });
    expect([handOn.status, handOn.json?.error?.fieldErrors]).toEqual([400, { confirm: ["Tick the box to confirm you are handing this piece on."] }]);
    const added = await call(addEntry, "POST", "/api/me/pieces/no-such-piece/care-log", { body: { taskKind: "polish", surface: "top", doneOn: "2026-02-30" }, params });
    expect([added.status, Object.keys(added.json?.error?.fieldErrors ?? {}).sort()]).toEqual([400, ["doneOn", "taskKind"]]);
    const fixed = await call(fixEntry, "PATCH", "/api/me/pieces/no-such-piece/care-log/no-such-entry", { body: { doneOn: "2026-02-30" }, params });
    expect([fixed.status, Object.keys(fixed.json?.error?.fieldErrors ?? {})]).toEqual([400, ["doneOn"]]);
    const nothing = await call(preferences, "PATCH", "/api/me/preferences", { body: {} });
    expect([nothing.status, nothing.json?.error?.message]).toEqual([400, "Nothing to change."]);
    const zone = await call(preferences, "PATCH", "/api/me/preferences", { body: { timeZone: "Mars/Olympus_Mons" } });
    expect([zone.status, zone.json?.error?.fieldErrors]).toEqual([400, { timeZone: ["That isn't a time zone we know — pick one from the list."] }]);
    // Well-formed input gets past the boundary to the lookup: someone else's (or no) piece is a 404.
    expect((await call(addEntry, "POST", "/api/me/pieces/no-such-piece/care-log", { body: { taskKind: "annual_check", surface: "whole_piece", doneOn: "2025-01-01" }, params })).status).toBe(404);
    expect((await call(release, "POST", "/api/me/pieces/no-such-piece/release", { body: { confirm: true }, params })).status).toBe(404);
  });

  it("the register, hand-on and preferences actions answer the same field errors", async () => {
    const { registerAction } = await import("@/app/(owner)/register/actions");
    const { savePreferencesAction } = await import("@/app/(owner)/account/actions");
    const user = await createUser({ emailVerifiedAt: new Date() });
    await signIn(user.id);
    expect(await registerAction({ code: "not-a-code" })).toMatchObject({ ok: false, fieldErrors: { code: ["A registration code has 13 symbols, like 7K3M-Q9XD-2HRT-P. Check the card in the piece's drawer."] } });
    expect(await savePreferencesAction({ remindersEnabled: true, timeZone: "Mars/Olympus_Mons", unitSystem: "metric" })).toMatchObject({
      ok: false,
      fieldErrors: { timeZone: ["That isn't a time zone we know — pick one from the list."] },
    });
  });
});

describe("messages: the inbox's view is parsed at the boundary", () => {
  it("GET /api/threads: a view we don't have reads as the open threads, as it always did (the schema's catch)", async () => {
    const { GET } = await import("@/app/api/threads/route");
    await signInMember("staff");
    const r = await call(GET, "GET", "/api/threads?view=everything");
    expect([r.status, (r.json as { view?: string } | null)?.view]).toEqual([200, "waiting"]);
    const done = await call(GET, "GET", "/api/threads?view=done");
    expect((done.json as { view?: string } | null)?.view).toBe("done");
  });

  it("PATCH /api/threads/[id]: nothing to change and a state we don't have are 400s before any lookup; a well-formed change of no thread is a 404", async () => {
    const { PATCH } = await import("@/app/api/threads/[id]/route");
    await signInMember("staff");
    const params = { id: "no-such-thread" };
    const nothing = await call(PATCH, "PATCH", "/api/threads/no-such-thread", { body: {}, params });
    expect([nothing.status, nothing.json?.error?.message]).toEqual([400, "Say what to change: the assignee or the state."]);
    const state = await call(PATCH, "PATCH", "/api/threads/no-such-thread", { body: { state: "closed" }, params });
    expect([state.status, Object.keys(state.json?.error?.fieldErrors ?? {})]).toEqual([400, ["state"]]);
    expect((await call(PATCH, "PATCH", "/api/threads/no-such-thread", { body: { state: "done" }, params })).status).toBe(404);
  });
});

describe("conversations: what a message is about is found before its body is judged (route()'s `load`)", () => {
  it("POST /api/threads: someone else's claim is a 404 whatever was sent; the owner's blank message a 400; nothing is written until both pass", async () => {
    const { POST } = await import("@/app/api/threads/route");
    const w = await claimWorld();
    const claim = await fileClaim(w.ownerV, w.piece.id);
    const path = `/api/threads?about=claim&id=${claim.id}`;
    const written = () => getDb().select().from(threadMessages).all().filter((m) => m.body.includes("(typed-input)")).length;

    const stranger = await createUser();
    await signIn(stranger.id);
    expect((await call(POST, "POST", path, { body: { body: "" } })).status).toBe(404);
    expect((await call(POST, "POST", path, { body: { body: "Not my claim (typed-input)." } })).status).toBe(404);

    await signIn(w.owner.id);
    const blank = await call(POST, "POST", path, { body: { body: "   " } });
    expect(blank.status).toBe(400);
    expect(blank.json?.error?.fieldErrors?.body).toEqual(["Write a message first."]);
    const unsaid = await call(POST, "POST", "/api/threads", { body: { body: "About what? (typed-input)" } });
    expect(unsaid.status).toBe(400);
    expect(Object.keys(unsaid.json?.error?.fieldErrors ?? {}).sort()).toEqual(["about", "id"]);
    expect(written()).toBe(0);

    expect((await call(POST, "POST", path, { body: { body: "Still tacky after a week (typed-input)." } })).status).toBe(201);
    expect(written()).toBe(1);
  });

  it("POST /api/threads/[id]/messages: another studio's thread is a 404 whatever was sent; this studio's blank reply a 400", async () => {
    const { POST } = await import("@/app/api/threads/[id]/messages/route");
    const w = await claimWorld();
    const claim = await fileClaim(w.ownerV, w.piece.id);
    await postClaimMessage(w.ownerV, claim.id, { body: "A question (typed-input)." });
    const thread = findThread(getDb(), { kind: "claim", id: claim.id })!;
    const params = { id: thread.id };
    const before = getDb().select().from(threadMessages).where(eq(threadMessages.threadId, thread.id)).all().length;

    await signInMember("admin");
    expect((await call(POST, "POST", `/api/threads/${thread.id}/messages`, { body: {}, params })).status).toBe(404);
    const staff = await createUser();
    getDb().insert(memberships).values({ studioId: w.studio.id, userId: staff.id, role: "staff" }).run();
    await signIn(staff.id);
    const blank = await call(POST, "POST", `/api/threads/${thread.id}/messages`, { body: {}, params });
    expect(blank.status).toBe(400);
    expect(getDb().select().from(threadMessages).where(eq(threadMessages.threadId, thread.id)).all().length).toBe(before);
    expect((await call(POST, "POST", `/api/threads/${thread.id}/messages`, { body: { body: "Two more weeks (typed-input)." }, params })).status).toBe(201);
    expect(getDb().select().from(threadMessages).where(eq(threadMessages.threadId, thread.id)).all().length).toBe(before + 1);
  });
});
