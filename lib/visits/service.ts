import "server-only";
import { and, asc, eq, gte, inArray, lt, sql } from "drizzle-orm";
import type { User } from "lucia";
import { getDb } from "@/db/client";
import {
  careLogEntries,
  claims,
  clients,
  files,
  finishLayers,
  pieces,
  repairJobs,
  studios,
  technicianHours,
  technicianTimeOff,
  users,
  visitPhotos,
  visits,
  type FinishProduct,
  type Piece,
  type RepairJob,
  type Studio,
  type Visit,
} from "@/db/schema";
import { recordAudit } from "@/lib/audit";
import type { StudioContext } from "@/lib/auth/guards";
import { fileUrl, followJob } from "@/lib/claims/service";
import { displayPhone } from "@/lib/clients/phone";
import { topArea } from "@/lib/care/area";
import { addDays, isoWeekday, localDate, zonedTimeToEpochMs } from "@/lib/care/dates";
import { cautionLine, cautionsFor } from "@/lib/care/cautions";
import { cureWindow, curingLayers } from "@/lib/care/cure";
import { productNeeded } from "@/lib/care/quantity";
import { CARE_TASK_LABELS, FINISH_CLASS_LABELS, TASK_KIND_BY_FINISH_CLASS, type CareTaskKind, type FinishClass } from "@/lib/care/vocabulary";
import { randomToken, sha256Hex } from "@/lib/crypto";
import { badRequest, conflict, forbidden, isAppError, notFound, unprocessable } from "@/lib/errors";
import { mailAfterCommit } from "@/lib/mail/after-commit";
import { cureAdvice } from "@/lib/owner/care-guide";
import { formatDate, formatVolume, type UnitSystem } from "@/lib/format";
import { scheduleFromRows, topShape } from "@/lib/pieces/care-inputs";
import { insertLayers } from "@/lib/pieces/layers";
import { checkLayerRefs, studioProducts } from "@/lib/pieces/registry";
import { indexPiece } from "@/lib/pieces/search-index";
import { moveJob } from "@/lib/repairs/jobs";
import { removeStoredFiles, storeImage } from "@/lib/storage";
import { visitDay } from "@/lib/validation/dates";
import {
  bookVisitSchema,
  cancelVisitSchema,
  listVisitsQuerySchema,
  moveVisitSchema,
  slotsQuerySchema,
  technicianHoursSchema,
  visitPhotoKindSchema,
  visitReportSchema,
} from "@/lib/validation/visits";
import { isStudioTechnician, jobDurationMin, studioTechnicians, technicianSlots, timeOffRows, visitRulesFor, weeklyHours } from "./availability";
import { reserveVisit, SLOT_UNAVAILABLE } from "./core";
import { formatVisitWhen } from "./format";
import { ownerVisitWhere } from "./access";
import { jobUrl, sendVisitInvite, sendVisitSummary } from "./mail";
import { SIGN_OFF_TTL_MS, signOffUrl } from "./sign-off";

/** Who is acting on visits: studio staff (admin/staff), a technician, or an owner of their own jobs. */
export type VisitActor = { kind: "staff"; ctx: StudioContext } | { kind: "technician"; ctx: StudioContext } | { kind: "owner"; user: User };

const HOUR = 3_600_000;
const DAY = 24 * HOUR;

function iso(d: Date | number) {
  return new Date(d).toISOString();
}


// ---- jobs and visits an actor may see ----

function jobForActor(actor: VisitActor, jobId: string): { job: RepairJob; piece: Piece; studio: Studio } {
  const db = getDb();
  const row = db
    .select({ job: repairJobs, piece: pieces, studio: studios })
    .from(repairJobs)
    .innerJoin(pieces, eq(pieces.id, repairJobs.pieceId))
    .innerJoin(studios, eq(studios.id, repairJobs.studioId))
    .where(
      and(
        eq(repairJobs.id, jobId),
        actor.kind === "owner" ? ownerVisitWhere(actor.user.id) : eq(repairJobs.studioId, actor.ctx.studio.id),
      ),
    )
    .get();
  if (!row || actor.kind === "technician") throw notFound("No such repair job.");
  if (actor.kind === "owner" && row.job.state === "draft" && row.job.quoteVersion === 0) throw notFound("No such repair job.");
  return row;
}

function visitForActor(actor: VisitActor, visitId: string): { visit: Visit; job: RepairJob; studio: Studio } {
  const row = getDb()
    .select({ visit: visits, job: repairJobs, studio: studios })
    .from(visits)
    .innerJoin(repairJobs, eq(repairJobs.id, visits.jobId))
    .innerJoin(studios, eq(studios.id, visits.studioId))
    .where(and(eq(visits.id, visitId), actor.kind === "owner" ? ownerVisitWhere(actor.user.id) : undefined))
    .get();
  if (!row) throw notFound("No such visit.");
  const allowed =
    actor.kind === "owner"
      ? true
      : actor.kind === "staff"
        ? row.visit.studioId === actor.ctx.studio.id
        : row.visit.studioId === actor.ctx.studio.id && row.visit.technicianId === actor.ctx.user.id;
  if (!allowed) throw notFound("No such visit.");
  return row;
}

const actorId = (a: VisitActor) => (a.kind === "owner" ? a.user.id : a.ctx.user.id);

function liveVisitOfJob(jobId: string): Visit | undefined {
  return getDb().select().from(visits).where(and(eq(visits.jobId, jobId), eq(visits.state, "booked"))).get();
}

// ---- slots ----

