// The technician's side of the repair thread against a real SQLite file and the real SMTP sink: the
// day's visit carries what she needs; a report can't be filed before the visit's start (staff may, with
// a reason, audited); the owner signs off from a single-use link in the report mail; visit photos
// reach the right people only; visit mail says today / tomorrow / the date by the owner's own calendar
// day, across a daylight-saving change and for an owner in another zone than the studio.
import { eq } from "drizzle-orm";
import sharp from "sharp";
import { describe, expect, it } from "vitest";
import { getDb } from "@/db/client";
import { clients, files, finishLayers, pieces, repairJobs, users, visits } from "@/db/schema";
import { createJobFromClaim } from "@/lib/claims/open-job";
import { AppError } from "@/lib/errors";
import { canViewFile } from "@/lib/files/access";
import { visitDayWord } from "@/lib/format";
import { runVisitReminderPass } from "@/lib/visits/reminders";
import { addVisitPhoto, visitPhotosOf } from "@/lib/visits/photos";
import { bookVisit } from "@/lib/visits/book";
import { listJobSlots } from "@/lib/visits/slots";
import { submitReport } from "@/lib/visits/report";
import { technicianDay } from "@/lib/visits/technician-day";
import { visitOfJob } from "@/lib/visits/job-visit";
import { confirmSignOff, signOffPreview } from "@/lib/visits/sign-off";
import { auditsOf, createAcceptedClaim, createStudio, createUser, memberContext } from "../support/fixtures";
import { listMail, waitForMail } from "../support/mail";
import { luciaUser, ownerActor, reportInput, staffActor, visitWorld } from "./visits-helpers";

const HOUR = 3_600_000;
const NOW = Date.parse("2027-05-03T12:00:00Z"); // Monday 3 May 2027, 08:00 in New York

async function errorOf(p: Promise<unknown>): Promise<AppError> {
  return p.then(
    () => {
      throw new Error("expected a refusal");
    },
    (e: AppError) => e,
  );
}

/** A visit world with a covered repair job made from an accepted claim, booked by staff at the first free slot from `from`. */
async function bookedThread(opts: { from?: string; hours?: { weekday: number; start: string; end: string }[]; bookAt?: number } = {}) {
  const w = await visitWorld({ hours: opts.hours });
  const claim = createAcceptedClaim(w.studio, w.piece.id, w.owner.id, "covered");
  const job = createJobFromClaim(w.staff, claim.id);
  getDb().update(repairJobs).set({ state: "covered", notes: "Gate code 4417; the owner's dog is friendly (invented)." }).where(eq(repairJobs.id, job.id)).run();
  const bookAt = opts.bookAt ?? NOW;
  const from = opts.from ?? "2027-05-04T12:00:00Z";
  const slot = listJobSlots(staffActor(w.staff), job.id, { from, to: new Date(Date.parse(from) + 4 * 86_400_000).toISOString() }, bookAt).slots[0]!;
  const visit = await bookVisit(staffActor(w.staff), { jobId: job.id, technicianId: slot.technicianId, start: slot.start }, bookAt);
  return { ...w, claim, jobId: job.id, visit, slot };
}

const jpeg = () => sharp({ create: { width: 64, height: 48, channels: 3, background: "#7a5532" } }).jpeg().toBuffer();

