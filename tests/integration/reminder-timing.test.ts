// The studio's reminder timing (settings → reminder timing: studios.reminder_send_hour and
// studios.reminder_steps) as the reminder pass uses it, against a real SQLite file and the real SMTP
// sink: the send hour in the owner's zone, steps turned off, the refresh offer moving to the first step
// left, everything off (visit reminders still go), a change taking effect on the next pass, and send
// hours that fall into a daylight-saving gap or a repeated hour. Invented studios, owners and pieces.
//
// Every pass of this file covers every studio in its database, so each test seeds its own studio and
// owners when it starts and looks only at their mail and ledger rows. Local wall times are turned into
// instants with Luxon (a reference library, not our lib/care/dates), from a fixed NOW.
import { eq } from "drizzle-orm";
import { DateTime } from "luxon";
import { describe, expect, it } from "vitest";
import { getDb } from "@/db/client";
import { refreshOffers, reminderSends, users, type Studio } from "@/db/schema";
import type { ReminderStep } from "@/lib/care/vocabulary";
import { runReminderPass, type PassReport } from "@/lib/reminders/pass";
import { updateReminderTiming } from "@/lib/settings";
import { runVisitReminderPass } from "@/lib/visits/reminders";
import { bookVisit } from "@/lib/visits/book";
import { listJobSlots } from "@/lib/visits/slots";
import { memberContext } from "../support/fixtures";
import { listMail } from "../support/mail";
import { ledgerOf, ownDatabaseFile, seedOwner, seedPiece, seedStudio } from "./reminders-helpers";
import { ownerActor, visitWorld } from "./visits-helpers";

ownDatabaseFile("timing");

/** The fixed instant the dates of the first tests are counted from (a Monday). */
const NOW = DateTime.fromISO("2026-09-14T12:00:00Z", { zone: "utc" });
/** A fixed instant for booking a visit (see the every-step-off test). */
// A Monday at least 60 days ahead, 12:00 UTC: clear of every other fixture and inside the visit
// calendar (two years ahead of today) whatever day the suite runs.
const VISIT_NOW = DateTime.utc().plus({ days: 60 }).startOf("week").plus({ weeks: 1 }).set({ hour: 12, minute: 0, second: 0, millisecond: 0 });
const ALL: ReminderStep[] = ["before_14d", "due_day", "after_30d"];

/** The calendar date of NOW in a zone, plus `days`. */
const dayOf = (zone: string, days = 0) => NOW.setZone(zone).plus({ days }).toISODate()!;
/** The instant of a local wall time "HH:mm" on `date` in `zone` (Luxon moves a time in a gap forward). */
const at = (zone: string, date: string, hhmm: string) => DateTime.fromISO(`${date}T${hhmm}`, { zone }).toJSDate();

/**
 * A hardwax-oiled dining table (heavy use: re-oil and the yearly check both every 12 months, lib/care/intervals.ts)
 * delivered and oiled so that both tasks are due 14 days after `firstStepOn`: their 14-days-before
 * reminder is on `firstStepOn`, the due-day one 14 days later and the last one 30 days after that.
 */
function pieceWithFirstStepOn(studio: Studio, oilProductId: string, ownerId: string, firstStepOn: string) {
  const oiled = DateTime.fromISO(firstStepOn).plus({ days: 14 }).minus({ months: 12 }).toISODate()!;
  const piece = seedPiece(studio, ownerId, { deliveredOn: oiled, layers: [{ surface: "top", finishClass: "hardwax_oil", productId: oilProductId, appliedOn: oiled, coats: 2 }] });
  return { piece, dueOn: DateTime.fromISO(firstStepOn).plus({ days: 14 }).toISODate()! };
}

/** The reminder steps (re-oil and yearly check) that reached `to`, as "kind:step", sorted. */
async function stepsMailed(to: string): Promise<string[]> {
  const out: string[] = [];
  for (const m of await listMail({ to })) {
    const key = m.headers["x-grainward-reminder"] ?? "";
    const [, kind, , , step] = key.split(":");
    out.push(`${kind}:${step}`);
  }
  return out.sort();
}

const rowsOf = (pieceId: string) =>
  ledgerOf(pieceId)
    .map((r) => `${r.taskKind}:${r.step}:${r.status}`)
    .sort();