export type SlotView = { technicianId: string; technicianName: string; start: string; end: string; localDate: string; localStart: string; localEnd: string };

function slotsFor(studio: Studio, job: RepairJob, piece: Piece, opts: { fromMs: number; toMs: number; leadTimeHours: number; excludeVisitId?: string; now: number; technicianId?: string }): SlotView[] {
  const db = getDb();
  const rules = visitRulesFor(db, studio.id);
  const durationMin = jobDurationMin(job, piece);
  const techs = studioTechnicians(db, studio.id).filter((t) => !opts.technicianId || t.id === opts.technicianId);
  return techs
    .flatMap((t) =>
      technicianSlots(db, { studio, technicianId: t.id, durationMin, fromMs: opts.fromMs, toMs: opts.toMs, leadTimeHours: opts.leadTimeHours, rules, excludeVisitId: opts.excludeVisitId, now: opts.now }).map((s) => ({
        technicianId: t.id,
        technicianName: t.name,
        start: s.start,
        end: s.end,
        localDate: s.localDate,
        localStart: s.localStart,
        localEnd: s.localEnd,
      })),
    )
    .sort((a, b) => a.start.localeCompare(b.start) || a.technicianName.localeCompare(b.technicianName));
}

function leadFor(actor: VisitActor, studioId: string): number {
  return actor.kind === "owner" ? visitRulesFor(getDb(), studioId).leadTimeHours : 0;
}

/** GET /api/jobs/[id]/slots?from&to: free slots of every technician for this job's visit. */
export function listJobSlots(actor: VisitActor, jobId: string, raw: unknown, now = Date.now()) {
  const q = slotsQuerySchema.parse(raw);
  const { job, piece, studio } = jobForActor(actor, jobId);
  const live = liveVisitOfJob(job.id);
  if (!live && job.state !== "paid" && job.state !== "covered") throw conflict("Visits can be booked once the job is paid or covered.");
  const fromMs = Math.max(q.from ? Date.parse(q.from) : now, now);
  const toMs = q.to ? Date.parse(q.to) : fromMs + 14 * DAY;
  if (toMs <= fromMs) return { timeZone: studio.timeZone, durationMin: jobDurationMin(job, piece), slots: [] as SlotView[], visitId: live?.id ?? null };
  const slots = slotsFor(studio, job, piece, { fromMs, toMs, leadTimeHours: leadFor(actor, studio.id), excludeVisitId: live?.id, now });
  return { timeZone: studio.timeZone, durationMin: jobDurationMin(job, piece), slots, visitId: live?.id ?? null };
}

/** What a 409 carries: fresh slots for the same technician around the time asked for. */
function freshSlots(actor: VisitActor, job: RepairJob, piece: Piece, studio: Studio, aroundMs: number, now: number, excludeVisitId?: string): SlotView[] {
  const fromMs = Math.max(now, aroundMs - DAY);
  return slotsFor(studio, job, piece, { fromMs, toMs: fromMs + 14 * DAY, leadTimeHours: leadFor(actor, studio.id), excludeVisitId, now }).slice(0, 60);
}

/** A refused time as the 409 the caller sees: the same words, with what is free now beside the error (`slots`). */
function withFreshSlots(e: unknown, slots: () => SlotView[]): unknown {
  return isAppError(e) && e.code === SLOT_UNAVAILABLE ? conflict(e.message, { code: SLOT_UNAVAILABLE, extra: { slots: slots() } }) : e;
}

// ---- public shape of a visit ----

export function visitJson<E extends Record<string, unknown> = Record<never, never>>(v: Visit, extra: E = {} as E) {
  return {
    id: v.id,
    jobId: v.jobId,
    pieceId: v.pieceId,
    technicianId: v.technicianId,
    start: iso(v.startAt),
    end: iso(v.endAt),
    locationKind: v.locationKind,
    location: v.location,
    state: v.state,
    sequence: v.sequence,
    icsUid: v.icsUid,
    version: v.version,
    reportedAt: v.reportedAt ? iso(v.reportedAt) : null,
    ...extra,
  };
}

// ---- book, move, cancel ----

/** POST /api/visits: books a free slot for a paid or covered job (its owner, or staff for them). */
export async function bookVisit(actor: VisitActor, raw: unknown, now = Date.now()) {
  const input = bookVisitSchema.parse(raw);
  const { job, piece, studio } = jobForActor(actor, input.jobId);
  let reserved;
  try {
    reserved = reserveVisit(getDb(), {
      studioId: studio.id,
      jobId: job.id,
      technicianId: input.technicianId,
      startMs: Date.parse(input.start),
      location: input.location,
      leadTimeHours: leadFor(actor, studio.id),
      actorId: actorId(actor),
      now,
    });
  } catch (e) {
    throw withFreshSlots(e, () => freshSlots(actor, job, piece, studio, Date.parse(input.start), now));
  }
  await mailAfterCommit("visit booked", () => sendVisitInvite(reserved.visit.id, "booked", {}, now));
  return visitJson(reserved.visit);
}

function ownerMayChange(actor: VisitActor, visit: Visit, studioId: string, now: number, verb: string) {
  if (visit.state !== "booked") throw conflict(visit.state === "done" ? `This visit is done and can't be ${verb}.` : "This visit was cancelled.");
  if (actor.kind === "technician") throw forbidden(`Ask the studio office to ${verb === "moved" ? "move" : "cancel"} a visit.`);
  if (visit.startAt.getTime() <= now) throw conflict(`This visit has started and can't be ${verb}.`);
  if (actor.kind === "owner") {
    const cutoff = visitRulesFor(getDb(), studioId).ownerChangeCutoffHours;
    if (visit.startAt.getTime() - now < cutoff * HOUR) {
      throw conflict(`Visits can be ${verb} online until ${cutoff} hours before they start. Please call or write to the studio.`);
    }
  }
}

