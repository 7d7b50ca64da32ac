// Visits against a real SQLite file and the real SMTP sink: slots across daylight-saving weeks, booking
// and its conflicts, moving and cancelling by the studio's rules, tenancy, the report (layers, care
// log, next due date, job done, summary mail), the 24 h reminder ledger, hours validation, photos.
import { and, eq } from "drizzle-orm";
import { DateTime } from "luxon";
import sharp from "sharp";
import { describe, expect, it } from "vitest";
import { ZodError } from "zod";
import { getDb } from "@/db/client";
import { careLogEntries, files, finishLayers, repairJobs, visitMailSends, visitRules, visits } from "@/db/schema";
import { AppError } from "@/lib/errors";
import { bookVisitSchema, technicianHoursSchema, visitReportSchema } from "@/lib/validation/visits";
import { canViewFile } from "@/lib/files/access";
import { scheduleFromRows } from "@/lib/pieces/care-inputs";
import { studioProducts } from "@/lib/pieces/registry";
import { runVisitReminderPass } from "@/lib/visits/reminders";
import { addVisitPhoto } from "@/lib/visits/photos";
import { bookVisit } from "@/lib/visits/book";
import { cancelVisit } from "@/lib/visits/cancel";
import { getTechnicianHours, putTechnicianHours } from "@/lib/visits/technicians";
import { listJobSlots } from "@/lib/visits/slots";
import { listVisits } from "@/lib/visits/list";
import { moveVisit } from "@/lib/visits/reschedule";
import { submitReport } from "@/lib/visits/report";
import { technicianDay } from "@/lib/visits/technician-day";
import { createStudio, createUser, memberContext } from "../support/fixtures";
import { listMail, waitForMail } from "../support/mail";
import { addJob, luciaUser, ownerActor, reportInput, staffActor, statusOf, techActor, visitWorld } from "./visits-helpers";

const HOUR = 3_600_000;
const NOW = Date.parse("2027-05-03T12:00:00Z"); // Monday 3 May 2027, 08:00 in New York

function local(iso: string, zone = "America/New_York") {
  return DateTime.fromISO(iso, { zone });
}

describe("slots in daylight-saving weeks (America/New_York)", () => {
  // Mon–Sat 09:00–17:00 and Sunday 10:00–14:00, so the change days themselves have hours too.
  const hours = [...[1, 2, 3, 4, 5, 6].map((weekday) => ({ weekday, start: "09:00", end: "17:00" })), { weekday: 7, start: "10:00", end: "14:00" }];

  for (const [name, from, to, changeDay] of [
    ["March 2027 (clocks go forward on Sunday 14 March)", "2027-03-10T05:00:00Z", "2027-03-18T04:00:00Z", "2027-03-14"],
    ["November 2027 (clocks go back on Sunday 7 November)", "2027-11-03T04:00:00Z", "2027-11-11T05:00:00Z", "2027-11-07"],
  ] as const) {
    it(`${name}: every slot lies inside the local working hours; each day starts at its local opening time`, async () => {
      const w = await visitWorld({ hours });
      const now = Date.parse(from) - 5 * 24 * HOUR;
      const { slots, durationMin } = listJobSlots(ownerActor(w.owner), w.job.id, { from, to }, now);
      expect(slots.length).toBeGreaterThan(30);
      const days = new Map<string, string[]>();
      for (const s of slots) {
        // Luxon (reference only) reads each instant in the zone independently of lib/care.
        const a = local(s.start);
        const b = local(s.end);
        expect(a.toISODate()).toBe(b.toISODate());
        const sunday = a.weekday === 7;
        const open = sunday ? 10 * 60 : 9 * 60;
        const close = sunday ? 14 * 60 : 17 * 60;
        expect(a.hour * 60 + a.minute).toBeGreaterThanOrEqual(open);
        expect(b.hour * 60 + b.minute).toBeLessThanOrEqual(close);
        expect(b.diff(a, "minutes").minutes).toBe(durationMin);
        expect(s.localStart).toBe(a.toFormat("HH:mm"));
        expect(s.localDate).toBe(a.toISODate());
        days.set(a.toISODate()!, [...(days.get(a.toISODate()!) ?? []), a.toFormat("HH:mm")]);
      }
      for (const [date, starts] of days) expect(starts[0], date).toBe(local(`${date}T12:00:00`).weekday === 7 ? "10:00" : "09:00");
      // The UTC offset changes across the week, the local opening time does not.
      const before = slots.find((s) => s.localDate < changeDay && s.localStart === "09:00")!;
      const after = slots.find((s) => s.localDate > changeDay && s.localStart === "09:00")!;
      expect(new Date(before.start).getUTCHours()).not.toBe(new Date(after.start).getUTCHours());
      expect(days.has(changeDay)).toBe(true);
    });
  }
});

