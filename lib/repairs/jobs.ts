import { and, desc, eq, inArray, isNull, sql } from "drizzle-orm";
import type { User } from "lucia";
import { getDb, type Tx } from "@/db/client";
import { claims, finishProducts, payments, pieces, planSubscriptions, planTemplates, planVisits, refreshOffers, repairJobs, studios, users, type RepairJob } from "@/db/schema";
import { recordAudit } from "@/lib/audit";
import type { StudioContext } from "@/lib/auth/guards";
import { FINISH_CLASSES, SURFACES, TASK_KIND_BY_FINISH_CLASS, type CareTaskKind } from "@/lib/care/vocabulary";
import { conflict, notFound } from "@/lib/errors";
import { recordedAreaM2, surfacesEndingIn } from "@/lib/pieces/care-inputs";
import { planRepairDiscount } from "@/lib/plans/repair-discount";
import type { JobQuoteInput } from "@/lib/validation/jobs";
import { jobVisibleTo, jobWhere } from "./access";
import { ownerActsOnJob, type OwnerReach } from "./owner-reach";
import { readLines } from "./lines";
import { defaultProductIds, priceJob, pricedPiece, proposeLines, totals, type PricedPiece } from "./pricing";
import { assertMove, defaultJobTitle } from "./states";


function studioProducts(studioId: string) {
  return getDb().select().from(finishProducts).where(and(eq(finishProducts.studioId, studioId), isNull(finishProducts.archivedAt))).all();
}

/** A first quote: maintenance tasks with a product of their finish class where the task uses one (an inspection uses none), repairs from the price list, one coat, travel on. */
function defaultQuoteInput(title: string, work: { tasks: CareTaskKind[]; repairs?: string[] }, products: (typeof finishProducts.$inferSelect)[], coveredPct: number): JobQuoteInput {
  return { title, tasks: work.tasks, repairs: work.repairs ?? [], productIds: defaultProductIds(work.tasks, products), coats: 1, travel: true, coveredPct, notes: "" };
}

/**
 * Accepted claims and accepted refresh offers of the studio that have no job yet and can have one: the
 * owner who asked still holds the piece (handedOnRefusal; the staff claim page says why when not).
 */
export function jobsToCreate(ctx: StudioContext) {
  const db = getDb();
  const fromClaims = db
    .select({ id: claims.id, category: claims.category, decision: claims.decision, coveredPct: claims.coveredPct, pieceTitle: pieces.title, ownerName: users.name, at: claims.decidedAt })
    .from(claims)
    .innerJoin(pieces, eq(pieces.id, claims.pieceId))
    .innerJoin(users, eq(users.id, claims.ownerId))
    .leftJoin(repairJobs, eq(repairJobs.claimId, claims.id))
    .where(and(eq(claims.studioId, ctx.studio.id), eq(claims.state, "accepted"), isNull(repairJobs.id), eq(pieces.ownerId, claims.ownerId)))
    .all();
  const fromOffers = db
    .select({ id: refreshOffers.id, taskKey: refreshOffers.taskKey, priceMinor: refreshOffers.priceMinor, currency: refreshOffers.currency, pieceTitle: pieces.title, ownerName: users.name, at: refreshOffers.acceptedAt })
    .from(refreshOffers)
    .innerJoin(pieces, eq(pieces.id, refreshOffers.pieceId))
    .innerJoin(users, eq(users.id, refreshOffers.userId))
    .leftJoin(repairJobs, eq(repairJobs.refreshOfferId, refreshOffers.id))
    .where(and(eq(refreshOffers.studioId, ctx.studio.id), eq(refreshOffers.status, "accepted"), isNull(repairJobs.id), eq(pieces.ownerId, refreshOffers.userId)))
    .all();
  return { fromClaims, fromOffers };
}

/**
 * The work a claim's first quote proposes, by the claim's category (staff change it on the quote).
 * "refresh" is the task that renews the top's outer finish (worn or scratched wax is re-waxed, a worn
 * film finish inspected, not re-oiled), else the task named beside it where the finish stack says nothing.
 */
