// The reminder pass against a real SQLite file and the real SMTP sink (global setup), run as
// `jobs:run-once` child processes and in-process. Invented studios, owners and pieces.
import { eq } from "drizzle-orm";
import { simpleParser } from "mailparser";
import { NextRequest } from "next/server";
import { beforeAll, describe, expect, it } from "vitest";
import { getDb } from "@/db/client";
import { careLogEntries, claims, refreshOffers, reminderSends, users } from "@/db/schema";
import { reminderKey, taskKey } from "@/lib/care/schedule";
import { runReminderPass } from "@/lib/reminders/pass";
import { getMail, listMail } from "../support/mail";
import { ledgerOf, runOnce, seedOwner, seedPiece, seedStudio, ownDatabaseFile } from "./reminders-helpers";

ownDatabaseFile("pass");

const TITLE = "Test walnut table (invented)";
const keysOf = async (to: string) => {
  const out: string[] = [];
  for (const m of await listMail({ to })) out.push(m.headers["x-grainward-reminder"] ?? "");
  return out.sort();
};

describe("reminder pass: which messages at which instant (jobs:run-once)", () => {
  let ctx: ReturnType<typeof seedStudio>;
  let owner: ReturnType<typeof seedOwner>;
  let piece: ReturnType<typeof seedPiece>;
  const silent: string[] = [];

  beforeAll(() => {
    ctx = seedStudio();
    owner = seedOwner({ timeZone: "America/Los_Angeles", unitSystem: "imperial" });
    const layers = [{ surface: "top" as const, finishClass: "hardwax_oil" as const, productId: ctx.products.oil, appliedOn: "2025-06-01", coats: 2 }];
    piece = seedPiece(ctx.studio, owner.id, { deliveredOn: "2025-06-01", layers });
    // Owners who must get nothing: unsubscribed, paused piece, unconfirmed address; and an unregistered piece.
    const unsubscribed = seedOwner({ remindersEnabled: false });
    seedPiece(ctx.studio, unsubscribed.id, { deliveredOn: "2025-06-01", layers });
    const paused = seedOwner();
    seedPiece(ctx.studio, paused.id, { deliveredOn: "2025-06-01", layers, paused: true });
    const unconfirmed = seedOwner({ emailVerifiedAt: null });
    seedPiece(ctx.studio, unconfirmed.id, { deliveredOn: "2025-06-01", layers });
    seedPiece(ctx.studio, null, { deliveredOn: "2025-06-01", layers });
    silent.push(unsubscribed.email, paused.email, unconfirmed.email);
  });

  const reoil = () => ({ key: taskKey(piece.id, "reoil", "top"), dueOn: "2026-06-01" });
  const check = () => ({ key: taskKey(piece.id, "annual_check", "whole_piece"), dueOn: "2026-06-01" });

  it("sends nothing at 08:59 Los Angeles time on the day of the first step", async () => {
    const r = await runOnce("2026-05-18T15:59:00Z");
    expect(r.code, r.stderr).toBe(0);
    expect(r.stdout).toMatch(/sent 0, skipped 0/);
    expect(await listMail({ to: owner.email })).toHaveLength(0);
  }, 30_000);

  it("at 09:00 sends the two 14-day reminders, the re-oil one with a priced refresh offer", async () => {
    const r = await runOnce("2026-05-18T16:00:00Z");
    expect(r.code, r.stderr).toBe(0);
    expect(r.stdout).toMatch(/sent 2, skipped 0, failed 0/);
    expect(await keysOf(owner.email)).toEqual([reminderKey(check(), "before_14d"), reminderKey(reoil(), "before_14d")].sort());
    const mails = await listMail({ to: owner.email });
    const subjects = mails.map((m) => m.subject).sort();
    expect(subjects).toEqual([`Coming due 1 June 2026: annual clean and check for your ${TITLE}`, `Coming due 1 June 2026: re-oil for your ${TITLE}`]);

    const reoilMail = mails.find((m) => m.subject.includes("re-oil"))!;
    // Labour 0.5 h + 0.5 h/m² × 2 m² = 1.5 h × 80.00 = 120.00; 84 mL → one 125 mL can 19.00; travel 40.00;
    // subtotal 179.00; tax 8.25 % = 14.77 (half up); total 193.77.
    expect(reoilMail.text).toContain("$193.77");
    expect(reoilMail.text).toContain("Accept the refresh offer");
    expect(reoilMail.text).toMatch(/Oily rags can catch fire by themselves/);
    expect(reoilMail.text).toMatch(/catch fire on their own within hours/);
    expect(reoilMail.text).toContain(`/pieces/${piece.id}/log?task=${encodeURIComponent(reoil().key)}`);
    const offer = getDb().select().from(refreshOffers).where(eq(refreshOffers.taskKey, reoil().key)).get()!;
    expect(offer).toMatchObject({ dueOn: "2026-06-01", priceMinor: 19377, currency: "USD", status: "offered" });
    expect(reoilMail.headers["x-grainward-offer"]).toBe(offer.id);
    const checkMail = mails.find((m) => m.subject.includes("annual"))!;
    expect(checkMail.text).not.toContain("refresh offer");
    expect(checkMail.text).not.toMatch(/Oily rags/);

    // Headers, parsed from the raw message.
    const parsed = await simpleParser((await getMail(reoilMail.id)).raw);
    const list = parsed.headers.get("list") as { unsubscribe: { url: string; mail: string }; "unsubscribe-post": { name: string } };
    expect(list.unsubscribe.url).toMatch(new RegExp(`^${process.env.APP_URL}/api/unsubscribe\\?t=[A-Za-z0-9_-]+\\.[A-Za-z0-9_-]+$`));
    // Only the one-click https address: no mailto: that nothing would read.
    expect(list.unsubscribe.mail).toBeUndefined();
    expect(reoilMail.headers["list-unsubscribe"]).toMatch(/^<https?:\/\/[^>]+>$/);
    expect((await getMail(reoilMail.id)).raw).not.toMatch(/^List-Unsubscribe:.*mailto:/im);
    expect(list["unsubscribe-post"].name).toBe("List-Unsubscribe=One-Click");
    expect(parsed.to && "value" in parsed.to ? parsed.to.value[0]?.address : undefined).toBe(owner.email);

    for (const to of silent) expect(await listMail({ to })).toHaveLength(0);
  }, 30_000);

  it("run again at the same instant: nothing new", async () => {
    const r = await runOnce("2026-05-18T16:00:00Z");
    expect(r.stdout).toMatch(/sent 0, skipped 0/);
    expect(await listMail({ to: owner.email })).toHaveLength(2);
  }, 30_000);

  it("a month after the due date: the 30-day reminders go out, the missed due-day ones are recorded as skipped", async () => {
    const r = await runOnce("2026-07-02T17:00:00Z");
    expect(r.stdout).toMatch(/sent 2, skipped 2, failed 0/);
    expect(await keysOf(owner.email)).toEqual(
      [reminderKey(check(), "before_14d"), reminderKey(check(), "after_30d"), reminderKey(reoil(), "before_14d"), reminderKey(reoil(), "after_30d")].sort(),
    );
    const newest = (await listMail({ to: owner.email })).filter((m) => m.headers["x-grainward-reminder"]?.endsWith("after_30d"));
    expect(newest.map((m) => m.subject).sort()).toEqual([
      `Overdue since 1 June 2026: annual clean and check for your ${TITLE}`,
      `Overdue since 1 June 2026: re-oil for your ${TITLE}`,
    ]);
    // The offer went with the first reminder only.
    expect(newest.every((m) => !m.text.includes("Accept the refresh offer"))).toBe(true);
    const rows = ledgerOf(piece.id).map((r) => `${r.taskKind}:${r.step}:${r.status}:${r.attempts}`).sort();
    expect(rows).toEqual([
      "annual_check:after_30d:sent:1",
      "annual_check:before_14d:sent:1",
      "annual_check:due_day:skipped:0",
      "reoil:after_30d:sent:1",
      "reoil:before_14d:sent:1",
      "reoil:due_day:skipped:0",
    ]);
    expect(ledgerOf(piece.id).filter((r) => r.status === "sent").every((r) => r.messageId?.startsWith("<"))).toBe(true);
  }, 30_000);
});

