// Every overview figure on a small seeded studio, against counts made by hand (written beside each
// expectation). The studio is in America/New_York; "now" is 2026-06-15 12:00 EDT, so today is
// 2026-06-15, care "due in 30 days" runs to 2026-07-15, and the 12-month window starts 2025-07-01
// (00:00 EDT = 04:00 UTC). All data invented.
import { beforeAll, describe, expect, it } from "vitest";
import { getDb } from "@/db/client";
import { careLogEntries, claims, payments, pieces, refreshOffers, reminderSends, repairJobs, visits, warrantyPolicies, type Studio } from "@/db/schema";
import type { StudioContext } from "@/lib/auth/guards";
import { DEFAULT_WARRANTY_POLICY } from "@/lib/care/coverage";
import type { Quote } from "@/lib/care/quote";
import type { CareTaskKind, ClaimCategory, ReminderStep } from "@/lib/care/vocabulary";
import { AppError } from "@/lib/errors";
import { careLoggedAfter, getOverview, median, type Overview } from "@/lib/overview";
import { createPiece, createStudio, createUser, memberContext, unique } from "../support/fixtures";

const NOW = new Date("2026-06-15T16:00:00Z");
const H = 3_600_000;

let studio: Studio;
let staff: StudioContext;
let o: Overview;

type Sent = { pieceId: string; userId: string; kind: CareTaskKind; surface: string; step: ReminderStep; sentAt: string; status?: "sent" | "failed" };

function ledger(s: Studio, r: Sent) {
  const taskKey = `${r.pieceId}:${r.kind}:${r.surface}`;
  getDb()
    .insert(reminderSends)
    .values({ studioId: s.id, pieceId: r.pieceId, userId: r.userId, reminderKey: unique(`${taskKey}:${r.step}`), taskKey, taskKind: r.kind, step: r.step, dueOn: "2026-01-01", status: r.status ?? "sent", sentAt: new Date(r.sentAt), attempts: 1 })
    .run();
}

function careLog(s: Studio, pieceId: string, userId: string, kind: CareTaskKind, doneOn: string, surface: "top" | "base" | null, source: "owner" | "studio" | "visit" = "owner") {
  getDb().insert(careLogEntries).values({ studioId: s.id, pieceId, userId, source, taskKind: kind, surface, doneOn }).run();
}

function claim(s: Studio, pieceId: string, ownerId: string, category: ClaimCategory, state: (typeof claims.$inferInsert)["state"], createdAt: string, answeredAt?: string) {
  getDb()
    .insert(claims)
    .values({ studioId: s.id, pieceId, ownerId, category, state, noticedOn: createdAt.slice(0, 10), description: "Invented test claim.", answers: {}, createdAt: new Date(createdAt), firstAnsweredAt: answeredAt ? new Date(answeredAt) : null })
    .run();
}

function offer(s: Studio, pieceId: string, userId: string, status: (typeof refreshOffers.$inferInsert)["status"], createdAt: string) {
  getDb()
    .insert(refreshOffers)
    .values({ studioId: s.id, pieceId, userId, taskKey: unique("offer-task"), dueOn: "2026-07-01", priceMinor: 12000, currency: "USD", quote: {} as Quote /* the overview never reads it */, status, createdAt: new Date(createdAt), acceptedAt: status === "accepted" ? new Date(createdAt) : null })
    .run();
}

function job(s: Studio, pieceId: string) {
  return getDb().insert(repairJobs).values({ studioId: s.id, pieceId, origin: "studio", title: "Invented repair", quoteInput: {}, lines: [], currency: "USD" }).returning().get();
}

function payment(s: Studio, jobId: string, p: { amount: number; refunded?: number; status: (typeof payments.$inferInsert)["status"]; paidAt?: string; currency?: string }) {
  getDb()
    .insert(payments)
    .values({ studioId: s.id, jobId, quoteVersion: 1, checkoutSessionId: unique("cs"), amountMinor: p.amount, refundedMinor: p.refunded ?? 0, currency: p.currency ?? "USD", status: p.status, paidAt: p.paidAt ? new Date(p.paidAt) : null })
    .run();
}