/** PATCH /api/visits/[id]: a new time (and maybe technician), with the same checks as booking. */
export async function moveVisit(actor: VisitActor, visitId: string, raw: unknown, now = Date.now()) {
  const input = moveVisitSchema.parse(raw);
  const { visit, job, studio } = visitForActor(actor, visitId);
  ownerMayChange(actor, visit, studio.id, now, "moved");
  if (actor.kind === "owner" && input.technicianId && input.technicianId !== visit.technicianId && !isStudioTechnician(getDb(), studio.id, input.technicianId)) {
    throw badRequest("Pick one of the studio's technicians.", { technicianId: ["Pick one of the studio's technicians."] });
  }
  const piece = getDb().select().from(pieces).where(eq(pieces.id, visit.pieceId)).get()!;
  let reserved;
  try {
    reserved = reserveVisit(getDb(), {
      studioId: studio.id,
      jobId: job.id,
      technicianId: input.technicianId ?? visit.technicianId,
      startMs: Date.parse(input.start),
      location: input.location,
      leadTimeHours: leadFor(actor, studio.id),
      actorId: actorId(actor),
      now,
      visitId: visit.id,
      visitVersion: visit.version,
    });
  } catch (e) {
    throw withFreshSlots(e, () => freshSlots(actor, job, piece, studio, Date.parse(input.start), now, visit.id));
  }
  const changed = reserved.visit.startAt.getTime() !== visit.startAt.getTime() || reserved.visit.technicianId !== visit.technicianId || reserved.visit.location !== visit.location;
  if (changed) await mailAfterCommit("visit moved", () => sendVisitInvite(reserved.visit.id, "moved", { previous: visit }, now));
  return visitJson(reserved.visit);
}

/** POST /api/visits/[id]/cancel: the visit is cancelled (SEQUENCE raised, METHOD:CANCEL sent) and the job is open for booking again. */
export async function cancelVisit(actor: VisitActor, visitId: string, raw: unknown, now = Date.now()) {
  const { reason } = cancelVisitSchema.parse(raw ?? {});
  const { visit, job, studio } = visitForActor(actor, visitId);
  ownerMayChange(actor, visit, studio.id, now, "cancelled");
  const updated = getDb().transaction(
    (tx) => {
      const v = tx
        .update(visits)
        .set({ state: "cancelled", cancelledAt: new Date(now), cancelledById: actorId(actor), cancelReason: reason || null, sequence: sql`${visits.sequence} + 1`, version: sql`${visits.version} + 1`, updatedAt: new Date(now) })
        .where(and(eq(visits.id, visit.id), eq(visits.version, visit.version), eq(visits.state, "booked")))
        .returning()
        .get();
      if (!v) throw conflict("The visit changed while you were working on it. Reload and try again.");
      const freshJob = tx.select().from(repairJobs).where(eq(repairJobs.id, job.id)).get()!;
      if (freshJob.state === "scheduled") moveJob(tx, freshJob, visit.jobStateBefore);
      followJob(tx, job.id, "visit_cancelled", actorId(actor));
      recordAudit(tx, { studioId: studio.id, actorId: actorId(actor), action: "visit.cancelled", subjectType: "visit", subjectId: visit.id, data: { reason, by: actor.kind } });
      return v;
    },
    { behavior: "immediate" },
  );
  await mailAfterCommit("visit cancelled", () => sendVisitInvite(updated.id, "cancelled", { reason }, now));
  return visitJson(updated);
}

// ---- lists ----

/** GET /api/visits?technician&from&to: staff see the team (or one technician), a technician their own, an owner theirs. */
export function listVisits(actor: VisitActor, raw: unknown) {
  const q = listVisitsQuerySchema.parse(raw);
  const db = getDb();
  const from = new Date(q.from);
  const to = new Date(q.to);
  if (actor.kind === "technician" && q.technician && q.technician !== actor.ctx.user.id) throw notFound("No such technician.");
  const technician = actor.kind === "technician" ? actor.ctx.user.id : q.technician;
  if (actor.kind === "staff" && technician && !isStudioTechnician(db, actor.ctx.studio.id, technician)) throw notFound("No such technician.");
  const rows = db
    .select({ visit: visits, jobTitle: repairJobs.title, jobState: repairJobs.state, claimId: repairJobs.claimId, pieceTitle: pieces.title, ownerName: users.name, studioTz: studios.timeZone })
    .from(visits)
    .innerJoin(repairJobs, eq(repairJobs.id, visits.jobId))
    .innerJoin(pieces, eq(pieces.id, visits.pieceId))
    .innerJoin(studios, eq(studios.id, visits.studioId))
    .leftJoin(users, eq(users.id, repairJobs.ownerId))
    .where(
      and(
        actor.kind === "owner" ? ownerVisitWhere(actor.user.id) : eq(visits.studioId, actor.ctx.studio.id),
        technician ? eq(visits.technicianId, technician) : undefined,
        lt(visits.startAt, to),
        gte(visits.endAt, from),
        q.includeCancelled === "1" ? undefined : inArray(visits.state, ["booked", "done"]),
      ),
    )
    .orderBy(asc(visits.startAt))
    .limit(1000)
    .all();
  const techs = actor.kind === "owner" ? [] : studioTechnicians(db, actor.ctx.studio.id);
  const names = new Map(db.select({ id: users.id, name: users.name }).from(users).where(inArray(users.id, [...new Set(rows.map((r) => r.visit.technicianId)), "-"])).all().map((u) => [u.id, u.name]));
  return {
    timeZone: actor.kind === "owner" ? (rows[0]?.studioTz ?? "UTC") : actor.ctx.studio.timeZone,
    technicians: actor.kind === "technician" ? techs.filter((t) => t.id === actor.ctx.user.id).map(({ id, name }) => ({ id, name })) : techs.map(({ id, name }) => ({ id, name })),
    visits: rows.map((r) =>
      visitJson(r.visit, {
        jobTitle: r.jobTitle,
        jobState: r.jobState,
        pieceTitle: r.pieceTitle,
        ownerName: actor.kind === "owner" ? undefined : (r.ownerName ?? null),
        claimId: actor.kind === "staff" ? r.claimId : undefined,
        technicianName: names.get(r.visit.technicianId) ?? "",
      }),
    ),
  };
}

