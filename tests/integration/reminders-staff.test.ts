// The staff reminders view: upcoming (computed), the ledger with filters, resend a failed one, pause a
// piece; another studio's rows are a 404. Own database file; global SMTP sink. Invented data.
import { eq } from "drizzle-orm";
import { describe, expect, it } from "vitest";
import { getDb } from "@/db/client";
import { pieces, reminderSends } from "@/db/schema";
import { runReminderPass } from "@/lib/reminders/pass";
import { listLedger, listUpcoming, resendReminder, setPiecePaused } from "@/lib/reminders/staff";
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
    const upcoming = listUpcoming(staff, { view: "upcoming" }, now);
    expect(upcoming.map((u) => `${u.taskKind}:${u.step}:${u.on}:${u.state}`).sort()).toEqual([
      "annual_check:before_14d:2026-03-18:scheduled",
      "annual_check:due_day:2026-04-01:scheduled",
      "reoil:before_14d:2026-03-18:scheduled",
      "reoil:due_day:2026-04-01:scheduled",
    ]);
    expect(listUpcoming(staff, { view: "upcoming", kind: "reoil", step: "before_14d" }, now)).toHaveLength(1);
    expect(listUpcoming(otherStaff, { view: "upcoming" }, now)).toHaveLength(0);

    // Make one reminder fail (as if the relay had refused it), then resend it.
    await runReminderPass({ now: new Date("2026-03-18T17:00:00Z") });
    const sent = listLedger(staff, { view: "ledger", status: "sent" });
    expect(sent).toHaveLength(2);
    const target = sent.find((r) => r.taskKind === "reoil")!;
    getDb().update(reminderSends).set({ status: "failed", attempts: 3, nextAttemptAt: null, lastError: "try 3 of 3: 451 try later (simulated)", messageId: null }).where(eq(reminderSends.id, target.id)).run();
    expect(listLedger(staff, { view: "ledger", status: "failed" })).toHaveLength(1);
    expect(listLedger(staff, { view: "ledger", q: "oak bench" })).toHaveLength(2);
    expect(listLedger(otherStaff, { view: "ledger" })).toHaveLength(0);
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
    const paused = listUpcoming(staff, { view: "upcoming" }, new Date("2026-03-25T20:00:00Z"));
    expect(paused.every((u) => u.state === "piece_paused")).toBe(true);
    const pass = await runReminderPass({ now: new Date("2026-04-01T17:00:00Z") });
    expect(pass.sent.filter((s) => s.to === owner.email)).toHaveLength(0);
    expect(() => listLedger(staff, { view: "ledger", status: "nonsense" })).toThrow();
  });
});