function visit(s: Studio, pieceId: string, technicianId: string, startAt: string, state: "booked" | "done" | "cancelled") {
  const start = new Date(startAt);
  const jobId = job(s, pieceId).id; // one visit per job
  getDb()
    .insert(visits)
    .values({ studioId: s.id, jobId, pieceId, technicianId, startAt: start, endAt: new Date(start.getTime() + 2 * H), locationKind: "studio", location: "The shop (invented)", icsUid: unique("uid"), state, jobStateBefore: "paid" })
    .run();
}

beforeAll(async () => {
  studio = createStudio({ name: "Overview Studio (invented)", timeZone: "America/New_York", currency: "USD" });
  staff = await memberContext(studio, "staff");
  const ownerA = await createUser({ name: "Owner A (invented)" });
  const ownerB = await createUser({ name: "Owner B (invented)" });
  const ownerC = await createUser({ name: "Owner C (invented)" });
  const db = getDb();
  const long = db.insert(warrantyPolicies).values({ studioId: studio.id, version: 1, effectiveFrom: "2020-01-01", policy: DEFAULT_WARRANTY_POLICY }).returning().get(); // longest line 60 months
  const short = db
    .insert(warrantyPolicies)
    .values({ studioId: studio.id, version: 2, effectiveFrom: "2021-01-01", policy: { version: "short (invented)", lines: { finish_wear: { ...DEFAULT_WARRANTY_POLICY.lines.finish_wear!, termMonths: 12 } } } })
    .returning()
    .get();

  // Pieces. createPiece gives each a top hardwax-oil layer on its delivery date; heavy use, no sun:
  // re-oil due 12 months after the layer, annual check 12 months after delivery.
  const p1 = createPiece(studio, { deliveredOn: "2025-07-01", ownerId: ownerA.id, warrantyPolicyId: long.id }).piece; // re-oil 2026-07-01 (due soon); warranty to 2030-07-01
  const p2 = createPiece(studio, { deliveredOn: "2025-05-01", ownerId: ownerB.id, warrantyPolicyId: short.id }).piece; // re-oil 2026-05-01 (overdue); warranty ended 2026-05-01
  createPiece(studio, { deliveredOn: "2026-06-20" }); // not delivered yet: left out of everything
  createPiece(studio, { deliveredOn: "2024-01-10", archivedAt: new Date("2025-01-01") }); // archived: left out
  const p5 = createPiece(studio, { deliveredOn: "2026-01-15" }).piece; // both tasks 2027-01-15
  createPiece(studio, { deliveredOn: "2025-07-10" }); // both 2026-07-10: 2 due soon
  createPiece(studio, { deliveredOn: "2025-07-15" }); // both 2026-07-15 = the last day counted: 2 due soon
  createPiece(studio, { deliveredOn: "2025-07-16" }); // both 2026-07-16: one day too late
  createPiece(studio, { deliveredOn: "2025-06-15" }); // both due today 2026-06-15: 2 due soon, not overdue

  // Care log. P1: a studio-entered annual check 2026-03-05 moves P1's annual check to 2027-03-05.
  careLog(studio, p1.id, ownerA.id, "annual_check", "2026-03-05", null, "studio");
  careLog(studio, p1.id, ownerA.id, "reoil", "2026-06-14", "base"); // base only: P1's top re-oil stays due 2026-07-01
  careLog(studio, p1.id, ownerA.id, "rewax", "2026-02-09", "top");
  // P2: annual check logged 2026-05-10 → next 2027-05-10; its re-oil stays overdue.
  careLog(studio, p2.id, ownerB.id, "annual_check", "2026-05-10", null);
  careLog(studio, p2.id, ownerB.id, "rewax", "2026-03-09", "top");

  // Reminder ledger (R1–R10 in the hand count below).
  ledger(studio, { pieceId: p2.id, userId: ownerB.id, kind: "annual_check", surface: "whole_piece", step: "before_14d", sentAt: "2026-04-17T13:00:00Z" }); // R1 acted (check 05-10, 23 d)
  ledger(studio, { pieceId: p2.id, userId: ownerB.id, kind: "reoil", surface: "top", step: "due_day", sentAt: "2026-05-01T13:00:00Z" }); // R2 not acted
  ledger(studio, { pieceId: p2.id, userId: ownerB.id, kind: "annual_check", surface: "whole_piece", step: "due_day", sentAt: "2026-05-01T13:00:00Z" }); // R3 acted (9 d)
  ledger(studio, { pieceId: p1.id, userId: ownerA.id, kind: "reoil", surface: "top", step: "before_14d", sentAt: "2026-06-14T13:00:00Z" }); // R4 not: the log was for the base
  ledger(studio, { pieceId: p1.id, userId: ownerA.id, kind: "reoil", surface: "top", step: "after_30d", sentAt: "2026-06-01T13:00:00Z", status: "failed" }); // R5 failed: not counted
  ledger(studio, { pieceId: p1.id, userId: ownerA.id, kind: "reoil", surface: "top", step: "due_day", sentAt: "2025-06-20T13:00:00Z" }); // R6 before the window
  ledger(studio, { pieceId: p1.id, userId: ownerC.id, kind: "annual_check", surface: "whole_piece", step: "due_day", sentAt: "2026-03-01T14:00:00Z" }); // R7 not: logged by the studio
  ledger(studio, { pieceId: p1.id, userId: ownerA.id, kind: "rewax", surface: "top", step: "after_30d", sentAt: "2026-01-10T14:00:00Z" }); // R8 acted: 02-09 is day 30
  ledger(studio, { pieceId: p1.id, userId: ownerA.id, kind: "rewax", surface: "top", step: "due_day", sentAt: "2026-01-09T14:00:00Z" }); // R9 not: 02-09 is day 31
  ledger(studio, { pieceId: p2.id, userId: ownerB.id, kind: "rewax", surface: "top", step: "before_14d", sentAt: "2026-03-10T03:30:00Z" }); // R10 acted: sent 03-09 23:30 EST, logged 03-09

  // Claims C1–C6.
  claim(studio, p1.id, ownerA.id, "finish_wear", "submitted", "2026-06-14T12:00:00Z"); // C1 waiting
  claim(studio, p2.id, ownerB.id, "crack_gap", "in_review", "2026-06-01T12:00:00Z", "2026-06-01T15:00:00Z"); // C2 3 h
  claim(studio, p2.id, ownerB.id, "crack_gap", "accepted", "2026-05-01T12:00:00Z", "2026-05-02T12:00:00Z"); // C3 24 h
  claim(studio, p1.id, ownerA.id, "resin_clouding", "declined", "2026-03-01T12:00:00Z", "2026-03-01T13:00:00Z"); // C4 1 h
  claim(studio, p1.id, ownerA.id, "finish_wear", "closed", "2025-03-01T12:00:00Z", "2025-03-11T12:00:00Z"); // C5 before the window
  claim(studio, p5.id, ownerA.id, "structural", "awaiting_owner", "2026-06-10T12:00:00Z", "2026-06-10T20:00:00Z"); // C6 8 h

  // Refresh offers O1–O5.
  offer(studio, p2.id, ownerB.id, "offered", "2026-04-17T13:00:00Z"); // O1
  offer(studio, p2.id, ownerB.id, "accepted", "2026-05-01T13:00:00Z"); // O2
  offer(studio, p1.id, ownerA.id, "declined", "2026-06-14T13:00:00Z"); // O3
  offer(studio, p1.id, ownerA.id, "expired", "2025-05-01T13:00:00Z"); // O4 before the window
  offer(studio, p1.id, ownerA.id, "accepted", "2025-08-01T13:00:00Z"); // O5

  // Payments Pay1–Pay7.
  const j1 = job(studio, p1.id);
  const j2 = job(studio, p2.id);
  payment(studio, j1.id, { amount: 10000, status: "paid", paidAt: "2026-06-01T03:00:00Z" }); // Pay1: 2026-05-31 23:00 EDT → May
  payment(studio, j2.id, { amount: 25000, refunded: 5000, status: "partially_refunded", paidAt: "2026-06-10T15:00:00Z" }); // Pay2: June, net 20000
  payment(studio, j2.id, { amount: 8000, refunded: 8000, status: "refunded", paidAt: "2026-04-02T15:00:00Z" }); // Pay3: April, net 0
  payment(studio, j1.id, { amount: 5000, status: "open" }); // Pay4: not paid
  payment(studio, j1.id, { amount: 7000, status: "paid", paidAt: "2025-06-30T15:00:00Z" }); // Pay5: before the window
  payment(studio, j1.id, { amount: 3000, status: "paid", paidAt: "2026-06-05T15:00:00Z", currency: "EUR" }); // Pay6: another currency
  payment(studio, j1.id, { amount: 4000, status: "expired" }); // Pay7: never paid

  // Visits V1–V5. 2026-06-15 is a Monday: the week runs to Sunday 2026-06-21 (EDT).
  const tech = await memberContext(studio, "technician");
  visit(studio, p1.id, tech.user.id, "2026-06-15T13:00:00Z", "booked"); // V1 Mon, booked
  visit(studio, p2.id, tech.user.id, "2026-06-17T18:00:00Z", "done"); // V2 Wed, done
  visit(studio, p2.id, tech.user.id, "2026-06-18T15:00:00Z", "cancelled"); // V3 cancelled: left out
  visit(studio, p1.id, tech.user.id, "2026-06-22T03:30:00Z", "booked"); // V4 Sun 21st 23:30 EDT: in
  visit(studio, p1.id, tech.user.id, "2026-06-15T03:30:00Z", "booked"); // V5 Sun 14th 23:30 EDT: last week

  // Another studio with one of everything: none of it may show up above.
  const other = createStudio({ name: "Elsewhere (invented)", timeZone: "America/New_York" });
  const op = createPiece(other, { deliveredOn: "2025-07-01", ownerId: ownerA.id }).piece;
  ledger(other, { pieceId: op.id, userId: ownerA.id, kind: "reoil", surface: "top", step: "due_day", sentAt: "2026-05-01T13:00:00Z" });
  claim(other, op.id, ownerA.id, "crack_gap", "submitted", "2026-06-01T12:00:00Z");
  offer(other, op.id, ownerA.id, "accepted", "2026-05-01T13:00:00Z");
  const oj = job(other, op.id);
  payment(other, oj.id, { amount: 99900, status: "paid", paidAt: "2026-06-02T15:00:00Z" });
  visit(other, op.id, tech.user.id, "2026-06-16T15:00:00Z", "booked");

  o = getOverview(staff, NOW);
});