/**
 * The live (or last) visit of a job for its page: owners and staff. A former owner who still sees a
 * job they paid for (lib/repairs/owner-reach) gets no visit: it may be at the new owner's address.
 */
export function visitOfJob(actor: VisitActor, jobId: string) {
  if (actor.kind === "owner" && !getDb().select({ id: repairJobs.id }).from(repairJobs).where(and(eq(repairJobs.id, jobId), ownerVisitWhere(actor.user.id))).get()) {
    return { visit: null, job: null, studio: null };
  }
  const { job, studio } = jobForActor(actor, jobId);
  const db = getDb();
  const v = db.select().from(visits).where(eq(visits.jobId, job.id)).orderBy(sql`${visits.createdAt} desc`).get();
  if (!v) return { visit: null, job, studio };
  const tech = db.select({ name: users.name }).from(users).where(eq(users.id, v.technicianId)).get();
  const rules = visitRulesFor(db, studio.id);
  return {
    job,
    studio,
    visit: {
      ...visitJson(v),
      technicianName: tech?.name ?? "",
      when: formatVisitWhen(v.startAt.getTime(), v.endAt.getTime(), studio.timeZone),
      ownerCutoffHours: rules.ownerChangeCutoffHours,
      signedOffAt: v.signedOffAt ? iso(v.signedOffAt) : null,
      photos: visitPhotosOf(actor, { jobId: job.id }),
    },
  };
}

export type VisitPhotoView = { id: string; url: string; thumbUrl: string; kind: "before" | "after"; visitId: string; label: string };

/**
 * The photos taken at the visits of one job or one piece, oldest first. Staff and technicians see their
 * studio's; an owner sees those of a piece they hold now (a former owner none: the photos may show
 * the new owner's home), the same rule as the file route (lib/files/access).
 */
export function visitPhotosOf(actor: VisitActor, of: { jobId: string } | { pieceId: string }): VisitPhotoView[] {
  const rows = getDb()
    .select({ id: visitPhotos.fileId, kind: visitPhotos.kind, visitId: visits.id, startAt: visits.startAt, timeZone: studios.timeZone })
    .from(visitPhotos)
    .innerJoin(visits, eq(visits.id, visitPhotos.visitId))
    .innerJoin(pieces, eq(pieces.id, visits.pieceId))
    .innerJoin(studios, eq(studios.id, visits.studioId))
    .where(
      and(
        "jobId" in of ? eq(visits.jobId, of.jobId) : eq(visits.pieceId, of.pieceId),
        eq(visitPhotos.studioId, visits.studioId),
        actor.kind === "owner" ? eq(pieces.ownerId, actor.user.id) : eq(visits.studioId, actor.ctx.studio.id),
      ),
    )
    .orderBy(asc(visits.startAt), asc(visitPhotos.createdAt))
    .all();
  return rows.map((r) => ({
    id: r.id,
    url: fileUrl(r.id),
    thumbUrl: fileUrl(r.id, true),
    kind: r.kind,
    visitId: r.visitId,
    label: `${r.kind === "before" ? "Before" : "After"}, ${formatDate(localDate(r.startAt.getTime(), r.timeZone), { short: true })}`,
  }));
}

/** The booking page's data: the job, its duration, where the visit can be, the live visit if any. */
export function bookingContext(actor: VisitActor, jobId: string) {
  const { job, piece, studio } = jobForActor(actor, jobId);
  const live = liveVisitOfJob(job.id);
  const rules = visitRulesFor(getDb(), studio.id);
  return {
    job: { id: job.id, title: job.title, state: job.state },
    piece: { id: piece.id, title: piece.title, address: piece.deliveryAddress },
    studio: { name: studio.name, address: studio.address, timeZone: studio.timeZone },
    durationMin: jobDurationMin(job, piece),
    rules: { leadTimeHours: actor.kind === "owner" ? rules.leadTimeHours : 0, ownerChangeCutoffHours: rules.ownerChangeCutoffHours },
    visit: live ? { ...visitJson(live), when: formatVisitWhen(live.startAt.getTime(), live.endAt.getTime(), studio.timeZone) } : null,
    bookable: Boolean(live) || job.state === "paid" || job.state === "covered",
  };
}

// ---- the technician's day ----

export type BringItem = {
  productId: string;
  product: string;
  finishClass: FinishClass;
  classLabel: string;
  coats: number;
  /** The engine's exact amount (formatVolume rounds it once, for display); `ml` is that rounding in mL. */
  exactMl: number;
  ml: number;
  /** Containers to open, their sizes in the studio's units ("2 × 3.4 US fl oz (100 mL)"). */
  containers: string;
  /** How long what she applies keeps water and objects off, and until full use (lib/care/cure). */
  cure: { lightUseHours: number; fullCureDays: number };
};

