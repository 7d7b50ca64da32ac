// Visit reminders say "today", "tomorrow" or the date by the owner's own calendar day — across the
// autumn change (a 25-hour day with a repeated hour), in the fortnight when New York has changed its
// clocks and Berlin has not, and for an owner west of the studio. Real SQLite file, the real SMTP
// sink, the real reminder pass at fixed instants (never the real clock).
// Sources for the change instants: United States daylight time runs from 2:00 a.m. local on the
// second Sunday of March to 2:00 a.m. local on the first Sunday of November (15 U.S.C. §260a, as
// amended by the Energy Policy Act of 2005 §110) — 14 March and 7 November 2027; European summer
// time runs from 01:00 UTC on the last Sunday of March to 01:00 UTC on the last Sunday of October
// (Directive 2000/84/EC, Articles 1–2) — 28 March 2027. Offsets: EST UTC−5, EDT UTC−4, CET UTC+1,
// PDT UTC−7 (IANA tz database).
import { eq } from "drizzle-orm";
import { describe, expect, it } from "vitest";
import { getDb } from "@/db/client";
import { users } from "@/db/schema";
import { bookVisit } from "@/lib/visits/book";
import { runVisitReminderPass } from "@/lib/visits/reminders";
import { listJobSlots } from "@/lib/visits/slots";
import { listMail } from "../support/mail";
import { staffActor, visitWorld, WEEKDAYS_9_TO_5 } from "./visits-helpers";

const BOOK_AT = Date.parse("2027-03-01T12:00:00Z");
// Mon–Sat 09:00–17:00 and Sunday 10:00–14:00 (studio time), so Sundays have slots.
const ALL_WEEK = [...[1, 2, 3, 4, 5, 6].map((weekday) => ({ weekday, start: "09:00", end: "17:00" })), { weekday: 7, start: "10:00", end: "14:00" }];

/** A paid job in a New York studio, booked at the first free slot from `from`, its owner reading `ownerZone`. */
async function booked(from: string, ownerZone: string, hours = WEEKDAYS_9_TO_5) {
  const w = await visitWorld({ hours });
  getDb().update(users).set({ timeZone: ownerZone }).where(eq(users.id, w.owner.id)).run();
  const slot = listJobSlots(staffActor(w.staff), w.job.id, { from, to: new Date(Date.parse(from) + 2 * 86_400_000).toISOString() }, BOOK_AT).slots[0]!;
  const visit = await bookVisit(staffActor(w.staff), { jobId: w.job.id, technicianId: slot.technicianId, start: slot.start }, BOOK_AT);
  return { ...w, visit };
}

async function subjectAfterPass(w: Awaited<ReturnType<typeof booked>>, at: string): Promise<string[]> {
  const sent = (await runVisitReminderPass({ now: new Date(at) })).sent.filter((s) => s.visitId === w.visit.id);
  expect(sent).toHaveLength(1);
  // The pass hands the mail to the sink before it returns.
  return (await listMail({ to: w.owner.email })).map((m) => m.subject).filter((s) => / your visit, /.test(s));
}

describe("visit reminders by the owner's calendar day", () => {
  it("across the November change: 23:30 EDT on Saturday is the day before a Sunday 10:00 EST visit; 00:30 and the repeated 01:30 are the day itself", async () => {
    const eve = await booked("2027-11-07T05:00:00Z", "America/New_York", ALL_WEEK);
    expect(eve.visit.start).toBe("2027-11-07T15:00:00.000Z"); // Sunday 7 November 2027, 10:00 EST
    // 03:30 UTC = Saturday 23:30 EDT, 11.5 h ahead: under a day, but tomorrow.
    expect(await subjectAfterPass(eve, "2027-11-07T03:30:00Z")).toEqual(["Tomorrow: your visit, Sunday, 7 November 2027, 10:00–11:30 EST"]);

    const midnight = await booked("2027-11-07T05:00:00Z", "America/New_York", ALL_WEEK);
    // 04:30 UTC = Sunday 00:30 EDT, 10.5 h ahead.
    expect(await subjectAfterPass(midnight, "2027-11-07T04:30:00Z")).toEqual(["Today: your visit, Sunday, 7 November 2027, 10:00–11:30 EST"]);

    const repeated = await booked("2027-11-07T05:00:00Z", "America/New_York", ALL_WEEK);
    // 06:30 UTC = 01:30 EST, the second time the clocks read 01:30 that night.
    expect(await subjectAfterPass(repeated, "2027-11-07T06:30:00Z")).toEqual(["Today: your visit, Sunday, 7 November 2027, 10:00–11:30 EST"]);
  });

  it("between the US and European changes: a Berlin owner of a New York studio reads Berlin's day and hours (5 h ahead that fortnight, not 6)", async () => {
    const berlin = await booked("2027-03-23T04:00:00Z", "Europe/Berlin");
    expect(berlin.visit.start).toBe("2027-03-23T13:00:00.000Z"); // Tuesday 23 March 2027, 09:00 EDT = 14:00 CET
    // 23:30 UTC on the 22nd: 19:30 on Monday in New York (the studio's "tomorrow"), 00:30 on Tuesday in Berlin.
    expect(await subjectAfterPass(berlin, "2027-03-22T23:30:00Z")).toEqual(["Today: your visit, Tuesday, 23 March 2027, 14:00–15:30 CET"]);
  });

  it("an owner west of the studio: Los Angeles reads 'tomorrow' when it is already the visit's day in New York", async () => {
    const west = await booked("2027-03-23T04:00:00Z", "America/Los_Angeles");
    // 04:30 UTC on the 23rd: 00:30 Tuesday in New York, 21:30 Monday in Los Angeles; the visit is 06:00 PDT.
    expect(await subjectAfterPass(west, "2027-03-23T04:30:00Z")).toEqual(["Tomorrow: your visit, Tuesday, 23 March 2027, 06:00–07:30 PDT"]);
  });
});