describe("care logged: the task is done and its pending rows are cancelled", () => {
  it("cancels a failed row waiting for retry of the old cycle, and sends nothing for the new one yet", async () => {
    const { studio, products } = seedStudio();
    const owner = seedOwner();
    const piece = seedPiece(studio, owner.id, { deliveredOn: "2025-06-01", layers: [{ surface: "top", finishClass: "paste_wax", productId: products.wax, appliedOn: "2025-06-01" }] });
    const task = { key: taskKey(piece.id, "rewax", "top"), dueOn: "2025-12-01" }; // paste wax, heavy use: 6 months
    getDb()
      .insert(reminderSends)
      .values({ studioId: studio.id, pieceId: piece.id, userId: owner.id, reminderKey: reminderKey(task, "due_day"), taskKey: task.key, taskKind: "rewax", step: "due_day", dueOn: task.dueOn, status: "failed", attempts: 1, lastError: "try 1 of 3: connection refused", nextAttemptAt: new Date("2025-12-01T18:00:00Z") })
      .run();
    getDb().insert(careLogEntries).values({ studioId: studio.id, pieceId: piece.id, userId: owner.id, source: "owner", taskKind: "rewax", doneOn: "2025-12-02" }).run();

    const r = await runReminderPass({ now: new Date("2025-12-03T18:00:00Z") });
    expect(r.cancelled).toBeGreaterThanOrEqual(1);
    const rows = ledgerOf(piece.id);
    expect(rows.find((x) => x.taskKind === "rewax")?.status).toBe("cancelled");
    expect(rows.filter((x) => x.taskKind === "rewax")).toHaveLength(1);
    expect((await listMail({ to: owner.email })).filter((m) => m.subject.includes("re-wax"))).toHaveLength(0);
  });
});