function whatToBring(job: RepairJob, piece: Piece, products: FinishProduct[], appliedOn: string, units: UnitSystem): BringItem[] {
  const shape = topShape(piece);
  const areaM2 = shape ? topArea(shape).m2 : 0;
  if (!areaM2) return [];
  const input = job.quoteInput as { tasks?: CareTaskKind[]; productIds?: string[]; coats?: number };
  const coats = Math.max(1, Number(input.coats) || 1);
  const tasks = new Set(input.tasks ?? []);
  const chosen = products.filter((p) => (input.productIds ?? []).includes(p.id));
  const list = chosen.length ? chosen : products.filter((p) => tasks.has(TASK_KIND_BY_FINISH_CLASS[p.finishClass])).slice(0, 1);
  return list.map((p) => {
    const need = productNeeded({ areaM2, coats, coverageM2PerL: p.coverageM2PerL, containerSizesMl: p.containers.map((c) => c.ml) });
    const cure = cureWindow({ finishClass: p.finishClass, appliedOn, productId: p.id }, products);
    return {
      productId: p.id,
      product: p.name,
      finishClass: p.finishClass,
      classLabel: FINISH_CLASS_LABELS[p.finishClass],
      coats,
      exactMl: need.exactMl,
      ml: need.ml,
      containers: need.containers.map((c) => `${c.count} × ${formatVolume(c.sizeMl, units)}`).join(" + "),
      cure: { lightUseHours: cure.lightUseHours, fullCureDays: cure.fullCureDays },
    };
  });
}

/** Rows grouped by a key (rows without one are dropped): one query serves a whole day's visits. */
function groupBy<T, K extends string>(rows: T[], key: (r: T) => K | null): Map<K, T[]> {
  const out = new Map<K, T[]>();
  for (const r of rows) {
    const k = key(r);
    if (k !== null) out.set(k, [...(out.get(k) ?? []), r]);
  }
  return out;
}

const mapsUrl = (address: string) => `https://www.openstreetmap.org/search?${new URLSearchParams({ query: address })}`;

/**
 * The visits of one technician on one local date (default today), in order, with what each needs: the
 * job's notes, the claim it repairs (description, photos), the finish stack, the owner's name and
 * phone (the studio's client record), the address with a map link, what to bring with its cure times,
 * and the cautions. A fixed number of queries for the whole day.
 */