describe("booking", () => {
  it("owners see slots from the lead time on (48 h default); staff may book sooner; time off and booked visits (with the travel buffer) are not offered", async () => {
    const w = await visitWorld();
    const from = "2027-05-03T12:00:00Z";
    const to = "2027-05-08T00:00:00Z";
    const owner = listJobSlots(ownerActor(w.owner), w.job.id, { from, to }, NOW).slots;
    const staff = listJobSlots(staffActor(w.staff), w.job.id, { from, to }, NOW).slots;
    expect(Math.min(...owner.map((s) => Date.parse(s.start)))).toBeGreaterThanOrEqual(NOW + 48 * HOUR);
    expect(Math.min(...staff.map((s) => Date.parse(s.start)))).toBeLessThan(NOW + 48 * HOUR);
    expect(owner.every((s) => s.technicianId === w.tech.user.id)).toBe(true);

    putTechnicianHours(w.staff, w.tech.user.id, { hours: getTechnicianHours(w.staff, w.tech.user.id).hours, timeOff: [{ date: "2027-05-06", note: "Course (invented)" }, { date: "2027-05-07", start: "09:00", end: "12:00", note: "" }] });
    const withOff = listJobSlots(ownerActor(w.owner), w.job.id, { from, to }, NOW).slots;
    expect(withOff.some((s) => s.localDate === "2027-05-06")).toBe(false);
    // 09:00–12:00 off on Friday, plus the 30 min buffer: nothing starts on Friday before 12:30.
    expect(withOff.filter((s) => s.localDate === "2027-05-07").every((s) => s.localStart >= "12:30")).toBe(true);
    expect(withOff.some((s) => s.localDate === "2027-05-07")).toBe(true);

    const first = withOff.find((s) => s.localDate === "2027-05-05")!;
    const visit = await bookVisit(ownerActor(w.owner), { jobId: w.job.id, technicianId: first.technicianId, start: first.start }, NOW);
    expect(getDb().select().from(repairJobs).where(eq(repairJobs.id, w.job.id)).get()!.state).toBe("scheduled");

    const other = addJob(w.studio, w.piece.id, w.owner.id, w.product.id, "covered");
    const left = listJobSlots(ownerActor(w.owner), other.id, { from, to }, NOW).slots;
    const end = Date.parse(visit.end);
    const start = Date.parse(visit.start);
    for (const s of left.filter((x) => x.technicianId === w.tech.user.id)) {
      const overlapsWithBuffer = Date.parse(s.start) < end + 30 * 60_000 && Date.parse(s.end) > start - 30 * 60_000;
      expect(overlapsWithBuffer, s.start).toBe(false);
    }
  });

  it("a second booking of the same time gets 409 with fresh slots (without that time); a booked job can't be booked twice", async () => {
    const w = await visitWorld();
    const slot = listJobSlots(ownerActor(w.owner), w.job.id, { from: "2027-05-10T00:00:00Z", to: "2027-05-12T00:00:00Z" }, NOW).slots[0]!;
    await bookVisit(ownerActor(w.owner), { jobId: w.job.id, technicianId: slot.technicianId, start: slot.start }, NOW);
    const other = addJob(w.studio, w.piece.id, w.owner.id, w.product.id, "paid");
    const err = await bookVisit(staffActor(w.staff), { jobId: other.id, technicianId: slot.technicianId, start: slot.start }, NOW).catch((e) => e);
    expect(err).toBeInstanceOf(AppError);
    expect([err.status, err.code]).toEqual([409, "slot_unavailable"]);
    const fresh = err.extra.slots as { start: string }[];
    expect(fresh.length).toBeGreaterThan(0);
    expect(fresh.some((s) => s.start === slot.start)).toBe(false);
    expect(await statusOf(bookVisit(ownerActor(w.owner), { jobId: w.job.id, technicianId: slot.technicianId, start: fresh[0]!.start }, NOW))).toBe(409);
    // Off the grid, outside hours, in the past: all 409, never a 500.
    const offGrid = new Date(Date.parse(fresh[0]!.start) + 7 * 60_000).toISOString();
    expect(await statusOf(bookVisit(staffActor(w.staff), { jobId: other.id, technicianId: slot.technicianId, start: offGrid }, NOW))).toBe(409);
    expect(await statusOf(bookVisit(staffActor(w.staff), { jobId: other.id, technicianId: slot.technicianId, start: "2027-05-10T03:00:00Z" }, NOW))).toBe(409);
    expect(await statusOf(bookVisit(staffActor(w.staff), { jobId: other.id, technicianId: slot.technicianId, start: "2027-04-01T14:00:00Z" }, NOW))).toBe(409);
    expect(await statusOf(bookVisit(staffActor(w.staff), { jobId: other.id, technicianId: w.staff.user.id, start: fresh[0]!.start }, NOW))).toBe(400);
    expect(await statusOf(async () => bookVisit(staffActor(w.staff), bookVisitSchema.parse({ jobId: other.id, technicianId: slot.technicianId, start: "next tuesday" }), NOW))).toBe(400);
  });

  it("jobs that are not paid or covered can't get a visit", async () => {
    const w = await visitWorld();
    getDb().update(repairJobs).set({ state: "approved" }).where(eq(repairJobs.id, w.job.id)).run();
    expect(await statusOf(() => listJobSlots(ownerActor(w.owner), w.job.id, {}, NOW))).toBe(409);
    expect(await statusOf(bookVisit(staffActor(w.staff), { jobId: w.job.id, technicianId: w.tech.user.id, start: "2027-05-10T13:00:00Z" }, NOW))).toBe(409);
  });
});