describe("the technician's day", () => {
  it("shows the job's notes, the claim's description and photos, the owner's phone from the client record, a map link, what to bring with its cure times, and proposes the quote's layers", async () => {
    const w = await bookedThread();
    getDb().insert(clients).values({ studioId: w.studio.id, name: w.owner.name, email: w.owner.email, phone: "+12125550147", userId: w.owner.id }).run();
    const photo = getDb()
      .insert(files)
      .values({ studioId: w.studio.id, purpose: "claim_photo", pieceId: w.piece.id, claimId: w.claim.id, storageKey: `test/${w.claim.id}.jpg`, thumbKey: `test/${w.claim.id}-t.jpg`, contentType: "image/jpeg", width: 64, height: 48, bytes: 100, uploadedById: w.owner.id })
      .returning()
      .get();

    const item = technicianDay(w.tech, { date: w.slot.localDate }, NOW).items.find((i) => i.visit.id === w.visit.id)!;
    expect(item.job.notes).toContain("Gate code 4417");
    expect(item.claim).toMatchObject({ id: w.claim.id, description: w.claim.description, photos: [{ id: photo.id, thumbUrl: `/api/files/${photo.id}?thumb=1` }] });
    // Stored E.164, shown in the studio's national format (US studio) by lib/clients/phone.
    expect(item.ownerPhone).toEqual({ tel: "+12125550147", display: "(212) 555-0147" });
    const maps = new URL(item.visit.mapsUrl);
    expect([maps.origin, maps.pathname, maps.searchParams.get("query")]).toEqual(["https://www.openstreetmap.org", "/search", w.visit.location]);
    expect(item.bring).toEqual([expect.objectContaining({ productId: w.product.id, coats: 1, cure: { lightUseHours: 24, fullCureDays: 14 } })]); // hardwax oil class default (lib/care/cure)
    // The piece's one stack is an oiled top (tests/support/fixtures createPiece): the proposed oil layer goes there.
    expect(item.defaultLayers).toEqual([{ surface: "top", finishClass: "hardwax_oil", productId: w.product.id, coats: 1 }]);
    expect(item.visit.started).toBe(false);

    // Only the technician of a visit for the claim's job sees the owner's claim photos.
    expect(canViewFile(w.tech.user.id, photo)).toBe(true);
    const otherTech = await memberContext(w.studio, "technician");
    expect(canViewFile(otherTech.user.id, photo)).toBe(false);
  });
});

describe("the report's proposed layers", () => {
  const proposedSurface = (w: Awaited<ReturnType<typeof bookedThread>>) => technicianDay(w.tech, { date: w.slot.localDate }, NOW).items.find((i) => i.visit.id === w.visit.id)!.defaultLayers.map((l) => l.surface);
  const addLayer = (w: Awaited<ReturnType<typeof bookedThread>>, surface: "top" | "base" | "edges", position: number, finishClass: "hardwax_oil" | "film_finish") =>
    getDb().insert(finishLayers).values({ studioId: w.studio.id, pieceId: w.piece.id, surface, position, finishClass, coats: 1, appliedOn: w.piece.deliveredOn }).run();

  it("sit on the surface whose outermost layer they refresh, and on none where the stack does not say which", async () => {
    // Film over the oiled top: the oil the quote brings refreshes the base, whose outermost layer is oil.
    const w = await bookedThread();
    addLayer(w, "top", 1, "film_finish");
    addLayer(w, "base", 0, "hardwax_oil");
    expect(proposedSurface(w)).toEqual(["base"]);
    // Oil outermost on the top and on the base: the technician chooses (the form shows "Choose a surface").
    const both = await bookedThread();
    addLayer(both, "base", 0, "hardwax_oil");
    expect(proposedSurface(both)).toEqual([null]);
    // No stack ends in oil: no surface is proposed either.
    const none = await bookedThread();
    addLayer(none, "top", 1, "film_finish");
    expect(proposedSurface(none)).toEqual([null]);
  });
});

describe("a report before the visit's start", () => {
  it("is refused for the technician; staff file it only with a reason, which lands on the visit and in the audit log", async () => {
    const w = await bookedThread();
    const before = new Date(Date.parse(w.visit.start) - 5 * HOUR);
    const report = { work: "Re-oiled the ring marks (invented).", layers: [] };
    const byTech = await errorOf(submitReport(w.tech, w.visit.id, reportInput(report), before));
    expect(byTech.status).toBe(409);
    expect(byTech.message).toMatch(/^This visit starts Tuesday, 4 May 2027, 09:00–10:30 EDT\. File the report once it has started/);
    const noReason = await errorOf(submitReport(w.staff, w.visit.id, reportInput(report), before));
    expect(noReason.status).toBe(422);
    expect(noReason.fieldErrors).toHaveProperty("earlyReason");
    expect(getDb().select().from(visits).where(eq(visits.id, w.visit.id)).get()!.state).toBe("booked");

    await submitReport(w.staff, w.visit.id, reportInput({ ...report, earlyReason: "Owner called: done at the shop the evening before (invented)." }), before);
    expect(getDb().select().from(visits).where(eq(visits.id, w.visit.id)).get()).toMatchObject({ state: "done", reportEarlyReason: "Owner called: done at the shop the evening before (invented)." });
    const audit = auditsOf(w.visit.id, "visit.reported")[0]!;
    expect(audit.actorId).toBe(w.staff.user.id);
    expect(audit.data).toMatchObject({ beforeStart: true, start: w.visit.start, reason: "Owner called: done at the shop the evening before (invented)." });
  });

  it("the technician files once the visit has started, with no reason asked", async () => {
    const w = await bookedThread();
    await submitReport(w.tech, w.visit.id, reportInput({ work: "Done (invented).", layers: [] }), new Date(Date.parse(w.visit.start) + 60_000));
    expect(getDb().select().from(visits).where(eq(visits.id, w.visit.id)).get()).toMatchObject({ state: "done", reportEarlyReason: null });
  });
});