describe("overview figures (hand-counted)", () => {
  it("dates and window", () => {
    expect(o.today).toBe("2026-06-15");
    expect(o.since).toBe("2025-07-01");
    expect(o.care.until).toBe("2026-07-15");
  });

  it("pieces delivered, under warranty, registered", () => {
    // Delivered on or before today and not archived: P1, P2, P5, 07-10, 07-15, 07-16, 06-15 = 7.
    // Under warranty: P1 only (P2's 12-month version ended 2026-05-01; the others carry no version) = 1.
    // Registered: P1, P2 = 2.
    expect(o.pieces).toEqual({ delivered: 7, underWarranty: 1, registered: 2 });
  });

  it("care tasks due in the next 30 days, from the care engine", () => {
    // Due 2026-06-15…2026-07-15: P1 re-oil (07-01); 07-10 piece re-oil + check; 07-15 piece re-oil +
    // check; 06-15 piece re-oil + check = 7 tasks on 4 pieces; re-oil 4, annual check 3.
    // Overdue: P2 re-oil (2026-05-01) = 1 task on 1 piece.
    expect(o.care.due).toBe(7);
    expect(o.care.piecesDue).toBe(4);
    expect(o.care.byKind).toEqual([
      { kind: "reoil", label: "Re-oil", count: 4, overdue: 1 },
      { kind: "annual_check", label: "Annual clean and check", count: 3, overdue: 0 },
    ]);
    expect(o.care.overdue).toBe(1);
    expect(o.care.piecesOverdue).toBe(1);
    expect(o.care.skipped).toBe(0);
  });

  it("reminders sent and care logged in return within 30 days", () => {
    // Sent in the window: R1 R2 R3 R4 R7 R8 R9 R10 = 8 (R5 failed, R6 before 2025-07-01).
    // Acted: R1, R3, R8, R10 = 4. By step: before 14 d R1✓ R4 R10✓ → 3/2; due day R2 R3✓ R7 R9 → 4/1;
    // after 30 d R8✓ → 1/1. Owners reminded: A, B, C = 3; owners who acted: A (R8), B (R1) = 2.
    expect(o.reminders.withinDays).toBe(30);
    expect(o.reminders.sent).toBe(8);
    expect(o.reminders.acted).toBe(4);
    expect(o.reminders.owners).toBe(3);
    expect(o.reminders.ownersActed).toBe(2);
    expect(o.reminders.byStep.map((s) => [s.step, s.sent, s.acted])).toEqual([
      ["before_14d", 3, 2],
      ["due_day", 4, 1],
      ["after_30d", 1, 1],
    ]);
  });

  it("claims by state and by category", () => {
    // C1 submitted, C2 in review, C3 accepted, C4 declined, C5 closed, C6 awaiting owner: 6 in all, 3 open.
    expect(o.claims.total).toBe(6);
    expect(o.claims.open).toBe(3);
    expect(Object.fromEntries(o.claims.byState.map((s) => [s.state, s.count]))).toEqual({ submitted: 1, in_review: 1, awaiting_owner: 1, accepted: 1, declined: 1, repair_booked: 0, closed: 1 });
    // crack/gap C2 C3; resin C4; finish wear C1 C5; structural C6.
    expect(Object.fromEntries(o.claims.byCategory.map((c) => [c.category, c.count]))).toEqual({ crack_gap: 2, resin_clouding: 1, finish_wear: 2, finish_peeling: 0, structural: 1, scratch_dent: 0, other: 0 });
  });

  it("median time to first answer", () => {
    // Answered and filed in the window: C2 3 h, C3 24 h, C4 1 h, C6 8 h → 1, 3, 8, 24 → (3 + 8) / 2 = 5.5 h.
    // Waiting for a first answer: C1 = 1.
    expect(o.firstAnswer.answered).toBe(4);
    expect(o.firstAnswer.medianMs).toBe(5.5 * H);
    expect(o.firstAnswer.waiting).toBe(1);
  });

  it("refresh offers sent and accepted", () => {
    // In the window: O1 offered, O2 accepted, O3 declined, O5 accepted = 4 sent, 2 accepted (O4 is older).
    expect(o.offers.sent).toBe(4);
    expect(o.offers.accepted).toBe(2);
    expect(Object.fromEntries(o.offers.byStatus.map((s) => [s.status, s.count]))).toEqual({ offered: 1, accepted: 2, declined: 1, expired: 0 });
  });

  it("repair revenue by month, paid minus refunded, in the studio's time zone", () => {
    // 12 months 2025-07 … 2026-06. April: 8000 − 8000 = 0; May: Pay1 10000 (paid 23:00 EDT on 31 May);
    // June: 25000 − 5000 = 20000. Total 30000 USD; EUR Pay6 left out and named.
    expect(o.revenue.months.map((m) => m.month)).toEqual(["2025-07", "2025-08", "2025-09", "2025-10", "2025-11", "2025-12", "2026-01", "2026-02", "2026-03", "2026-04", "2026-05", "2026-06"]);
    const by = Object.fromEntries(o.revenue.months.map((m) => [m.month, [m.paidMinor, m.refundedMinor, m.netMinor]]));
    expect(by["2026-04"]).toEqual([8000, 8000, 0]);
    expect(by["2026-05"]).toEqual([10000, 0, 10000]);
    expect(by["2026-06"]).toEqual([25000, 5000, 20000]);
    expect(o.revenue.months.filter((m) => m.paidMinor > 0)).toHaveLength(3);
    expect(o.revenue.totalNetMinor).toBe(30000);
    expect(o.revenue.otherCurrencies).toEqual(["EUR"]);
  });
});