const sentTo = (r: PassReport, to: string) => r.sent.filter((s) => s.to === to);

describe("the send hour, in the owner's time zone", () => {
  it("nothing before the studio's hour (18:00), both reminders in the sink from 18:00", async () => {
    // Studio in Berlin, owner in Chicago: the hour is the owner's local time, not the studio's.
    const { studio, products } = seedStudio({ timeZone: "Europe/Berlin", reminderSendHour: 18 });
    const owner = seedOwner({ timeZone: "America/Chicago" });
    const d = dayOf("America/Chicago");
    const { piece } = pieceWithFirstStepOn(studio, products.oil, owner.id, d);

    for (const hhmm of ["09:00", "12:00", "17:59"]) {
      const r = await runReminderPass({ now: at("America/Chicago", d, hhmm) });
      expect(sentTo(r, owner.email), hhmm).toHaveLength(0);
    }
    // 18:00 in Berlin (11:00 in Chicago) is not the owner's 18:00.
    expect(sentTo(await runReminderPass({ now: at("Europe/Berlin", d, "18:00") }), owner.email)).toHaveLength(0);
    expect(await listMail({ to: owner.email })).toHaveLength(0);
    expect(ledgerOf(piece.id)).toHaveLength(0);

    const r = await runReminderPass({ now: at("America/Chicago", d, "18:00") });
    expect(sentTo(r, owner.email)).toHaveLength(2);
    expect(await stepsMailed(owner.email)).toEqual(["annual_check:before_14d", "reoil:before_14d"]);
    expect(rowsOf(piece.id)).toEqual(["annual_check:before_14d:sent", "reoil:before_14d:sent"]);
    // 18:00 CDT is 23:00 UTC (UTC−5 in summer time).
    expect(at("America/Chicago", d, "18:00").toISOString()).toBe(`${d}T23:00:00.000Z`);
  });

  it("a change made on the settings page counts from the next pass (no restart)", async () => {
    const { studio, products } = seedStudio({ timeZone: "Asia/Tokyo" });
    const admin = await memberContext(studio, "admin");
    const owner = seedOwner({ timeZone: "Asia/Tokyo" });
    const d = dayOf("Asia/Tokyo", 3);
    pieceWithFirstStepOn(studio, products.oil, owner.id, d);
    const instant = at("Asia/Tokyo", d, "07:30");

    expect(sentTo(await runReminderPass({ now: instant }), owner.email)).toHaveLength(0); // default 09:00
    updateReminderTiming(admin, { sendHour: 7, steps: ALL });
    expect(sentTo(await runReminderPass({ now: instant }), owner.email)).toHaveLength(2);
    expect(await stepsMailed(owner.email)).toEqual(["annual_check:before_14d", "reoil:before_14d"]);

    // Turned off now, the due-day step no longer goes out on its day (also read afresh).
    updateReminderTiming(admin, { sendHour: 7, steps: ["before_14d", "after_30d"] });
    const dueDay = DateTime.fromISO(d).plus({ days: 14 }).toISODate()!;
    expect(sentTo(await runReminderPass({ now: at("Asia/Tokyo", dueDay, "08:00") }), owner.email)).toHaveLength(0);
    expect(await listMail({ to: owner.email })).toHaveLength(2);
  });
});