describe("time zones in the week the clocks change", () => {
  // Berlin leaves summer time on Sunday 25 October 2026 (09:00 CET = 08:00Z); Los Angeles on Sunday
  // 1 November 2026 (09:00 PST = 17:00Z). A pass that used the summer offsets would send an hour early.
  let berlin: ReturnType<typeof seedOwner>;
  let la: ReturnType<typeof seedOwner>;
  beforeAll(() => {
    const { studio, products } = seedStudio();
    berlin = seedOwner({ timeZone: "Europe/Berlin" });
    la = seedOwner({ timeZone: "America/Los_Angeles" });
    // Annual check and re-oil both due 14 days after the change day → their first step is on it.
    seedPiece(studio, berlin.id, { deliveredOn: "2025-11-08", layers: [{ surface: "top", finishClass: "hardwax_oil", productId: products.oil, appliedOn: "2025-11-08" }] });
    seedPiece(studio, la.id, { deliveredOn: "2025-11-15", layers: [{ surface: "top", finishClass: "hardwax_oil", productId: products.oil, appliedOn: "2025-11-15" }] });
  });

  it("Berlin: nothing at 08:59 CET (07:59Z), both reminders at 09:00 CET (08:00Z)", async () => {
    await runReminderPass({ now: new Date("2026-10-25T07:59:00Z") });
    expect(await listMail({ to: berlin.email })).toHaveLength(0);
    await runReminderPass({ now: new Date("2026-10-25T08:00:00Z") });
    const mails = await listMail({ to: berlin.email });
    expect(mails.map((m) => m.subject).sort()).toEqual([
      `Coming due 8 November 2026: annual clean and check for your ${TITLE}`,
      `Coming due 8 November 2026: re-oil for your ${TITLE}`,
    ]);
    expect(await listMail({ to: la.email })).toHaveLength(0);
  });

  it("Los Angeles: nothing at 08:59 PST (16:59Z, which would be 09:59 PDT), both at 09:00 PST (17:00Z)", async () => {
    await runReminderPass({ now: new Date("2026-11-01T16:59:00Z") });
    expect(await listMail({ to: la.email })).toHaveLength(0);
    await runReminderPass({ now: new Date("2026-11-01T17:00:00Z") });
    expect(await listMail({ to: la.email })).toHaveLength(2);
    expect(await listMail({ to: berlin.email })).toHaveLength(2);
  });
});