describe("moving and cancelling", () => {
  it("owners move or cancel until 24 h before (the studio's cut-off); staff until the visit starts; cancelling reopens the job as it was", async () => {
    const w = await visitWorld({ state: "covered" });
    const slots = listJobSlots(ownerActor(w.owner), w.job.id, { from: "2027-05-10T00:00:00Z", to: "2027-05-14T00:00:00Z" }, NOW).slots;
    const v = await bookVisit(ownerActor(w.owner), { jobId: w.job.id, technicianId: slots[0]!.technicianId, start: slots[0]!.start }, NOW);
    const start = Date.parse(v.start);
    const target = slots.find((s) => s.localDate !== slots[0]!.localDate)!;
    const lateNow = start - 20 * HOUR;
    expect(await statusOf(moveVisit(ownerActor(w.owner), v.id, { start: target.start }, lateNow))).toBe(409);
    expect(await statusOf(cancelVisit(ownerActor(w.owner), v.id, undefined, lateNow))).toBe(409);
    expect(await statusOf(moveVisit(techActor(w.tech), v.id, { start: target.start }, NOW))).toBe(403);
    // The studio changes its rule to 12 h; now the owner may.
    getDb().insert(visitRules).values({ studioId: w.studio.id, ownerChangeCutoffHours: 12, leadTimeHours: 0 }).run();
    const moved = await moveVisit(ownerActor(w.owner), v.id, { start: target.start }, lateNow);
    expect(moved.start).toBe(target.start);
    expect(moved.icsUid).toBe(v.icsUid);
    expect(moved.sequence).toBe(1);
    // Staff can move an hour before it starts, but not to a time that is taken or off the hours.
    expect(await statusOf(moveVisit(staffActor(w.staff), v.id, { start: "2027-05-10T02:00:00Z" }, NOW))).toBe(409);
    const cancelled = await cancelVisit(staffActor(w.staff), v.id, { reason: "Owner unwell" }, Date.parse(target.start) - HOUR);
    expect(cancelled.state).toBe("cancelled");
    expect(cancelled.sequence).toBe(2);
    expect(getDb().select().from(repairJobs).where(eq(repairJobs.id, w.job.id)).get()!.state).toBe("covered");
    expect(await statusOf(cancelVisit(staffActor(w.staff), v.id, undefined, NOW))).toBe(409);
    // The job can be booked again.
    const again = await bookVisit(ownerActor(w.owner), { jobId: w.job.id, technicianId: target.technicianId, start: target.start }, NOW);
    expect(again.icsUid).not.toBe(v.icsUid);
  });
});