describe("steps the studio turned off", () => {
  it("the due-day step is never sent, and never recorded as skipped, over daily passes through the whole cycle", async () => {
    const { studio, products } = seedStudio({ reminderSteps: ["before_14d", "after_30d"] });
    const owner = seedOwner({ timeZone: "America/Los_Angeles" });
    const d = dayOf("America/Los_Angeles", 7);
    const { piece, dueOn } = pieceWithFirstStepOn(studio, products.oil, owner.id, d);

    // One pass a day at 10:00 local, from the day before the first step to the day after the last.
    const sentOn = new Map<string, number>();
    for (let i = -1; i <= 14 + 30 + 1; i++) {
      const day = DateTime.fromISO(d).plus({ days: i }).toISODate()!;
      const r = await runReminderPass({ now: at("America/Los_Angeles", day, "10:00") });
      const mine = sentTo(r, owner.email).length;
      if (mine) sentOn.set(day, mine);
    }
    const lastStep = DateTime.fromISO(dueOn).plus({ days: 30 }).toISODate()!;
    expect(Object.fromEntries(sentOn)).toEqual({ [d]: 2, [lastStep]: 2 });
    expect(await stepsMailed(owner.email)).toEqual(["annual_check:after_30d", "annual_check:before_14d", "reoil:after_30d", "reoil:before_14d"]);
    // No due-day row of any status: not sent, not "skipped".
    expect(rowsOf(piece.id)).toEqual(["annual_check:after_30d:sent", "annual_check:before_14d:sent", "reoil:after_30d:sent", "reoil:before_14d:sent"]);
    // The offer went with the first reminder, as with every step on.
    const offer = getDb().select().from(refreshOffers).where(eq(refreshOffers.pieceId, piece.id)).get()!;
    const firstRow = ledgerOf(piece.id).find((r) => r.taskKind === "reoil" && r.step === "before_14d")!;
    expect(offer.reminderSendId).toBe(firstRow.id);
  }, 60_000);

  it("a pass that comes late does not go by a step turned off: the last enabled step that has come is the one sent", async () => {
    const { studio, products } = seedStudio({ reminderSteps: ["before_14d", "after_30d"] });
    const owner = seedOwner({ timeZone: "America/Los_Angeles" });
    const d = dayOf("America/Los_Angeles", 9);
    const { piece, dueOn } = pieceWithFirstStepOn(studio, products.oil, owner.id, d);
    // The first pass after the first step comes 40 days later (between due day and the last step).
    const late = DateTime.fromISO(dueOn).plus({ days: 26 }).toISODate()!;
    const r = await runReminderPass({ now: at("America/Los_Angeles", late, "10:00") });
    // before_14d is still the current step (due_day is off, after_30d has not come): it is sent late.
    expect(sentTo(r, owner.email)).toHaveLength(2);
    expect(rowsOf(piece.id)).toEqual(["annual_check:before_14d:sent", "reoil:before_14d:sent"]);
  });
});