describe("visits this week (hand-counted)", () => {
  it("Monday to Sunday in the studio's time zone, cancelled ones left out", () => {
    // V1 Mon booked, V2 Wed done, V4 Sun booked = 3 (V3 cancelled, V5 the week before, the other studio's not ours).
    expect([o.visits.weekFrom, o.visits.weekTo]).toEqual(["2026-06-15", "2026-06-21"]);
    expect([o.visits.total, o.visits.booked, o.visits.done]).toEqual([3, 2, 1]);
    expect(o.visits.byDay.filter((d) => d.booked || d.done)).toEqual([
      { date: "2026-06-15", booked: 1, done: 0 },
      { date: "2026-06-17", booked: 0, done: 1 },
      { date: "2026-06-21", booked: 1, done: 0 },
    ]);
  });
});

describe("overview access and helpers", () => {
  it("another studio's staff see only their own studio", async () => {
    const lonely = createStudio({ name: "Empty (invented)" });
    const e = getOverview(await memberContext(lonely, "admin"), NOW);
    expect(e.pieces.delivered).toBe(0);
    expect(e.reminders.sent).toBe(0);
    expect(e.claims.total).toBe(0);
    expect(e.offers.sent).toBe(0);
    expect(e.revenue.totalNetMinor).toBe(0);
    expect(e.firstAnswer.medianMs).toBeNull();
    expect(e.visits.total).toBe(0);
  });

  it("a technician is refused", async () => {
    const tech = await memberContext(studio, "technician");
    expect(() => getOverview(tech, NOW)).toThrow(AppError);
    try {
      getOverview(tech, NOW);
    } catch (err) {
      expect((err as AppError).status).toBe(403);
    }
  });

  it("median and the care-logged-after rule", () => {
    expect(median([])).toBeNull();
    expect(median([5])).toBe(5);
    expect(median([9, 1, 4])).toBe(4);
    const r = { taskKey: "p:reoil:top", taskKind: "reoil" as const, sentAt: new Date("2026-01-10T14:00:00Z") };
    expect(careLoggedAfter(r, [{ taskKind: "reoil", doneOn: "2026-01-09", surface: "top" }], "America/New_York")).toBeNull(); // before the reminder
    expect(careLoggedAfter(r, [{ taskKind: "reoil", doneOn: "2026-01-10", surface: null }], "America/New_York")).toBe("2026-01-10"); // no surface counts
    expect(careLoggedAfter(r, [{ taskKind: "reoil", doneOn: "2026-01-12", surface: "edges" }], "America/New_York")).toBe("2026-01-12"); // edges belong to the top
    expect(careLoggedAfter(r, [{ taskKind: "rewax", doneOn: "2026-01-12", surface: "top" }], "America/New_York")).toBeNull(); // another task
  });

  it("the figures do not change when computed again (no writes)", () => {
    expect(getOverview(staff, NOW)).toEqual(o);
    expect(getDb().select().from(pieces).all().length).toBeGreaterThan(0);
  });
});
