// The staff reminders view: upcoming (computed), the ledger with filters, resend a failed one, pause a
// piece; another studio's rows are a 404. Own database file; global SMTP sink. Invented data.
import { eq } from "drizzle-orm";
import { describe, expect, it } from "vitest";
import { getDb } from "@/db/client";
import { pieces, reminderSends, studios } from "@/db/schema";
import { runReminderPass } from "@/lib/reminders/pass";
import { listLedger, listUpcoming, resendReminder, setPiecePaused } from "@/lib/reminders/staff";
import { remindersQuerySchema } from "@/lib/validation/reminders";
import { memberContext } from "../support/fixtures";
import { listMail } from "../support/mail";
import { ownDatabaseFile, seedOwner, seedPiece, seedStudio } from "./reminders-helpers";

ownDatabaseFile("staff");

describe("staff reminders view", () => {
  it("lists what goes out, what went out, resends a failed one, pauses a piece, and keeps studios apart", async () => {
    const { studio, products } = seedStudio();
    const other = seedStudio();
    const staff = await memberContext(studio, "staff");
    const otherStaff = await memberContext(other.studio, "staff");
    const owner = seedOwner({ name: "Staff-view Owner (invented)" });
    const piece = seedPiece(studio, owner.id, { deliveredOn: "2025-04-01", title: "Oak bench (invented)", layers: [{ surface: "top", finishClass: "hardwax_oil", productId: products.oil, appliedOn: "2025-04-01" }] });

    // 2026-03-10 in Los Angeles: both tasks are due 2026-04-01; their 14-day (2026-03-18) and due-day
    // reminders fall within the next 30 days.
    const now = new Date("2026-03-10T20:00:00Z");
    const upcoming = listUpcoming(staff, remindersQuerySchema.parse({ view: "upcoming" }), now);
    expect(upcoming.map((u) => `${u.taskKind}:${u.step}:${u.on}:${u.state}`).sort()).toEqual([
      "annual_check:before_14d:2026-03-18:scheduled",
      "annual_check:due_day:2026-04-01:scheduled",
      "reoil:before_14d:2026-03-18:scheduled",
      "reoil:due_day:2026-04-01:scheduled",
    ]);
    expect(listUpcoming(staff, remindersQuerySchema.parse({ view: "upcoming", kind: "reoil", step: "before_14d" }), now)).toHaveLength(1);
    expect(listUpcoming(otherStaff, remindersQuerySchema.parse({ view: "upcoming" }), now)).toHaveLength(0);

    // Make one reminder fail (as if the relay had refused it), then resend it.
    await runReminderPass({ now: new Date("2026-03-18T17:00:00Z") });
    const sent = listLedger(staff, remindersQuerySchema.parse({ view: "ledger", status: "sent" }));
    expect(sent).toHaveLength(2);
    const target = sent.find((r) => r.taskKind === "reoil")!;
    getDb().update(reminderSends).set({ status: "failed", attempts: 3, nextAttemptAt: null, lastError: "try 3 of 3: 451 try later (simulated)", messageId: null }).where(eq(reminderSends.id, target.id)).run();
    expect(listLedger(staff, remindersQuerySchema.parse({ view: "ledger", status: "failed" }))).toHaveLength(1);
    expect(listLedger(staff, remindersQuerySchema.parse({ view: "ledger", q: "oak bench" }))).toHaveLength(2);
    expect(listLedger(otherStaff, remindersQuerySchema.parse({ view: "ledger" }))).toHaveLength(0);
    await expect(resendReminder(otherStaff, target.id, new Date("2026-03-19T17:00:00Z"))).rejects.toMatchObject({ status: 404 });
    const before = (await listMail({ to: owner.email })).length;
    const r = await resendReminder(staff, target.id, new Date("2026-03-19T17:00:00Z"));
    expect(r.status).toBe("sent");
    expect(await listMail({ to: owner.email })).toHaveLength(before + 1);
    await expect(resendReminder(staff, target.id)).rejects.toMatchObject({ status: 409 });

    // Pause: shows as paused in the upcoming list, and the pass leaves the piece alone.
    expect(() => setPiecePaused(otherStaff, { pieceId: piece.id, paused: true })).toThrow(expect.objectContaining({ status: 404 }));
    setPiecePaused(staff, { pieceId: piece.id, paused: true });
    expect(getDb().select().from(pieces).where(eq(pieces.id, piece.id)).get()?.remindersPaused).toBe(true);
    const paused = listUpcoming(staff, remindersQuerySchema.parse({ view: "upcoming" }), new Date("2026-03-25T20:00:00Z"));
    expect(paused.every((u) => u.state === "piece_paused")).toBe(true);
    const pass = await runReminderPass({ now: new Date("2026-04-01T17:00:00Z") });
    expect(pass.sent.filter((s) => s.to === owner.email)).toHaveLength(0);
    expect(() => listLedger(staff, remindersQuerySchema.parse({ view: "ledger", status: "nonsense" }))).toThrow();
  });
});