describe("the refresh offer rides on the first step the studio sends", () => {
  it("14-days-before off: nothing on its day; the due-day reminder carries the priced offer", async () => {
    const { studio, products } = seedStudio({ reminderSteps: ["due_day", "after_30d"] });
    const owner = seedOwner({ timeZone: "America/Denver" });
    const d = dayOf("America/Denver", 11);
    const { piece, dueOn } = pieceWithFirstStepOn(studio, products.oil, owner.id, d);

    const first = await runReminderPass({ now: at("America/Denver", d, "10:00") });
    expect(sentTo(first, owner.email)).toHaveLength(0);
    expect(ledgerOf(piece.id)).toHaveLength(0);
    expect(getDb().select().from(refreshOffers).where(eq(refreshOffers.pieceId, piece.id)).all()).toHaveLength(0);

    const r = await runReminderPass({ now: at("America/Denver", dueOn, "10:00") });
    const mine = sentTo(r, owner.email);
    expect(mine).toHaveLength(2);
    const offer = getDb().select().from(refreshOffers).where(eq(refreshOffers.pieceId, piece.id)).get()!;
    expect(offer).toMatchObject({ dueOn, status: "offered", currency: "USD" });
    const dueRow = ledgerOf(piece.id).find((x) => x.taskKind === "reoil" && x.step === "due_day")!;
    expect(offer.reminderSendId).toBe(dueRow.id);
    expect(mine.find((s) => s.reminderKey === dueRow.reminderKey)?.offerId).toBe(offer.id);
    const mail = (await listMail({ to: owner.email })).find((m) => m.headers["x-grainward-reminder"] === dueRow.reminderKey)!;
    expect(mail.headers["x-grainward-offer"]).toBe(offer.id);
    expect(mail.text).toContain("Accept the refresh offer");
    expect(rowsOf(piece.id)).toEqual(["annual_check:due_day:sent", "reoil:due_day:sent"]);
  });

  it("an offer already riding on a 14-days-before reminder that never went out moves to the due-day one when that step is turned off", async () => {
    const { studio, products } = seedStudio();
    const admin = await memberContext(studio, "admin");
    const owner = seedOwner({ timeZone: "America/Denver" });
    const d = dayOf("America/Denver", 13);
    const { piece, dueOn } = pieceWithFirstStepOn(studio, products.oil, owner.id, d);

    // A pass claims the 14-days-before reminders and creates the offer, then stops before SMTP.
    await runReminderPass({ now: at("America/Denver", d, "10:00"), deliver: false });
    const offer = getDb().select().from(refreshOffers).where(eq(refreshOffers.pieceId, piece.id)).get()!;
    const early = ledgerOf(piece.id).find((x) => x.taskKind === "reoil" && x.step === "before_14d")!;
    expect(early.status).toBe("queued");
    expect(offer.reminderSendId).toBe(early.id);

    updateReminderTiming(admin, { sendHour: 9, steps: ["due_day", "after_30d"] });
    // An hour later the abandoned claims would be retried; with the step off they are cancelled instead.
    const r = await runReminderPass({ now: at("America/Denver", d, "11:00") });
    expect(sentTo(r, owner.email)).toHaveLength(0);
    expect(r.cancelled).toBeGreaterThanOrEqual(2);
    const early2 = ledgerOf(piece.id).filter((x) => x.step === "before_14d");
    expect(early2.map((x) => x.status)).toEqual(["cancelled", "cancelled"]);
    expect(early2.every((x) => x.nextAttemptAt === null && /turned this reminder step off/.test(x.lastError ?? ""))).toBe(true);
    expect(await listMail({ to: owner.email })).toHaveLength(0);

    const due = await runReminderPass({ now: at("America/Denver", dueOn, "10:00") });
    expect(sentTo(due, owner.email)).toHaveLength(2);
    const dueRow = ledgerOf(piece.id).find((x) => x.taskKind === "reoil" && x.step === "due_day")!;
    const after = getDb().select().from(refreshOffers).where(eq(refreshOffers.pieceId, piece.id)).all();
    expect(after).toHaveLength(1);
    expect(after[0]).toMatchObject({ id: offer.id, status: "offered", reminderSendId: dueRow.id });
    const mail = (await listMail({ to: owner.email })).find((m) => m.headers["x-grainward-reminder"] === dueRow.reminderKey)!;
    expect(mail.headers["x-grainward-offer"]).toBe(offer.id);
    expect(mail.text).toContain("Accept the refresh offer");
  });
});

describe("every step off", () => {
  it("no care reminder or offer for that studio's owners (a studio with the default steps still sends); visit reminders still go", async () => {
    // The studio with every step off also has a booked visit for the same owner.
    const w = await visitWorld();
    const admin = await memberContext(w.studio, "admin");
    updateReminderTiming(admin, { sendHour: 9, steps: [] });
    getDb().update(users).set({ emailVerifiedAt: new Date("2025-01-01T00:00:00Z"), timeZone: "America/New_York" }).where(eq(users.id, w.owner.id)).run();
    const d = dayOf("America/New_York", 15);
    const { piece: offPiece, dueOn } = pieceWithFirstStepOn(w.studio, w.product.id, w.owner.id, d);

    const control = seedStudio({ timeZone: "America/New_York" });
    const controlOwner = seedOwner({ timeZone: "America/New_York" });
    pieceWithFirstStepOn(control.studio, control.products.oil, controlOwner.id, d);

    const lastStep = DateTime.fromISO(dueOn).plus({ days: 30 }).toISODate()!;
    for (const day of [d, dueOn, lastStep]) {
      const r = await runReminderPass({ now: at("America/New_York", day, "10:00") });
      expect(sentTo(r, w.owner.email), day).toHaveLength(0);
      expect(sentTo(r, controlOwner.email), day).toHaveLength(2);
    }
    expect(ledgerOf(offPiece.id)).toHaveLength(0);
    expect(getDb().select().from(refreshOffers).where(eq(refreshOffers.studioId, w.studio.id)).all()).toHaveLength(0);
    expect(getDb().select().from(reminderSends).where(eq(reminderSends.studioId, w.studio.id)).all()).toHaveLength(0);
    expect((await listMail({ to: w.owner.email })).filter((m) => m.headers["x-grainward-reminder"])).toHaveLength(0);

    // Booked at a fixed instant at least two days ahead of the visit: the booking mail (stamped with the
    // booking's instant) is not inside the visit's last 24 h, so the reminder is due.
    const bookAt = VISIT_NOW.toMillis();
    const slot = listJobSlots(ownerActor(w.owner), w.job.id, { from: new Date(bookAt + 2 * 86_400_000).toISOString(), to: new Date(bookAt + 9 * 86_400_000).toISOString() }, bookAt).slots[0]!;
    const v = await bookVisit(ownerActor(w.owner), { jobId: w.job.id, technicianId: slot.technicianId, start: slot.start }, bookAt);
    const visitPass = await runVisitReminderPass({ now: new Date(Date.parse(v.start) - 23 * 3_600_000) });
    expect(visitPass.sent.filter((s) => s.visitId === v.id)).toHaveLength(1);
    expect((await listMail({ to: w.owner.email })).filter((m) => m.subject.startsWith("Tomorrow: your visit"))).toHaveLength(1);
  });
});