export function technicianDay(ctx: StudioContext, opts: { date?: string; technicianId?: string } = {}, now = Date.now()) {
  const db = getDb();
  const tz = ctx.studio.timeZone;
  const date = visitDay().safeParse(opts.date).data ?? localDate(now, tz);
  const technicianId = ctx.role === "technician" ? ctx.user.id : (opts.technicianId ?? ctx.user.id);
  if (ctx.role !== "technician" && opts.technicianId && !isStudioTechnician(db, ctx.studio.id, opts.technicianId)) throw notFound("No such technician.");
  const from = new Date(zonedTimeToEpochMs(date, 0, tz));
  const to = new Date(zonedTimeToEpochMs(addDays(date, 1), 0, tz));
  const rows = db
    .select({ visit: visits, job: repairJobs, piece: pieces, ownerName: users.name, ownerPhone: clients.phone, claim: { id: claims.id, description: claims.description, category: claims.category, noticedOn: claims.noticedOn } })
    .from(visits)
    .innerJoin(repairJobs, eq(repairJobs.id, visits.jobId))
    .innerJoin(pieces, eq(pieces.id, visits.pieceId))
    .leftJoin(users, eq(users.id, repairJobs.ownerId))
    .leftJoin(clients, and(eq(clients.studioId, visits.studioId), eq(clients.userId, repairJobs.ownerId)))
    .leftJoin(claims, and(eq(claims.id, repairJobs.claimId), eq(claims.studioId, visits.studioId)))
    .where(and(eq(visits.studioId, ctx.studio.id), eq(visits.technicianId, technicianId), inArray(visits.state, ["booked", "done"]), gte(visits.startAt, from), lt(visits.startAt, to)))
    .orderBy(asc(visits.startAt))
    .all();
  const products = studioProducts(ctx.studio.id);
  const ids = (xs: (string | null | undefined)[]) => [...new Set(xs.filter((x): x is string => !!x)), "-"];
  const layersByPiece = groupBy(
    db.select().from(finishLayers).where(inArray(finishLayers.pieceId, ids(rows.map((r) => r.piece.id)))).orderBy(asc(finishLayers.surface), asc(finishLayers.position)).all(),
    (l) => l.pieceId,
  );
  const photosByVisit = groupBy(
    db.select({ id: visitPhotos.fileId, kind: visitPhotos.kind, visitId: visitPhotos.visitId }).from(visitPhotos).where(inArray(visitPhotos.visitId, ids(rows.map((r) => r.visit.id)))).orderBy(asc(visitPhotos.createdAt)).all(),
    (p) => p.visitId,
  );
  const claimPhotosByClaim = groupBy(
    db.select({ id: files.id, claimId: files.claimId }).from(files).where(and(inArray(files.claimId, ids(rows.map((r) => r.claim?.id))), eq(files.purpose, "claim_photo"), eq(files.studioId, ctx.studio.id))).orderBy(asc(files.createdAt)).all(),
    (f) => f.claimId,
  );
  const items = rows.map(({ visit, job, piece, ownerName, ownerPhone, claim }) => {
    const layers = layersByPiece.get(piece.id) ?? [];
    const bring = whatToBring(job, piece, products, localDate(visit.startAt.getTime(), tz), ctx.studio.unitSystem);
    const jobTasks = (job.quoteInput as { tasks?: CareTaskKind[] }).tasks ?? [];
    // The cautions for this visit's tasks and the products brought, once each (lib/care/cautions).
    const cautions = cautionsFor({
      tasks: jobTasks,
      applying: bring.map((b) => b.finishClass),
      hasResin: piece.resinKind !== "none" || layers.some((l) => l.finishClass === "epoxy_surface"),
      audience: "technician",
    });
    const photos = (photosByVisit.get(visit.id) ?? []).map(({ id, kind }) => ({ id, kind }));
    const tasks = jobTasks.map((k) => CARE_TASK_LABELS[k] ?? k);
    return {
      visit: visitJson(visit, { when: formatVisitWhen(visit.startAt.getTime(), visit.endAt.getTime(), tz), mapsUrl: mapsUrl(visit.location), started: visit.startAt.getTime() <= now }),
      job: { id: job.id, title: job.title, tasks, notes: job.notes },
      claim: claim?.id
        ? { id: claim.id, description: claim.description, category: claim.category, noticedOn: claim.noticedOn, photos: (claimPhotosByClaim.get(claim.id) ?? []).map((f) => ({ id: f.id, url: fileUrl(f.id), thumbUrl: fileUrl(f.id, true) })) }
        : null,
      piece: { id: piece.id, title: piece.title, resinKind: piece.resinKind, primarySpeciesId: piece.primarySpeciesId, deliveredOn: piece.deliveredOn, internalNotes: piece.internalNotes },
      ownerName: ownerName ?? null,
      ownerPhone: ownerPhone ? { tel: ownerPhone, display: displayPhone(ownerPhone, ctx.studio.country) } : null,
      layers: layers.map((l) => ({ id: l.id, surface: l.surface, position: l.position, finishClass: l.finishClass, classLabel: FINISH_CLASS_LABELS[l.finishClass], productLabel: l.productLabel, coats: l.coats, appliedOn: l.appliedOn, notes: l.notes })),
      bring,
      /** The report's proposed layers: the quote's products and coats. */
      defaultLayers: bring.map((b) => ({ finishClass: b.finishClass, productId: b.productId, coats: b.coats })),
      cautions,
      photos,
      report: visit.reportedAt
        ? { work: visit.reportWork ?? "", at: iso(visit.reportedAt), earlyReason: visit.reportEarlyReason, signedOffAt: visit.signedOffAt ? iso(visit.signedOffAt) : null, typedName: visit.reportSignOffName }
        : null,
    };
  });
  return {
    date,
    today: localDate(now, tz),
    timeZone: tz,
    technicianId,
    items,
    products: products.map((p) => ({ id: p.id, name: p.name, finishClass: p.finishClass })),
  };
}

// ---- photos and the report ----

/**
 * POST /api/visits/[id]/photos (multipart: file, kind): a before or after photo, through lib/storage.
 * `read` (the bounded upload reader) is called only once the visit is known to be the actor's.
 */
export async function addVisitPhoto(ctx: StudioContext, visitId: string, read: () => Promise<{ data: Uint8Array; fields: Record<string, string> }>) {
  const actor: VisitActor = ctx.role === "technician" ? { kind: "technician", ctx } : { kind: "staff", ctx };
  const { visit } = visitForActor(actor, visitId);
  if (visit.state === "cancelled") throw conflict("This visit was cancelled.");
  const upload = await read();
  const kind = visitPhotoKindSchema.parse(upload.fields.kind);
  const stored = await storeImage(upload.data, ctx.user.id);
  try {
    const file = getDb().transaction((tx) => {
      const f = tx.insert(files).values({ studioId: visit.studioId, purpose: "visit_photo", pieceId: visit.pieceId, ...stored, uploadedById: ctx.user.id }).returning().get();
      tx.insert(visitPhotos).values({ studioId: visit.studioId, visitId: visit.id, fileId: f.id, kind }).run();
      recordAudit(tx, { studioId: visit.studioId, actorId: ctx.user.id, action: "visit.photo_added", subjectType: "visit", subjectId: visit.id, data: { fileId: f.id, kind } });
      return f;
    });
    return { id: file.id, kind, url: `/api/files/${file.id}`, thumbUrl: `/api/files/${file.id}?thumb=1` };
  } catch (e) {
    await removeStoredFiles(stored.storageKey, stored.thumbKey);
    throw e;
  }
}

/**
 * POST /api/visits/[id]/report: what was done, the new finish layers (appended to the piece's stack,
 * which restarts their classes' care clocks through careSchedule), the care done (care log, source
 * "visit"), the owner's sign-off; the job becomes done and the owner gets a summary.
 */
