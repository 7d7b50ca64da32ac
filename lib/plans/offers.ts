// What an owner sees of plans for one of their pieces: the plan it is under, or the plans that fit
// it with their price (the studio's tax) and what the plan would have saved them over the last year
// of their own care log, priced at the studio's prices (lib/repairs priceJob) — computed, not claimed
// (lib/plans/savings). The owner's piece page and the hand-over and refresh mails read the same offers.
import { and, eq, gte } from "drizzle-orm";
import type { User } from "lucia";
import { getDb, type Db } from "@/db/client";
import { careLogEntries, finishProducts, pieces, studios, type Piece, type Studio } from "@/db/schema";
import { addDays, localDate } from "@/lib/care/dates";
import { TASK_KIND_BY_FINISH_CLASS, type CareTaskKind } from "@/lib/care/vocabulary";
import { ownedPieceRow } from "@/lib/owner/pieces";
import { priceJob, pricedPiece, type PricedPiece } from "@/lib/repairs/pricing";
import { PLAN_STATE_LABELS, type PlanState } from "./states";
import { livePlanOfPiece } from "./subscriptions";
import { planOfferLines, type PlanOfferLine } from "./offer-lines";
import type { PricedPlan } from "./price-words";
import { planPrice } from "./price";
import { LAST_YEAR_DAYS, lastYearSavings, type LastYearSavings, type LoggedCare } from "./savings";
import { templatesFitting } from "./templates";
import type { PlanIncluded, PlanInterval } from "./terms";

export type PlanOffer = {
  id: string;
  name: string;
  summary: string;
  version: number;
  interval: PlanInterval;
  currency: string;
  /** What one interval costs, tax as the studio sets it. */
  priceMinor: number;
  taxMinor: number;
  included: PlanIncluded;
  /** The last year of the owner's care log, as the studio would have charged it; null when nothing logged is included. */
  lastYear: LastYearSavings | null;
};

export type PiecePlan = PricedPlan & { subscriptionId: string; name: string; version: number; state: PlanState; stateLabel: string; periodEnd: number | null; paidBy: "card" | "other"; included: PlanIncluded };

/**
 * The one-off price of a studio visit doing `kind`, priced as a repair job would be (tax included); null
 * where the work is on a surface the piece's record has no size for (no price is made up for it).
 */
function visitPrice(studio: Studio, piece: PricedPiece, kind: CareTaskKind, products: (typeof finishProducts.$inferSelect)[]): number | null {
  const productIds = products.filter((p) => TASK_KIND_BY_FINISH_CLASS[p.finishClass] === kind).map((p) => p.id).slice(0, 1);
  const priced = priceJob(studio, piece, { title: "Care visit", tasks: [kind], repairs: [], productIds, coats: 1, travel: true, coveredPct: 0, notes: "" }, products);
  return priced.unsized.length ? null : priced.totalMinor;
}

/** The owner's own care log of the piece since `since` (lib/plans/savings reads the window). */
function ownerLogSince(db: Db, piece: Piece, ownerId: string, since: string): LoggedCare[] {
  return db
    .select({ taskKind: careLogEntries.taskKind, doneOn: careLogEntries.doneOn })
    .from(careLogEntries)
    .where(and(eq(careLogEntries.pieceId, piece.id), eq(careLogEntries.studioId, piece.studioId), eq(careLogEntries.userId, ownerId), gte(careLogEntries.doneOn, since)))
    .all();
}

/**
 * The studio's offered plans that fit the piece, with their price and — for an owner with a care log
 * of the piece — what each would have saved over the last year of it. `ownerId` null (a buyer not yet
 * registered): no saving is stated.
 */
export function fittingOffers(studio: Studio, piece: Piece, ownerId: string | null, now: Date, db: Db = getDb()): PlanOffer[] {
  const templates = templatesFitting(piece, db);
  if (templates.length === 0) return [];
  const today = localDate(now, studio.timeZone);
  const log = ownerId ? ownerLogSince(db, piece, ownerId, addDays(today, -LAST_YEAR_DAYS)) : [];
  let products: (typeof finishProducts.$inferSelect)[] | null = null;
  let priced: PricedPiece | null = null;
  const priceOfTask = (kind: CareTaskKind) => visitPrice(studio, (priced ??= pricedPiece(db, piece)), kind, (products ??= db.select().from(finishProducts).where(eq(finishProducts.studioId, studio.id)).all()));
  return templates.map((t): PlanOffer => {
    const price = planPrice(studio, t);
    const lastYear = lastYearSavings({ log, today, includedTasks: t.included.tasks, priceOfTask, planPerIntervalMinor: price.totalMinor, interval: t.interval });
    return { id: t.id, name: t.name, summary: t.summary, version: t.version, interval: t.interval, currency: t.currency, priceMinor: price.totalMinor, taxMinor: price.taxMinor, included: t.included, lastYear };
  });
}

/**
 * The fitting plans in the mails' words, none for a piece already under a plan (hand-over: no owner
 * yet, so no saving; refresh offer: the owner's own log).
 */
export function planLinesForMail(studio: Studio, piece: Piece, ownerId: string | null, now: Date, db: Db = getDb()): PlanOfferLine[] {
  if (livePlanOfPiece(piece.id)) return [];
  return planOfferLines(fittingOffers(studio, piece, ownerId, now, db), studio.country, studio.name);
}

/** planLinesForMail for a piece and studio known by id (the reminder delivery holds only ids). */
export function planLinesForPieceMail(pieceId: string, ownerId: string, now: Date, db: Db = getDb()): PlanOfferLine[] {
  const row = db.select({ piece: pieces, studio: studios }).from(pieces).innerJoin(studios, eq(studios.id, pieces.studioId)).where(eq(pieces.id, pieceId)).get();
  return row ? planLinesForMail(row.studio, row.piece, ownerId, now, db) : [];
}

/** The plan a piece is under now (running, in grace, or ending), or null. Callers have checked access to the piece. */
export function piecePlan(pieceId: string): PiecePlan | null {
  const live = livePlanOfPiece(pieceId);
  if (!live) return null;
  const { sub, template } = live;
  return {
    subscriptionId: sub.id,
    name: template.name,
    version: template.version,
    state: sub.state,
    stateLabel: PLAN_STATE_LABELS[sub.state],
    periodEnd: sub.periodEnd?.getTime() ?? null,
    paidBy: sub.paidBy,
    amountMinor: sub.amountMinor,
    currency: sub.currency,
    interval: template.interval,
    pricedAt: template.createdAt.getTime(),
    superseded: template.supersededAt !== null,
    included: template.included,
  };
}

/** For the owner's own piece (else 404): the plan it is under, and the plans that fit it. */
export function plansForMyPiece(owner: Pick<User, "id">, pieceId: string, now = new Date()): { current: PiecePlan | null; offers: PlanOffer[]; country: string } {
  const piece = ownedPieceRow(owner, pieceId);
  const studio = getDb().select().from(studios).where(eq(studios.id, piece.studioId)).get()!;
  const current = piecePlan(piece.id);
  if (current) return { current, offers: [], country: studio.country };
  return { current, offers: fittingOffers(studio, piece, owner.id, now), country: studio.country };
}