const CLAIM_WORK: Record<string, { tasks: (CareTaskKind | { refresh: CareTaskKind })[]; repairs?: string[] }> = {
  crack_gap: { tasks: [], repairs: ["crack_fill"] },
  resin_clouding: { tasks: ["resin_polish"] },
  finish_wear: { tasks: [{ refresh: "reoil" }] },
  finish_peeling: { tasks: [{ refresh: "topcoat_refresh" }], repairs: ["spot_refinish"] },
  structural: { tasks: [], repairs: ["base_fix"] },
  scratch_dent: { tasks: [{ refresh: "reoil" }], repairs: ["spot_refinish"] },
};

/** A claim's first work on this piece: each "refresh" read from the top's outermost layer (lib/pieces/care-inputs surfacesEndingIn). */
function claimWork(category: string, layers: PricedPiece["layers"]): { tasks: CareTaskKind[]; repairs?: string[] } {
  const work = CLAIM_WORK[category] ?? { tasks: ["annual_check"] };
  const top = FINISH_CLASSES.find((c) => surfacesEndingIn(layers, c).includes("top"));
  return { ...work, tasks: work.tasks.map((t) => (typeof t === "string" ? t : top ? TASK_KIND_BY_FINISH_CLASS[top] : t.refresh)) };
}


/**
 * Why an accepted claim or refresh offer can't become a repair job now, in staff's words, or null when it
 * can. A job is the owner's to approve, pay and book, and an owner acts on a job only while they hold its
 * piece (lib/repairs/owner-reach.ts ownerActsOnJob; for the claim itself, lib/claims/claim-row.ts
 * requireOwnerActsOnClaim). After the piece changed hands — released, or registered by someone else — the
 * former owner could do nothing with the job, and the piece's new owner never asked for it.
 */
export function handedOnRefusal(source: "claim" | "refresh_offer", askedBy: { ownerId: string | null }, piece: { ownerId: string | null }): string | null {
  if (ownerActsOnJob(askedBy, piece)) return null;
  return source === "claim"
    ? "This piece changed hands after the claim was filed. The owner who filed it no longer holds the piece and can't approve, pay or book a repair, so no repair job can be opened from this claim. If the piece's new owner wants the repair, they can file a claim of their own."
    : "This piece changed hands after the refresh offer was accepted. The owner who accepted it no longer holds the piece and can't approve, pay or book the visit, so no job can be opened from this offer.";
}

export function createJob(ctx: StudioContext, from: "claim" | "refresh_offer", sourceId: string): RepairJob {
  const db = getDb();
  const products = studioProducts(ctx.studio.id);
  return db.transaction((tx) => {
    let values: typeof repairJobs.$inferInsert;
    if (from === "claim") {
      const claim = tx.select().from(claims).where(and(eq(claims.id, sourceId), eq(claims.studioId, ctx.studio.id))).get();
      if (!claim) throw notFound("No such claim in this studio.");
      if (claim.state !== "accepted") throw conflict("Only an accepted claim becomes a repair job.");
      if (tx.select({ id: repairJobs.id }).from(repairJobs).where(eq(repairJobs.claimId, claim.id)).get()) throw conflict("This claim already has a repair job.");
      const piece = tx.select().from(pieces).where(eq(pieces.id, claim.pieceId)).get()!;
      const handedOn = handedOnRefusal("claim", claim, piece);
      if (handedOn) throw conflict(handedOn);
      const coveredPct = claim.decision === "covered" ? 100 : claim.decision === "partly_covered" ? (claim.coveredPct ?? 0) : 0;
      const priced = pricedPiece(tx, piece);
      const input = defaultQuoteInput(defaultJobTitle({ claim: claim.category }), claimWork(claim.category, priced.layers), products, coveredPct);
      values = { studioId: ctx.studio.id, pieceId: piece.id, ownerId: claim.ownerId, origin: "claim", claimId: claim.id, title: input.title, quoteInput: input, currency: ctx.studio.currency, coveredPct, createdById: ctx.user.id, ...totals(priceJob(ctx.studio, priced, input, products, [], planRepairDiscount(piece.id, new Date()))) };
    } else {
      const offer = tx.select().from(refreshOffers).where(and(eq(refreshOffers.id, sourceId), eq(refreshOffers.studioId, ctx.studio.id))).get();
      if (!offer) throw notFound("No such refresh offer in this studio.");
      if (offer.status !== "accepted") throw conflict("Only an accepted refresh offer becomes a repair job.");
      if (tx.select({ id: repairJobs.id }).from(repairJobs).where(eq(repairJobs.refreshOfferId, offer.id)).get()) throw conflict("This offer already has a repair job.");
      const piece = tx.select().from(pieces).where(eq(pieces.id, offer.pieceId)).get()!;
      const handedOn = handedOnRefusal("refresh_offer", { ownerId: offer.userId }, piece);
      if (handedOn) throw conflict(handedOn);
      const kind = offer.taskKey.split(":")[1] as CareTaskKind | undefined;
      const input = defaultQuoteInput(defaultJobTitle({ refresh: kind }), { tasks: kind ? [kind] : ["annual_check"] }, products, 0);
      values = { studioId: ctx.studio.id, pieceId: piece.id, ownerId: offer.userId, origin: "refresh_offer", refreshOfferId: offer.id, title: input.title, quoteInput: input, currency: ctx.studio.currency, createdById: ctx.user.id, ...totals(priceJob(ctx.studio, pricedPiece(tx, piece), input, products, [], planRepairDiscount(piece.id, new Date()))) };
    }
    const job = tx.insert(repairJobs).values(values).returning().get();
    recordAudit(tx, { studioId: ctx.studio.id, actorId: ctx.user.id, action: "job.created", subjectType: "repair_job", subjectId: job.id, data: { from, sourceId } });
    return job;
  });
}