describe("the owner's sign-off", () => {
  it("is the owner's own act: a single-use link in the report mail, confirmed once; no name typed for them", async () => {
    const w = await bookedThread();
    const since = Date.now();
    await submitReport(w.tech, w.visit.id, reportInput({ work: "Re-oiled the top (invented).", layers: [], signOffName: "Typed by someone else" }), new Date(Date.parse(w.visit.start) + HOUR));
    const mail = await waitForMail({ to: w.owner.email, subject: /^Visit report/, since });
    expect(mail.text).not.toContain("Typed by someone else");
    expect(mail.text).not.toMatch(/Signed off by/);
    const link = new URL(/https?:\/\/\S+\/visit-sign-off\?token=[A-Za-z0-9_-]+/.exec(mail.text)![0]);
    const token = link.searchParams.get("token")!;
    const row = () => getDb().select().from(visits).where(eq(visits.id, w.visit.id)).get()!;
    expect(row()).toMatchObject({ signedOffAt: null, reportSignOffName: null });
    expect(row().signOffTokenHash).not.toContain(token); // only its hash is kept

    expect(signOffPreview(token)).toMatchObject({ work: "Re-oiled the top (invented).", pieceTitle: w.piece.title });
    expect(confirmSignOff(token)).toEqual({ visitId: w.visit.id });
    expect(row()).toMatchObject({ signedOffById: w.owner.id, signOffTokenHash: null });
    expect(row().signedOffAt).toBeInstanceOf(Date);
    expect(confirmSignOff(token)).toBeNull();
    expect(signOffPreview(token)).toBeNull();
    expect(confirmSignOff("not-a-real-token-at-all")).toBeNull();
    expect(auditsOf(w.visit.id, "visit.signed_off")[0]).toMatchObject({ actorId: w.owner.id });
  });

  it("an expired link signs off nothing", async () => {
    const w = await bookedThread();
    const since = Date.now();
    const reportedAt = new Date(Date.parse(w.visit.start) + HOUR);
    await submitReport(w.tech, w.visit.id, reportInput({ work: "Re-oiled (invented).", layers: [] }), reportedAt);
    const mail = await waitForMail({ to: w.owner.email, subject: /^Visit report/, since });
    const token = new URL(/https?:\/\/\S+\/visit-sign-off\?token=[A-Za-z0-9_-]+/.exec(mail.text)![0]).searchParams.get("token")!;
    expect(confirmSignOff(token, new Date(reportedAt.getTime() + 31 * 86_400_000))).toBeNull();
    expect(getDb().select().from(visits).where(eq(visits.id, w.visit.id)).get()!.signedOffAt).toBeNull();
  });
});