// A resend is checked against the studio's own reminder timing (settings → reminder timing), read
// afresh from the database like the pass does: a failed reminder is still current while the next
// step the studio actually sends has not come at its send hour in the owner's zone.
describe("resend follows the studio's reminder timing", () => {
  /** Sends a piece's first reminders with a pass at `sendAt`, then marks its re-oil one failed for good. */
  async function failedReoil(studioOverrides: Parameters<typeof seedStudio>[0], oiledOn: string, sendAt: string) {
    const { studio, products } = seedStudio(studioOverrides);
    const staff = await memberContext(studio, "staff");
    const owner = seedOwner({ timeZone: "America/Los_Angeles" });
    const piece = seedPiece(studio, owner.id, { deliveredOn: oiledOn, layers: [{ surface: "top", finishClass: "hardwax_oil", productId: products.oil, appliedOn: oiledOn }] });
    const pass = await runReminderPass({ now: new Date(sendAt) });
    expect(pass.sent.filter((s) => s.to === owner.email)).toHaveLength(2);
    const row = getDb().select().from(reminderSends).where(eq(reminderSends.pieceId, piece.id)).all().find((r) => r.taskKind === "reoil")!;
    expect(row.step).toBe("before_14d");
    getDb().update(reminderSends).set({ status: "failed", attempts: 3, nextAttemptAt: null, lastError: "try 3 of 3: 451 try later (simulated)", messageId: null }).where(eq(reminderSends.id, row.id)).run();
    return { studio, staff, owner, row };
  }

  it("with the due-day step off, a failed 14-days-before reminder can still be resent after the due date", async () => {
    // Oiled 2025-06-01, heavy use: re-oil due 2026-06-01 (12 months, lib/care/intervals.ts); its 14-days-before
    // reminder is on 2026-05-18, the 30-days-after one on 2026-07-01. 17:00Z is 10:00 in Los Angeles.
    const { staff, owner, row } = await failedReoil({ reminderSteps: ["before_14d", "after_30d"] }, "2025-06-01", "2026-05-18T17:00:00Z");
    const before = (await listMail({ to: owner.email })).length;
    // 2026-06-05: past the due day (turned off), before the 30-days-after step — the failed one is current.
    const r = await resendReminder(staff, row.id, new Date("2026-06-05T17:00:00Z"));
    expect(r.status).toBe("sent");
    const mail = await listMail({ to: owner.email });
    expect(mail).toHaveLength(before + 1);
    expect(mail[0]!.headers["x-grainward-reminder"]).toBe(row.reminderKey);
    // Once the 30-days-after step has come, the 14-days-before one is stale even with due-day off.
    const { staff: staff2, row: row2 } = await failedReoil({ reminderSteps: ["before_14d", "after_30d"] }, "2025-06-02", "2026-05-19T17:00:00Z");
    await expect(resendReminder(staff2, row2.id, new Date("2026-07-02T17:00:00Z"))).rejects.toMatchObject({ status: 409, message: expect.stringMatching(/moved on/) });
  });

  it("with a 07:00 send hour, a reminder that failed at 07:30 can be resent at 08:00 the same day", async () => {
    // Oiled 2025-08-01: due 2026-08-01, first reminder 2026-07-18. 14:30Z is 07:30 PDT.
    const { staff, owner, row } = await failedReoil({ reminderSendHour: 7 }, "2025-08-01", "2026-07-18T14:30:00Z");
    const r = await resendReminder(staff, row.id, new Date("2026-07-18T15:00:00Z"));
    expect(r.status).toBe("sent");
    expect((await listMail({ to: owner.email })).filter((m) => m.headers["x-grainward-reminder"] === row.reminderKey)).toHaveLength(2);
  });

  it("with an 18:00 send hour, a failed reminder stays current on the next step's day until 18:00", async () => {
    // Oiled 2025-10-01: due 2026-10-01, first reminder 2026-09-17 (18:00 PDT = 01:00Z next day).
    const { staff, row } = await failedReoil({ reminderSendHour: 18 }, "2025-10-01", "2026-09-18T01:00:00Z");
    // 2026-10-01 at 10:00 PDT: the due-day reminder goes at 18:00, so the first one is still current.
    expect((await resendReminder(staff, row.id, new Date("2026-10-01T17:00:00Z"))).status).toBe("sent");
  });

  it("a failed reminder of a step the studio has since turned off is refused with that reason", async () => {
    const { staff, studio, row } = await failedReoil({}, "2025-12-01", "2026-11-17T17:00:00Z");
    getDb().update(studios).set({ reminderSteps: ["due_day", "after_30d"] }).where(eq(studios.id, studio.id)).run();
    await expect(resendReminder(staff, row.id, new Date("2026-11-18T17:00:00Z"))).rejects.toMatchObject({ status: 409, message: expect.stringMatching(/turned .*off/) });
    expect(getDb().select().from(reminderSends).where(eq(reminderSends.id, row.id)).get()?.status).toBe("failed");
  });
});