export async function submitReport(ctx: StudioContext, visitId: string, raw: unknown, now = new Date()) {
  const input = visitReportSchema.parse(raw);
  const actor: VisitActor = ctx.role === "technician" ? { kind: "technician", ctx } : { kind: "staff", ctx };
  const { visit, studio } = visitForActor(actor, visitId);
  if (visit.state === "done") throw conflict("This visit's report is already filed.");
  if (visit.state === "cancelled") throw conflict("This visit was cancelled.");
  const early = now.getTime() < visit.startAt.getTime();
  if (early) {
    const starts = `${formatVisitWhen(visit.startAt.getTime(), visit.endAt.getTime(), studio.timeZone)} (${studio.timeZone})`;
    if (actor.kind === "technician") throw conflict(`This visit starts ${starts}. File the report once it has started; the studio office can file it early with a reason.`);
    if (!input.earlyReason) {
      const msg = "The visit hasn't started yet. Say why the report is filed early; the reason goes in the audit log.";
      throw unprocessable("report_before_visit", msg, { earlyReason: [msg] });
    }
  }
  const today = localDate(now.getTime(), studio.timeZone);
  const db = getDb();
  const piece = db.select().from(pieces).where(eq(pieces.id, visit.pieceId)).get()!;
  const fieldErrors: Record<string, string[]> = {};
  input.layers.forEach((l, i) => {
    if (l.appliedOn > today) fieldErrors[`layers.${i}.appliedOn`] = ["A layer can't be dated after today."];
    else if (l.appliedOn < piece.deliveredOn) fieldErrors[`layers.${i}.appliedOn`] = ["That is before the piece was delivered."];
  });
  if (Object.keys(fieldErrors).length) throw badRequest("Check the layer dates.", fieldErrors);

  const signOffToken = randomToken();
  const result = db.transaction(
    (tx) => {
      const fresh = tx.select().from(visits).where(eq(visits.id, visit.id)).get()!;
      if (fresh.state !== "booked" || fresh.version !== visit.version) throw conflict("The visit changed while you were working on it. Reload and try again.");
      input.layers.forEach((l, i) => checkLayerRefs(ctx, tx, l, `layers.${i}.`));
      const added = insertLayers(
        ctx,
        tx,
        piece.id,
        input.layers.map((l) => ({ ...l, productId: l.productId || null, appliedById: ctx.user.id, notes: `Visit ${localDate(visit.startAt.getTime(), studio.timeZone)}` })),
      );
      // The care done: one entry per task a new layer restarts, plus the job's other tasks (inspections, checks).
      const job = tx.select().from(repairJobs).where(eq(repairJobs.id, visit.jobId)).get()!;
      const logged = new Set<string>();
      for (const l of added) {
        const kind = TASK_KIND_BY_FINISH_CLASS[l.finishClass];
        const key = `${kind}:${l.surface}`;
        if (logged.has(key)) continue;
        logged.add(key);
        tx.insert(careLogEntries).values({ studioId: studio.id, pieceId: piece.id, userId: ctx.user.id, source: "visit", taskKind: kind, surface: l.surface, doneOn: l.appliedOn, productUsed: l.productLabel, notes: input.work.slice(0, 1000) }).run();
      }
      const jobTasks = ((job.quoteInput as { tasks?: CareTaskKind[] }).tasks ?? []).filter((k) => ![...logged].some((x) => x.startsWith(`${k}:`)));
      for (const kind of new Set(jobTasks)) {
        tx.insert(careLogEntries).values({ studioId: studio.id, pieceId: piece.id, userId: ctx.user.id, source: "visit", taskKind: kind, surface: null, doneOn: today, notes: input.work.slice(0, 1000) }).run();
      }
      const done = tx
        .update(visits)
        .set({
          state: "done",
          reportWork: input.work,
          reportLayerIds: added.map((l) => l.id),
          reportedAt: now,
          reportedById: ctx.user.id,
          reportEarlyReason: early ? input.earlyReason : null,
          ...(job.ownerId ? { signOffTokenHash: sha256Hex(signOffToken), signOffExpiresAt: new Date(now.getTime() + SIGN_OFF_TTL_MS) } : {}),
          version: sql`${visits.version} + 1`,
          updatedAt: now,
        })
        .where(and(eq(visits.id, visit.id), eq(visits.version, visit.version)))
        .returning()
        .get();
      if (!done) throw conflict("The visit changed while you were working on it. Reload and try again.");
      if (job.state === "scheduled") moveJob(tx, job, "done", { doneAt: now });
      followJob(tx, job.id, "job_done", ctx.user.id);
      tx.update(pieces).set({ updatedAt: now }).where(eq(pieces.id, piece.id)).run();
      indexPiece(tx, piece.id);
      recordAudit(tx, {
        studioId: studio.id,
        actorId: ctx.user.id,
        action: "visit.reported",
        subjectType: "visit",
        subjectId: visit.id,
        data: { layerIds: added.map((l) => l.id), ...(early ? { beforeStart: true, start: visit.startAt.toISOString(), reason: input.earlyReason } : {}) },
      });
      return { visit: done, added, job };
    },
    { behavior: "immediate" },
  );

  const layers = db.select().from(finishLayers).where(eq(finishLayers.pieceId, piece.id)).all();
  const careLog = db.select().from(careLogEntries).where(eq(careLogEntries.pieceId, piece.id)).all();
  const schedule = scheduleFromRows({ piece, layers, careLog, products: studioProducts(studio.id), timeZone: studio.timeZone, now });
  const owner = result.job.ownerId ? db.select().from(users).where(eq(users.id, result.job.ownerId)).get() : undefined;
  const technician = db.select({ name: users.name }).from(users).where(eq(users.id, visit.technicianId)).get();
  const photoCount = db.select({ n: sql<number>`count(*)` }).from(visitPhotos).where(eq(visitPhotos.visitId, visit.id)).get()?.n ?? 0;
  if (owner) {
    const hasResin = piece.resinKind !== "none" || layers.some((l) => l.finishClass === "epoxy_surface");
    const products = studioProducts(studio.id);
    const SURFACE_WORDS = { top: "top", base: "base", edges: "edges", whole_piece: "whole piece" } as const;
    await mailAfterCommit("visit summary", () =>
      sendVisitSummary({ studioId: studio.id, visitId: visit.id }, owner.email, {
        ownerName: owner.name,
        studioName: studio.name,
        pieceTitle: piece.title,
        jobTitle: result.job.title,
        when: formatVisitWhen(visit.startAt.getTime(), visit.endAt.getTime(), studio.timeZone),
        technicianName: technician?.name ?? "Your technician",
        work: input.work,
        layers: result.added.map((l) => `${l.surface[0]!.toUpperCase()}${l.surface.slice(1)}: ${FINISH_CLASS_LABELS[l.finishClass]}${l.productLabel ? ` — ${l.productLabel}` : ""}, ${l.coats} coat${l.coats === 1 ? "" : "s"}, ${formatDate(l.appliedOn)}`),
        signOffUrl: signOffUrl(signOffToken),
        photoCount,
        nextCare: schedule.tasks.slice(0, 3).map((t) => ({ label: `${t.label} (${SURFACE_WORDS[t.surface]})`, dueOn: formatDate(t.dueOn) })),
        curing: cureAdvice(curingLayers(result.added, products, schedule.today), schedule.today),
        cautions: cautionsFor({ hasResin, audience: "owner" }).map(cautionLine),
        url: new URL(`/pieces/${piece.id}`, jobUrl(result.job.id)).href,
      }),
    );
  }
  return { visit: visitJson(result.visit), layers: result.added, schedule };
}