/**
 * What the owner paid for a job and what was given back of it, in subqueries of the list
 * (payments_job_idx): the job's own payments (the one that counts, or the one refunded when the job
 * was cancelled; not a second payment refunded on its own, which never paid for it); a payment set
 * aside for refund counts as given back in full, else what Stripe reports refunded (lib/repairs/refunds.ts).
 */
const ownPayment = sql`${payments.jobId} = ${repairJobs.id} and ${payments.paidAt} is not null and (${payments.refundReason} is null or ${payments.refundReason} = 'job_cancelled')`;
const paidMinor = sql<number>`(select coalesce(sum(${payments.amountMinor}), 0) from ${payments} where ${ownPayment})`.mapWith(Number);
const refundedMinor = sql<number>`(select coalesce(sum(case when ${payments.refundReason} is null then ${payments.refundedMinor} else ${payments.amountMinor} end), 0) from ${payments} where ${ownPayment})`.mapWith(Number);

export function listStudioJobs(ctx: StudioContext, filter: { state?: RepairJob["state"] }) {
  return getDb()
    .select({ id: repairJobs.id, title: repairJobs.title, state: repairJobs.state, origin: repairJobs.origin, totalMinor: repairJobs.totalMinor, coveredPct: repairJobs.coveredPct, currency: repairJobs.currency, updatedAt: repairJobs.updatedAt, pieceTitle: pieces.title, ownerName: users.name, paidMinor, refundedMinor })
    .from(repairJobs)
    .innerJoin(pieces, eq(pieces.id, repairJobs.pieceId))
    .leftJoin(users, eq(users.id, repairJobs.ownerId))
    .where(and(jobVisibleTo(ctx), filter.state ? eq(repairJobs.state, filter.state) : undefined))
    .orderBy(desc(repairJobs.updatedAt))
    .limit(500)
    .all();
}

export function listOwnerJobs(user: Pick<User, "id">, filter: { state?: RepairJob["state"] } = {}) {
  return getDb()
    .select({ id: repairJobs.id, title: repairJobs.title, state: repairJobs.state, origin: repairJobs.origin, totalMinor: repairJobs.totalMinor, coveredPct: repairJobs.coveredPct, currency: repairJobs.currency, updatedAt: repairJobs.updatedAt, pieceTitle: pieces.title, studioName: studios.name, studioCountry: studios.country, paidMinor, refundedMinor })
    .from(repairJobs)
    .innerJoin(pieces, eq(pieces.id, repairJobs.pieceId))
    .innerJoin(studios, eq(studios.id, repairJobs.studioId))
    .where(and(jobVisibleTo({ role: "owner", user, studio: null }, "history"), inArray(repairJobs.state, ["quoted", "approved", "paid", "covered", "scheduled", "done", "cancelled"]), filter.state ? eq(repairJobs.state, filter.state) : undefined))
    .orderBy(desc(repairJobs.updatedAt))
    .all();
}