describe("the upcoming list and the studio's steps", () => {
  it("lists only the steps the studio sends; a step turned off is not shown as going out", async () => {
    const { studio, products } = seedStudio({ reminderSteps: ["before_14d", "after_30d"] });
    const staff = await memberContext(studio, "staff");
    const owner = seedOwner({ name: "Steps-off Owner (invented)" });
    // Oiled 2027-04-01, heavy use: re-oil and the yearly check due 2028-04-01; reminders 2028-03-18,
    // 2028-04-01 (turned off) and 2028-05-01.
    seedPiece(studio, owner.id, { deliveredOn: "2027-04-01", title: "Ash sideboard (invented)", layers: [{ surface: "top", finishClass: "hardwax_oil", productId: products.oil, appliedOn: "2027-04-01" }] });
    const now = new Date("2028-03-10T20:00:00Z");
    const rows = (q: Record<string, unknown>) => listUpcoming(staff, remindersQuerySchema.parse({ view: "upcoming", ...q }), now).map((u) => `${u.taskKind}:${u.step}:${u.on}`).sort();
    expect(rows({ days: 60 })).toEqual([
      "annual_check:after_30d:2028-05-01",
      "annual_check:before_14d:2028-03-18",
      "reoil:after_30d:2028-05-01",
      "reoil:before_14d:2028-03-18",
    ]);
    expect(rows({ step: "due_day", days: 60 })).toEqual([]);
    // Turned back on, it is listed again (read afresh, not from the context).
    getDb().update(studios).set({ reminderSteps: ["before_14d", "due_day", "after_30d"] }).where(eq(studios.id, studio.id)).run();
    expect(rows({ step: "due_day", days: 60 })).toEqual(["annual_check:due_day:2028-04-01", "reoil:due_day:2028-04-01"]);
  });
});