describe("one-click unsubscribe (RFC 8058)", () => {
  it("POST with List-Unsubscribe=One-Click and no cookies unsubscribes (200, no redirect); the next pass sends no reminder but claim mail still comes", async () => {
    const { studio, products } = seedStudio();
    const owner = seedOwner({ name: "Unsubscribing Owner" });
    const piece = seedPiece(studio, owner.id, { deliveredOn: "2025-03-10", layers: [{ surface: "top", finishClass: "paste_wax", productId: products.wax, appliedOn: "2025-03-10" }] });
    // Paste wax, heavy use: due 2025-09-10; first step 2025-08-27.
    await runReminderPass({ now: new Date("2025-08-27T17:00:00Z") });
    const [mail] = await listMail({ to: owner.email });
    expect(mail?.subject).toBe(`Coming due 10 September 2025: re-wax for your ${TITLE}`);
    const parsed = await simpleParser((await getMail(mail!.id)).raw);
    const url = (parsed.headers.get("list") as { unsubscribe: { url: string } }).unsubscribe.url;

    const route = await import("@/app/api/unsubscribe/route");
    const ctx = { params: Promise.resolve({}) };
    const POST = (req: NextRequest) => route.POST(req, ctx);
    const GET = (req: NextRequest) => route.GET(req, ctx);
    const bad = await POST(new NextRequest(url, { method: "POST", body: new URLSearchParams({ "List-Unsubscribe": "Yes" }) }));
    expect(bad.status).toBe(400);
    const forged = await POST(new NextRequest(url.replace(/\.[^.]+$/, ".forged0000000000"), { method: "POST", body: new URLSearchParams({ "List-Unsubscribe": "One-Click" }) }));
    expect(forged.status).toBe(404);
    expect(getDb().select().from(users).where(eq(users.id, owner.id)).get()?.remindersEnabled).toBe(true);

    const res = await POST(new NextRequest(url, { method: "POST", body: new URLSearchParams({ "List-Unsubscribe": "One-Click" }) }));
    expect(res.status).toBe(200);
    expect(res.headers.get("location")).toBeNull();
    expect(getDb().select().from(users).where(eq(users.id, owner.id)).get()?.remindersEnabled).toBe(false);
    // A multipart body works too, and repeating it is harmless.
    const form = new FormData();
    form.set("List-Unsubscribe", "One-Click");
    expect((await POST(new NextRequest(url, { method: "POST", body: form }))).status).toBe(200);
    // Opening the URL shows the confirmation page instead.
    const page = await GET(new NextRequest(url));
    expect(page.status).toBe(303);
    expect(page.headers.get("location")).toMatch(/\/unsubscribe\?t=/);

    // The due-day reminder would go out now; it does not.
    const r = await runReminderPass({ now: new Date("2025-09-10T17:00:00Z") });
    expect(r.sent.filter((s) => s.to === owner.email)).toHaveLength(0);
    expect(await listMail({ to: owner.email })).toHaveLength(1);

    // Claim mail is not care mail: it still reaches the owner.
    const { mailClaimReceived } = await import("@/lib/claims/mail");
    const claim = getDb()
      .insert(claims)
      .values({ studioId: studio.id, pieceId: piece.id, ownerId: owner.id, category: "crack_gap", noticedOn: "2025-09-09", description: "A hairline crack near the resin edge (invented).", answers: {} })
      .returning()
      .get();
    await mailClaimReceived({ claim, piece, studio, owner: { name: owner.name, email: owner.email } });
    const after = await listMail({ to: owner.email });
    expect(after).toHaveLength(2);
    expect(after.some((m) => m.headers["x-grainward-reminder"] === undefined)).toBe(true);
  });
});