describe("visit photos", () => {
  it("are stored with the visit and shown to the studio and to the piece's owner — not to another owner, another studio, or a former owner", async () => {
    const w = await bookedThread();
    const up = await addVisitPhoto(w.tech, w.visit.id, async () => ({ data: new Uint8Array(await jpeg()), fields: { kind: "after" } }));
    await submitReport(w.tech, w.visit.id, reportInput({ work: "Re-oiled (invented).", layers: [] }), new Date(Date.parse(w.visit.start) + HOUR));
    const ids = (xs: { id: string }[]) => xs.map((x) => x.id);

    expect(ids(visitPhotosOf(staffActor(w.staff), { jobId: w.jobId }))).toEqual([up.id]);
    expect(ids(visitPhotosOf(staffActor(w.staff), { pieceId: w.piece.id }))).toEqual([up.id]);
    expect(ids(visitPhotosOf(ownerActor(w.owner), { pieceId: w.piece.id }))).toEqual([up.id]);
    expect(visitPhotosOf(ownerActor(w.owner), { jobId: w.jobId })[0]).toMatchObject({ kind: "after", label: "After, 4 May 2027" });
    expect(ids(visitOfJob(ownerActor(w.owner), w.jobId).visit!.photos)).toEqual([up.id]);
    expect(ids(visitOfJob(staffActor(w.staff), w.jobId).visit!.photos)).toEqual([up.id]);

    const stranger = luciaUser(await createUser({ name: "Another owner (invented)" }));
    expect(visitPhotosOf(ownerActor(stranger), { pieceId: w.piece.id })).toEqual([]);
    expect(visitPhotosOf(ownerActor(stranger), { jobId: w.jobId })).toEqual([]);
    const elsewhere = await memberContext(createStudio({ name: "Another studio (invented)" }), "admin");
    expect(visitPhotosOf(staffActor(elsewhere), { pieceId: w.piece.id })).toEqual([]);
    const file = getDb().select().from(files).where(eq(files.id, up.id)).get()!;
    expect(canViewFile(w.owner.id, file)).toBe(true);
    expect(canViewFile(stranger.id, file)).toBe(false);
    expect(canViewFile(elsewhere.user.id, file)).toBe(false);

    // The piece is handed on: its photos go with it, the former owner no longer sees them.
    getDb().update(pieces).set({ ownerId: stranger.id }).where(eq(pieces.id, w.piece.id)).run();
    expect(visitPhotosOf(ownerActor(w.owner), { pieceId: w.piece.id })).toEqual([]);
    expect(canViewFile(w.owner.id, file)).toBe(false);
    expect(ids(visitPhotosOf(ownerActor(stranger), { pieceId: w.piece.id }))).toEqual([up.id]);
  });
});