describe("a send hour the clocks skip or repeat", () => {
  // Sources for the change instants (checked against Luxon below):
  // - United States: daylight time begins at 2:00 a.m. local on the second Sunday of March
  //   (15 U.S.C. §260a, as amended by the Energy Policy Act of 2005 §110) — 14 March 2027; New York
  //   goes from 01:59:59 EST (UTC−5) to 03:00 EDT (UTC−4) at 07:00 UTC. It ends at 2:00 a.m. on the
  //   first Sunday of November — 1 November 2026: 01:00–01:59 happens twice (05:00Z EDT, 06:00Z EST).
  // - European Union: summer time begins at 01:00 UTC on the last Sunday of March (Directive
  //   2000/84/EC, art. 2) — 28 March 2027; Berlin goes from 01:59:59 CET to 03:00 CEST.
  it("the change instants, from Luxon and the rules above", () => {
    expect(DateTime.fromISO("2027-03-14").weekday).toBe(7);
    expect(DateTime.fromISO("2027-03-28").weekday).toBe(7);
    expect(DateTime.fromISO("2026-11-01").weekday).toBe(7);
    const ny = DateTime.fromObject({ year: 2027, month: 3, day: 14, hour: 2 }, { zone: "America/New_York" });
    expect(ny.toUTC().toISO()).toBe("2027-03-14T07:00:00.000Z");
    expect(ny.toFormat("HH:mm ZZ")).toBe("03:00 -04:00");
    const be = DateTime.fromObject({ year: 2027, month: 3, day: 28, hour: 2 }, { zone: "Europe/Berlin" });
    expect(be.toUTC().toISO()).toBe("2027-03-28T01:00:00.000Z");
    expect(be.toFormat("HH:mm ZZ")).toBe("03:00 +02:00");
    expect(DateTime.fromISO("2026-11-01T05:30:00Z").setZone("America/New_York").toFormat("HH:mm ZZ")).toBe("01:30 -04:00");
    expect(DateTime.fromISO("2026-11-01T06:30:00Z").setZone("America/New_York").toFormat("HH:mm ZZ")).toBe("01:30 -05:00");
  });

  /** Hourly passes at minute 5 UTC (as the scheduler runs) over [from, to); the count sent to each address. */
  async function hourly(from: string, to: string, emails: string[]) {
    const counts = new Map(emails.map((e) => [e, 0]));
    for (let t = Date.parse(from) + 5 * 60_000; t < Date.parse(to); t += 3_600_000) {
      const r = await runReminderPass({ now: new Date(t) });
      for (const e of emails) counts.set(e, counts.get(e)! + sentTo(r, e).length);
    }
    return Object.fromEntries(counts);
  }

  it("02:00 on the spring-forward day: New York and Berlin each get their reminders that day, at the first instant after the gap, once", async () => {
    const { studio, products } = seedStudio({ reminderSendHour: 2 });
    const ny = seedOwner({ timeZone: "America/New_York" });
    const berlin = seedOwner({ timeZone: "Europe/Berlin" });
    const nyPiece = pieceWithFirstStepOn(studio, products.oil, ny.id, "2027-03-14").piece;
    const bePiece = pieceWithFirstStepOn(studio, products.oil, berlin.id, "2027-03-28").piece;

    // New York: the day before and the small hours up to the gap — nothing (last pass 06:05Z = 01:05 EST).
    expect(await hourly("2027-03-13T05:00:00Z", "2027-03-14T07:00:00Z", [ny.email])).toEqual({ [ny.email]: 0 });
    expect(sentTo(await runReminderPass({ now: new Date(Date.parse("2027-03-14T07:00:00Z") - 1) }), ny.email)).toHaveLength(0);
    const nyFirst = await runReminderPass({ now: new Date("2027-03-14T07:00:00Z") });
    expect(sentTo(nyFirst, ny.email)).toHaveLength(2);
    // The rest of that day and the next: nothing more.
    expect(await hourly("2027-03-14T07:00:00Z", "2027-03-16T05:00:00Z", [ny.email])).toEqual({ [ny.email]: 0 });
    const nyRows = ledgerOf(nyPiece.id);
    expect(nyRows.map((r) => `${r.taskKind}:${r.step}:${r.status}:${r.attempts}`).sort()).toEqual(["annual_check:before_14d:sent:1", "reoil:before_14d:sent:1"]);
    for (const r of nyRows) expect(DateTime.fromJSDate(r.sentAt!).setZone("America/New_York").toFormat("yyyy-MM-dd HH:mm")).toBe("2027-03-14 03:00");
    expect(await stepsMailed(ny.email)).toEqual(["annual_check:before_14d", "reoil:before_14d"]);

    // Berlin: nothing through 01:59:59 CET (00:59:59Z), both at 03:00 CEST (01:00Z), never again.
    expect(await hourly("2027-03-26T23:00:00Z", "2027-03-28T00:00:00Z", [berlin.email])).toEqual({ [berlin.email]: 0 });
    expect(sentTo(await runReminderPass({ now: new Date("2027-03-28T00:59:59.999Z") }), berlin.email)).toHaveLength(0);
    expect(sentTo(await runReminderPass({ now: new Date("2027-03-28T01:00:00Z") }), berlin.email)).toHaveLength(2);
    expect(await hourly("2027-03-28T01:00:00Z", "2027-03-29T23:00:00Z", [berlin.email])).toEqual({ [berlin.email]: 0 });
    const beRows = ledgerOf(bePiece.id);
    expect(beRows.map((r) => `${r.step}:${r.status}:${r.attempts}`)).toEqual(["before_14d:sent:1", "before_14d:sent:1"]);
    for (const r of beRows) expect(DateTime.fromJSDate(r.sentAt!).setZone("Europe/Berlin").toFormat("yyyy-MM-dd HH:mm")).toBe("2027-03-28 03:00");
    expect(await listMail({ to: berlin.email })).toHaveLength(2);
  }, 120_000);

  it("01:00 on the fall-back day (New York lives 01:00–01:59 twice): sent in the first 01:00 hour, not again in the second", async () => {
    const { studio, products } = seedStudio({ reminderSendHour: 1 });
    const ny = seedOwner({ timeZone: "America/New_York" });
    const { piece } = pieceWithFirstStepOn(studio, products.oil, ny.id, "2026-11-01");
    // 04:05Z = 00:05 EDT: not yet.
    expect(await hourly("2026-10-31T04:00:00Z", "2026-11-01T05:00:00Z", [ny.email])).toEqual({ [ny.email]: 0 });
    // 05:05Z = 01:05 EDT: sent; 06:05Z = 01:05 EST (the same wall time again) and the rest of the day: nothing.
    expect(await hourly("2026-11-01T05:00:00Z", "2026-11-01T06:00:00Z", [ny.email])).toEqual({ [ny.email]: 2 });
    expect(await hourly("2026-11-01T06:00:00Z", "2026-11-02T06:00:00Z", [ny.email])).toEqual({ [ny.email]: 0 });
    expect(ledgerOf(piece.id).map((r) => `${r.step}:${r.status}:${r.attempts}`)).toEqual(["before_14d:sent:1", "before_14d:sent:1"]);
    expect(await listMail({ to: ny.email })).toHaveLength(2);
  }, 60_000);
});