describe("tenancy and roles", () => {
  it("another studio's staff, another owner and another technician get 404; a technician lists only their own visits", async () => {
    const w = await visitWorld();
    const slot = listJobSlots(staffActor(w.staff), w.job.id, { from: "2027-05-10T00:00:00Z", to: "2027-05-12T00:00:00Z" }, NOW).slots[0]!;
    const v = await bookVisit(staffActor(w.staff), { jobId: w.job.id, technicianId: slot.technicianId, start: slot.start }, NOW);
    const elsewhere = createStudio();
    const strangerCtx = await memberContext(elsewhere, "staff");
    const strangerStaff = staffActor(strangerCtx);
    const strangerOwner = ownerActor(luciaUser(await createUser()));
    const otherTech = await memberContext(w.studio, "technician");
    const range = { from: "2027-05-01T00:00:00Z", to: "2027-05-31T00:00:00Z" };
    for (const actor of [strangerStaff, strangerOwner]) {
      expect(await statusOf(() => listJobSlots(actor, w.job.id, {}, NOW))).toBe(404);
      expect(await statusOf(moveVisit(actor, v.id, { start: slot.start }, NOW))).toBe(404);
      expect(await statusOf(cancelVisit(actor, v.id, undefined, NOW))).toBe(404);
      expect(listVisits(actor, range).visits.some((x) => x.id === v.id)).toBe(false);
    }
    expect(await statusOf(bookVisit(strangerStaff, { jobId: w.job.id, technicianId: slot.technicianId, start: slot.start }, NOW))).toBe(404);
    expect(await statusOf(() => listJobSlots(techActor(w.tech), w.job.id, {}, NOW))).toBe(404);
    expect(await statusOf(submitReport(otherTech, v.id, reportInput({ work: "x", layers: [] })))).toBe(404);
    expect(await statusOf(submitReport(await memberContext(elsewhere, "technician"), v.id, reportInput({ work: "x", layers: [] })))).toBe(404);
    expect(listVisits(techActor(otherTech), range).visits).toHaveLength(0);
    expect(listVisits(techActor(w.tech), range).visits.map((x) => x.id)).toEqual([v.id]);
    expect(await statusOf(() => listVisits(techActor(otherTech), { ...range, technician: w.tech.user.id }))).toBe(404);
    expect(listVisits(ownerActor(w.owner), range).visits.map((x) => x.id)).toEqual([v.id]);
    expect(listVisits(staffActor(w.staff), { ...range, technician: w.tech.user.id }).visits.map((x) => x.id)).toEqual([v.id]);
    expect(await statusOf(() => getTechnicianHours(otherTech, w.tech.user.id))).toBe(404);
    expect(await statusOf(() => putTechnicianHours(w.tech, w.tech.user.id, { hours: [], timeOff: [] }))).toBe(403);
    expect(await statusOf(() => getTechnicianHours(strangerCtx, w.tech.user.id))).toBe(404);
  });

  it("hours: overlapping ranges, reversed times and half-given time off are 400s with field paths", async () => {
    const w = await visitWorld();
    const bad = async (input: unknown) => {
      try {
        putTechnicianHours(w.staff, w.tech.user.id, technicianHoursSchema.parse(input));
      } catch (e) {
        expect(e).toBeInstanceOf(ZodError);
        return (e as ZodError).issues.map((i) => i.path.join("."));
      }
      throw new Error("accepted");
    };
    expect(await bad({ hours: [{ weekday: 1, start: "09:00", end: "13:00" }, { weekday: 1, start: "12:00", end: "17:00" }] })).toContain("hours.1.start");
    expect(await bad({ hours: [{ weekday: 2, start: "17:00", end: "09:00" }] })).toContain("hours.0.end");
    expect(await bad({ hours: [{ weekday: 8, start: "09:00", end: "10:00" }] })).toContain("hours.0.weekday");
    expect(await bad({ hours: [], timeOff: [{ date: "2027-05-05", start: "09:00" }] })).toContain("timeOff.0.end");
    expect(await bad({ hours: [], timeOff: [{ date: "2027-02-30" }] })).toContain("timeOff.0.date");
  });
});