describe("today, tomorrow or the date, by the owner's own calendar day", () => {
  // Sources for the change instants: United States daylight time begins at 2:00 a.m. local on the
  // second Sunday of March (15 U.S.C. §260a, as amended by the Energy Policy Act of 2005 §110) —
  // 14 March 2027; Japan keeps no daylight time (Asia/Tokyo, UTC+9, IANA tz database).
  const ny = "America/New_York";

  it("reads calendar days, not 24-hour spans, across the March change", () => {
    const visitAt = Date.parse("2027-03-14T14:00:00Z"); // Sunday 14 March 2027, 10:00 EDT
    expect(visitDayWord(visitAt, Date.parse("2027-03-14T06:30:00Z"), ny)).toBe("today"); // 01:30 EST, 7.5 h before
    expect(visitDayWord(visitAt, Date.parse("2027-03-13T16:00:00Z"), ny)).toBe("tomorrow"); // Saturday 11:00 EST, 22 h before
    expect(visitDayWord(visitAt, Date.parse("2027-03-13T04:30:00Z"), ny)).toBe("on Sunday, 14 March 2027"); // Friday 23:30 EST
    expect(visitDayWord(visitAt, Date.parse("2027-03-13T16:00:00Z"), "Asia/Tokyo")).toBe("today"); // Sunday 01:00 in Tokyo
    // The morning of the visit, 18 minutes before: today, never tomorrow.
    expect(visitDayWord(Date.parse("2027-03-15T13:00:00Z"), Date.parse("2027-03-15T12:42:00Z"), ny)).toBe("today");
  });

  it("the reminder says 'today' at 08:42 for a 10:00 visit, 'tomorrow' the day before, by the owner's zone when it differs from the studio's; none once the visit has started", async () => {
    // Mon–Sat 09:00–17:00 and Sunday 10:00–14:00, so the Sunday of the change has hours.
    const hours = [...[1, 2, 3, 4, 5, 6].map((weekday) => ({ weekday, start: "09:00", end: "17:00" })), { weekday: 7, start: "10:00", end: "14:00" }];
    const bookAt = Date.parse("2027-03-01T12:00:00Z");
    const pass = (w: { owner: { email: string }; visit: { id: string } }, at: number) =>
      runVisitReminderPass({ now: new Date(at) }).then((r) => r.sent.filter((s) => s.visitId === w.visit.id));
    const subjects = async (email: string) => (await listMail({ to: email })).map((m) => m.subject).filter((s) => / your visit, /.test(s));

    // The Sunday of the change: 10:00 EDT. An owner in New York at 08:42 EDT on the day reads "today".
    const sunday = await bookedThread({ from: "2027-03-14T05:00:00Z", hours, bookAt });
    expect(sunday.slot.localDate).toBe("2027-03-14");
    expect(sunday.visit.start).toBe("2027-03-14T14:00:00.000Z");
    getDb().update(users).set({ timeZone: ny }).where(eq(users.id, sunday.owner.id)).run();
    expect(await pass(sunday, Date.parse("2027-03-14T12:42:00Z"))).toHaveLength(1);
    expect(await subjects(sunday.owner.email)).toEqual(["Today: your visit, Sunday, 14 March 2027, 10:00–11:30 EDT"]);

    // The day before, 22 hours ahead across the change: "tomorrow" in New York — but "today" for an owner in Tokyo.
    const ahead = await bookedThread({ from: "2027-03-14T05:00:00Z", hours, bookAt });
    getDb().update(users).set({ timeZone: ny }).where(eq(users.id, ahead.owner.id)).run();
    const tokyo = await bookedThread({ from: "2027-03-14T05:00:00Z", hours, bookAt });
    getDb().update(users).set({ timeZone: "Asia/Tokyo" }).where(eq(users.id, tokyo.owner.id)).run();
    const dayBefore = Date.parse("2027-03-13T16:00:00Z"); // Saturday 11:00 EST, Sunday 01:00 JST
    const sent = (await runVisitReminderPass({ now: new Date(dayBefore) })).sent.map((x) => x.visitId);
    expect(sent).toEqual(expect.arrayContaining([ahead.visit.id, tokyo.visit.id]));
    expect(await subjects(ahead.owner.email)).toEqual(["Tomorrow: your visit, Sunday, 14 March 2027, 10:00–11:30 EDT"]);
    expect(await subjects(tokyo.owner.email)).toEqual(["Today: your visit, Sunday, 14 March 2027, 23:00–00:30 GMT+9"]);
    const body = await waitForMail({ to: tokyo.owner.email, subject: /your visit/ });
    expect(body.text).toMatch(/your visit is today/i);
    expect(body.text).toContain("23:00–00:30 GMT+9 (Japan Time, Tokyo)"); // the zone in words, not its IANA name
    expect(body.text).not.toContain("Asia/Tokyo");

    // An owner who never set a zone (still the sign-up default, UTC) reads the studio's zone, or the
    // zone on the studio's client record of them.
    const unset = await bookedThread({ from: "2027-03-14T05:00:00Z", hours, bookAt });
    const chicago = await bookedThread({ from: "2027-03-14T05:00:00Z", hours, bookAt });
    getDb().insert(clients).values({ studioId: chicago.studio.id, name: chicago.owner.name, email: chicago.owner.email, userId: chicago.owner.id, timeZone: "America/Chicago" }).run();
    const sentToo = (await runVisitReminderPass({ now: new Date(dayBefore) })).sent.map((x) => x.visitId);
    expect(sentToo).toEqual(expect.arrayContaining([unset.visit.id, chicago.visit.id]));
    expect(await subjects(unset.owner.email)).toEqual(["Tomorrow: your visit, Sunday, 14 March 2027, 10:00–11:30 EDT"]);
    expect(await subjects(chicago.owner.email)).toEqual(["Tomorrow: your visit, Sunday, 14 March 2027, 09:00–10:30 CDT"]);

    // The job page's visit card says the same time as their mail: in the owner's zone for the owner, the studio's for its staff.
    const signedIn = (id: string) => ownerActor(luciaUser(getDb().select().from(users).where(eq(users.id, id)).get()!));
    expect(visitOfJob(signedIn(tokyo.owner.id), tokyo.jobId).visit!.when).toBe("Sunday, 14 March 2027, 23:00–00:30 GMT+9");
    expect(visitOfJob(signedIn(chicago.owner.id), chicago.jobId).visit!.when).toMatch(/09:00–10:30 CDT/);
    expect(visitOfJob(signedIn(unset.owner.id), unset.jobId).visit!.when).toMatch(/10:00–11:30 EDT/);
    expect(visitOfJob(staffActor(tokyo.staff), tokyo.jobId).visit!.when).toMatch(/10:00–11:30 EDT/);

    // A visit already under way gets no reminder.
    const started = await bookedThread({ from: "2027-03-14T05:00:00Z", hours, bookAt });
    expect(await pass(started, Date.parse(started.visit.start) + 10 * 60_000)).toHaveLength(0);
    expect(await subjects(started.owner.email)).toEqual([]);
  });
});