// ---- technician hours ----

function technicianFor(ctx: StudioContext, technicianId: string, write: boolean) {
  if (ctx.role === "technician" && (write || technicianId !== ctx.user.id)) {
    if (technicianId !== ctx.user.id) throw notFound("No such technician.");
    throw forbidden("The studio office sets working hours.");
  }
  if (!isStudioTechnician(getDb(), ctx.studio.id, technicianId)) throw notFound("No such technician.");
}

/** GET /api/technicians/[id]/hours */
export function getTechnicianHours(ctx: StudioContext, technicianId: string) {
  technicianFor(ctx, technicianId, false);
  const db = getDb();
  return {
    technicianId,
    timeZone: ctx.studio.timeZone,
    hours: weeklyHours(db, ctx.studio.id, technicianId),
    timeOff: timeOffRows(db, ctx.studio.id, technicianId).map((t) => ({ date: t.date, start: t.start, end: t.end, note: t.note })),
  };
}

/** PUT /api/technicians/[id]/hours: replaces the weekly hours and the time off (admin and staff). */
export function putTechnicianHours(ctx: StudioContext, technicianId: string, raw: unknown) {
  const input = technicianHoursSchema.parse(raw);
  technicianFor(ctx, technicianId, true);
  getDb().transaction(
    (tx) => {
      tx.delete(technicianHours).where(and(eq(technicianHours.studioId, ctx.studio.id), eq(technicianHours.userId, technicianId))).run();
      tx.delete(technicianTimeOff).where(and(eq(technicianTimeOff.studioId, ctx.studio.id), eq(technicianTimeOff.userId, technicianId))).run();
      for (const h of input.hours) tx.insert(technicianHours).values({ studioId: ctx.studio.id, userId: technicianId, ...h }).run();
      for (const t of input.timeOff) tx.insert(technicianTimeOff).values({ studioId: ctx.studio.id, userId: technicianId, date: t.date, start: t.start ?? null, end: t.end ?? null, note: t.note }).run();
      recordAudit(tx, { studioId: ctx.studio.id, actorId: ctx.user.id, action: "technician.hours_set", subjectType: "user", subjectId: technicianId, data: { ranges: input.hours.length, timeOff: input.timeOff.length } });
    },
    { behavior: "immediate" },
  );
  return getTechnicianHours(ctx, technicianId);
}

/** The studio's technicians with their weekly hours, for the hours page and the calendar. */
export function listTechnicians(ctx: StudioContext) {
  const db = getDb();
  const techs = studioTechnicians(db, ctx.studio.id).filter((t) => ctx.role !== "technician" || t.id === ctx.user.id);
  return techs.map((t) => ({ id: t.id, name: t.name, hours: weeklyHours(db, ctx.studio.id, t.id), timeOff: timeOffRows(db, ctx.studio.id, t.id).map((o) => ({ date: o.date, start: o.start, end: o.end, note: o.note })) }));
}

/** Jobs waiting for a visit (paid or covered, none booked), for staff booking from the calendar. */
export function jobsAwaitingVisit(ctx: StudioContext) {
  return getDb()
    .select({ id: repairJobs.id, title: repairJobs.title, state: repairJobs.state, pieceTitle: pieces.title, ownerName: users.name })
    .from(repairJobs)
    .innerJoin(pieces, eq(pieces.id, repairJobs.pieceId))
    .leftJoin(users, eq(users.id, repairJobs.ownerId))
    .where(and(eq(repairJobs.studioId, ctx.studio.id), inArray(repairJobs.state, ["paid", "covered"])))
    .orderBy(asc(repairJobs.updatedAt))
    .all();
}

/** Today and this week's Monday in the studio's time zone, for the calendar's first view. */
export function calendarWeek(ctx: StudioContext, week?: string, now = Date.now()) {
  const today = localDate(now, ctx.studio.timeZone);
  const base = visitDay().safeParse(week).data ?? today;
  return { today, monday: addDays(base, 1 - isoWeekday(base)) };
}