describe("the visit report", () => {
  it("adds the layers, logs the care, moves the next due date, closes the job and e-mails the owner a summary", async () => {
    const w = await visitWorld();
    const slot = listJobSlots(staffActor(w.staff), w.job.id, { from: "2027-05-03T12:00:00Z", to: "2027-05-05T00:00:00Z" }, NOW).slots[0]!;
    const v = await bookVisit(staffActor(w.staff), { jobId: w.job.id, technicianId: slot.technicianId, start: slot.start }, NOW);
    const db = getDb();
    const scheduleNow = (at: Date) =>
      scheduleFromRows({ piece: w.piece, layers: db.select().from(finishLayers).where(eq(finishLayers.pieceId, w.piece.id)).all(), careLog: db.select().from(careLogEntries).where(eq(careLogEntries.pieceId, w.piece.id)).all(), products: studioProducts(w.studio.id), timeZone: w.studio.timeZone, now: at });
    const reportDay = new Date(Date.parse(slot.start) + HOUR);
    const before = scheduleNow(reportDay).tasks.find((t) => t.kind === "reoil" && t.surface === "top")!;
    expect(before.dueOn).toBe("2026-06-01"); // oil applied 2025-06-01, heavy use: 12 months (lib/care/intervals.ts)

    const day = technicianDay(w.tech, { date: slot.localDate }, NOW);
    expect(day.items.map((i) => i.visit.id)).toEqual([v.id]);
    expect(day.items[0]!.bring[0]).toMatchObject({ product: w.product.name, coats: 1 });
    expect(day.items[0]!.bring[0]!.amount!.ml).toBe(Math.ceil(((2 * 0.9 * 1) / 24) * 1000)); // 1.8 m² × 1 coat ÷ 24 m²/L
    expect(day.items[0]!.cautions.map((c) => c.text).join(" ")).toMatch(/metal can, cover them with water/);
    expect(day.items[0]!.cautions.map((c) => c.text).join(" ")).toMatch(/licensed electrician/);

    const photo = await sharp({ create: { width: 64, height: 48, channels: 3, background: "#7a5532" } }).jpeg().toBuffer();
    const up = await addVisitPhoto(w.tech, v.id, async () => ({ data: new Uint8Array(photo), fields: { kind: "after" } }));
    const file = db.select().from(files).where(eq(files.id, up.id)).get()!;
    expect(file.purpose).toBe("visit_photo");
    expect(canViewFile(w.owner.id, file)).toBe(true);
    expect(canViewFile(w.staff.user.id, file)).toBe(true);
    expect(canViewFile(w.tech.user.id, file)).toBe(true);
    expect(canViewFile((await createUser()).id, file)).toBe(false);

    const applied = slot.localDate;
    const since = Date.now();
    const r = await submitReport(w.tech, v.id, reportInput({ work: "Cleaned, keyed, one coat of oil on the top.", layers: [{ surface: "top", finishClass: "hardwax_oil", productId: w.product.id, coats: 1, appliedOn: applied }] }), reportDay);
    expect(r.visit.state).toBe("done");
    const stack = db.select().from(finishLayers).where(and(eq(finishLayers.pieceId, w.piece.id), eq(finishLayers.surface, "top"))).all();
    expect(stack).toHaveLength(2);
    expect(stack.find((l) => l.appliedOn === applied)).toMatchObject({ position: 1, productLabel: w.product.name, appliedById: w.tech.user.id });
    const logged = db.select().from(careLogEntries).where(eq(careLogEntries.pieceId, w.piece.id)).all();
    expect(logged).toEqual([expect.objectContaining({ source: "visit", taskKind: "reoil", surface: "top", doneOn: applied })]);
    const after = scheduleNow(reportDay).tasks.find((t) => t.kind === "reoil" && t.surface === "top")!;
    expect(after.clockFrom).toBe(applied);
    expect(after.dueOn).toBe(DateTime.fromISO(applied).plus({ months: 12 }).toISODate());
    expect(db.select().from(repairJobs).where(eq(repairJobs.id, w.job.id)).get()!.state).toBe("done");

    const mail = await waitForMail({ to: w.owner.email, subject: /^Visit report/, since });
    expect(mail.text).toContain("Cleaned, keyed, one coat of oil on the top.");
    // The owner signs off themselves: the mail carries their single-use link, no name typed for them.
    expect(mail.text).toMatch(/\/visit-sign-off\?token=[A-Za-z0-9_-]{20,}/);
    expect(mail.text).toContain(DateTime.fromISO(after.dueOn).setLocale("en-GB").toFormat("d LLLL yyyy"));
    expect(mail.text).toMatch(/still curing/);
    expect(await statusOf(submitReport(w.tech, v.id, reportInput({ work: "again", layers: [] })))).toBe(409);
  });

  it("refuses layers dated in the future or before delivery, and a product of another class, keeping the field paths", async () => {
    const w = await visitWorld();
    const slot = listJobSlots(staffActor(w.staff), w.job.id, { from: "2027-05-03T12:00:00Z", to: "2027-05-05T00:00:00Z" }, NOW).slots[0]!;
    const v = await bookVisit(staffActor(w.staff), { jobId: w.job.id, technicianId: slot.technicianId, start: slot.start }, NOW);
    const at = new Date(NOW + 24 * HOUR);
    const errOf = (layers: unknown[]) => submitReport(w.tech, v.id, visitReportSchema.parse({ work: "x", layers }), at).then(
        () => ({ fieldErrors: undefined }),
        (e: AppError) => e,
      );
    expect((await errOf([{ surface: "top", finishClass: "hardwax_oil", coats: 1, appliedOn: "2027-06-01" }])).fieldErrors).toHaveProperty(["layers.0.appliedOn"]);
    expect((await errOf([{ surface: "top", finishClass: "hardwax_oil", coats: 1, appliedOn: "2020-01-01" }])).fieldErrors).toHaveProperty(["layers.0.appliedOn"]);
    expect((await errOf([{ surface: "top", finishClass: "paste_wax", productId: w.product.id, coats: 1, appliedOn: "2027-05-04" }])).fieldErrors).toHaveProperty(["layers.0.finishClass"]);
    expect(await statusOf(async () => submitReport(w.tech, v.id, visitReportSchema.parse({ work: "", layers: [] }), at))).toBe(400);
    expect(getDb().select().from(visits).where(eq(visits.id, v.id)).get()!.state).toBe("booked");
    expect(getDb().select().from(finishLayers).where(eq(finishLayers.pieceId, w.piece.id)).all()).toHaveLength(1);
  });
});