function loadJob(where: ReturnType<typeof and>) {
  const row = getDb()
    .select({ job: repairJobs, piece: pieces, studio: studios, owner: { id: users.id, name: users.name, email: users.email, timeZone: users.timeZone } })
    .from(repairJobs)
    .innerJoin(pieces, eq(pieces.id, repairJobs.pieceId))
    .innerJoin(studios, eq(studios.id, repairJobs.studioId))
    .leftJoin(users, eq(users.id, repairJobs.ownerId))
    .where(where)
    .get();
  if (!row) throw notFound("No such repair job.");
  row.job = { ...row.job, lines: readLines(row.job.lines), proposedLines: readLines(row.job.proposedLines) };
  const jobPayments = getDb().select().from(payments).where(eq(payments.jobId, row.job.id)).orderBy(desc(payments.createdAt)).all();
  return { ...row, payments: jobPayments, planName: row.job.origin === "plan" ? visitPlanName(row.job) : null };
}

/** The plan visit a job is, with its plan's name (the version it was bought under): found by job (plan_visits_job_idx). */
export function planVisitOfJob(job: Pick<RepairJob, "id" | "studioId">) {
  return getDb()
    .select({ name: planTemplates.name })
    .from(planVisits)
    .innerJoin(planSubscriptions, eq(planSubscriptions.id, planVisits.subscriptionId))
    .innerJoin(planTemplates, eq(planTemplates.id, planSubscriptions.templateId))
    .where(and(eq(planVisits.studioId, job.studioId), eq(planVisits.jobId, job.id)));
}

/** The name of the care plan whose included visit a job is. */
function visitPlanName(job: Pick<RepairJob, "id" | "studioId">): string | null {
  return planVisitOfJob(job).get()?.name ?? null;
}

export type JobView = ReturnType<typeof loadJob>;

/**
 * A job of the studio's for staff: with the piece's finish stack (the quote prices each line from the
 * surface its work is on, lib/repairs/pricing) and the work its quote's proposal could not size.
 */
export function getStudioJob(ctx: StudioContext, jobId: string) {
  const view = loadJob(jobWhere(ctx, jobId));
  const products = studioProducts(ctx.studio.id);
  const piece = pricedPiece(getDb(), view.piece);
  const input = { title: view.job.title, tasks: [], repairs: [], productIds: [], coats: 1, travel: false, coveredPct: view.job.coveredPct, notes: "", ...view.job.quoteInput };
  const { unsized, topOnly } = proposeLines(view.studio, piece, input, products);
  // The quote may carry a size for each surface the record has none for (always the base and the edges).
  const sizeFields = SURFACES.filter((s) => recordedAreaM2(piece, s) === null);
  return { ...view, piece, products, unsized, topOnly, sizeFields };
}

/**
 * The owner's own job; drafts stay with the studio until a quote is sent. "history" (reading) also
 * reaches a job they paid for on a piece they have since handed on; "act" (approve, pay, cancel) only
 * a job on a piece they hold (lib/repairs/owner-reach).
 */
export function getOwnerJob(user: Pick<User, "id">, jobId: string, reach: OwnerReach = "history") {
  const view = loadJob(jobWhere({ role: "owner", user, studio: null }, jobId, reach));
  if (view.job.state === "draft" && view.job.quoteVersion === 0) throw notFound("No such repair job.");
  // A former owner's history never carries the piece's address: it may be the new owner's.
  return view.piece.ownerId === user.id ? view : { ...view, piece: { ...view.piece, deliveryAddress: "" } };
}

/** Moves a job with a compare-and-set on its version, so two writers can't both win. */
export function moveJob(tx: Tx, job: RepairJob, to: RepairJob["state"], set: Partial<typeof repairJobs.$inferInsert> = {}): RepairJob {
  assertMove(job.state, to);
  const updated = tx
    .update(repairJobs)
    .set({ ...set, state: to, version: sql`${repairJobs.version} + 1`, updatedAt: new Date() })
    .where(and(eq(repairJobs.id, job.id), eq(repairJobs.version, job.version)))
    .returning()
    .get();
  if (!updated) throw conflict("The job changed while you were working on it. Reload and try again.");
  return updated;
}