describe("the 24 h reminder", () => {
  it("goes out once per visit and SEQUENCE, only inside the last 24 h, again after a move, never after a cancel", async () => {
    const w = await visitWorld();
    const slots = listJobSlots(ownerActor(w.owner), w.job.id, { from: "2027-05-10T00:00:00Z", to: "2027-05-14T00:00:00Z" }, NOW).slots;
    const v = await bookVisit(ownerActor(w.owner), { jobId: w.job.id, technicianId: slots[0]!.technicianId, start: slots[0]!.start }, NOW);
    // The booking mail is stamped with the booking's instant (NOW, a week before the visit), not the
    // real clock, so it is not inside the reminder window whatever the real date is.
    const lastInviteAt = () => getDb().select({ at: visits.lastInviteAt }).from(visits).where(eq(visits.id, v.id)).get()!.at?.getTime();
    expect(lastInviteAt()).toBe(NOW);
    const start = Date.parse(v.start);
    const mine = (r: Awaited<ReturnType<typeof runVisitReminderPass>>) => r.sent.filter((s) => s.visitId === v.id);
    expect(mine(await runVisitReminderPass({ now: new Date(start - 30 * HOUR) }))).toHaveLength(0);
    const [a, b] = await Promise.all([runVisitReminderPass({ now: new Date(start - 23 * HOUR) }), runVisitReminderPass({ now: new Date(start - 23 * HOUR) })]);
    expect(mine(a).length + mine(b).length).toBe(1);
    expect(mine(await runVisitReminderPass({ now: new Date(start - 2 * HOUR) }))).toHaveLength(0);
    const to = (await listMail({ to: w.owner.email })).filter((m) => m.subject.startsWith("Tomorrow: your visit"));
    expect(to).toHaveLength(1);

    const target = slots.find((s) => Date.parse(s.start) > start + 26 * HOUR)!;
    await moveVisit(staffActor(w.staff), v.id, { start: target.start }, start - 23 * HOUR);
    // The change went out at the move's instant, more than a day before the new time: a reminder still goes.
    expect(lastInviteAt()).toBe(start - 23 * HOUR);
    const moved = await runVisitReminderPass({ now: new Date(Date.parse(target.start) - 20 * HOUR) });
    expect(moved.sent.filter((s) => s.visitId === v.id).map((s) => s.sequence)).toEqual([1]);
    expect(getDb().select().from(visitMailSends).where(eq(visitMailSends.visitId, v.id)).all().map((r) => [r.sequence, r.status]).sort()).toEqual([[0, "sent"], [1, "sent"]]);

    await cancelVisit(staffActor(w.staff), v.id, undefined, Date.parse(target.start) - 20 * HOUR);
    expect(lastInviteAt()).toBe(Date.parse(target.start) - 20 * HOUR);
    expect(mine(await runVisitReminderPass({ now: new Date(Date.parse(target.start) - HOUR) }))).toHaveLength(0);
  });

  it("skips a visit whose invite already went out inside the window", async () => {
    const w = await visitWorld();
    const slot = listJobSlots(staffActor(w.staff), w.job.id, { from: "2027-05-03T12:00:00Z", to: "2027-05-05T00:00:00Z" }, NOW).slots[0]!;
    const v = await bookVisit(staffActor(w.staff), { jobId: w.job.id, technicianId: slot.technicianId, start: slot.start }, NOW);
    getDb().update(visits).set({ lastInviteAt: new Date(Date.parse(v.start) - 5 * HOUR) }).where(eq(visits.id, v.id)).run();
    const r = await runVisitReminderPass({ now: new Date(Date.parse(v.start) - 4 * HOUR) });
    expect(r.sent.filter((s) => s.visitId === v.id)).toHaveLength(0);
    expect(getDb().select().from(visitMailSends).where(eq(visitMailSends.visitId, v.id)).get()!.status).toBe("skipped");
  });
});
