// What an owner sees of plans for one of their pieces: the plan it is under, or the plans that fit
// it with their price (the studio's tax) and what the plan would have saved them over the last year
// of their own care log, priced at the studio's prices (lib/repairs priceJob) — computed, not claimed.
import { and, eq, gte } from "drizzle-orm";
import type { User } from "lucia";
import { getDb } from "@/db/client";
import { careLogEntries, finishProducts, studios, type Piece, type PlanTemplate, type Studio } from "@/db/schema";
import { addDays, localDate } from "@/lib/care/dates";
import { TASK_KIND_BY_FINISH_CLASS, type CareTaskKind } from "@/lib/care/vocabulary";
import { ownedPieceRow } from "@/lib/owner/pieces";
import { priceJob } from "@/lib/repairs/pricing";
import { PLAN_STATE_LABELS, type PlanState } from "./states";
import { livePlanOfPiece } from "./subscriptions";
import { planPrice } from "./price";
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
  lastYear: { entries: number; wouldHaveCostMinor: number; planYearMinor: number; savedMinor: number } | null;
};

export type PiecePlan = { subscriptionId: string; name: string; version: number; state: PlanState; stateLabel: string; periodEnd: number | null; paidBy: "card" | "other" };

/** The one-off price of a studio visit doing `kind`, priced as a repair job would be. */
function visitPrice(studio: Studio, piece: Piece, kind: CareTaskKind, products: (typeof finishProducts.$inferSelect)[]): number {
  const productIds = products.filter((p) => TASK_KIND_BY_FINISH_CLASS[p.finishClass] === kind).map((p) => p.id).slice(0, 1);
  return priceJob(studio, piece, { title: "Care visit", tasks: [kind], repairs: [], productIds, coats: 1, travel: true, coveredPct: 0, notes: "" }, products).totalMinor;
}

function lastYearOf(studio: Studio, piece: Piece, t: PlanTemplate, ownerId: string, now: Date): PlanOffer["lastYear"] {
  const db = getDb();
  const since = addDays(localDate(now, studio.timeZone), -365);
  const entries = db
    .select({ taskKind: careLogEntries.taskKind })
    .from(careLogEntries)
    .where(and(eq(careLogEntries.pieceId, piece.id), eq(careLogEntries.studioId, piece.studioId), eq(careLogEntries.userId, ownerId), gte(careLogEntries.doneOn, since)))
    .all()
    .filter((e) => t.included.tasks.includes(e.taskKind));
  if (entries.length === 0) return null;
  const products = db.select().from(finishProducts).where(eq(finishProducts.studioId, studio.id)).all();
  const wouldHaveCostMinor = entries.reduce((sum, e) => sum + visitPrice(studio, piece, e.taskKind, products), 0);
  const perInterval = planPrice(studio, t).totalMinor;
  const planYearMinor = t.interval === "month" ? perInterval * 12 : perInterval;
  return { entries: entries.length, wouldHaveCostMinor, planYearMinor, savedMinor: wouldHaveCostMinor - planYearMinor };
}

/** The plan a piece is under now (running, in grace, or ending), or null. Callers have checked access to the piece. */
export function piecePlan(pieceId: string): PiecePlan | null {
  const live = livePlanOfPiece(pieceId);
  if (!live) return null;
  const { sub, template } = live;
  return { subscriptionId: sub.id, name: template.name, version: template.version, state: sub.state, stateLabel: PLAN_STATE_LABELS[sub.state], periodEnd: sub.periodEnd?.getTime() ?? null, paidBy: sub.paidBy };
}

/** For the owner's own piece (else 404): the plan it is under, and the plans that fit it. */
export function plansForMyPiece(owner: Pick<User, "id">, pieceId: string, now = new Date()): { current: PiecePlan | null; offers: PlanOffer[]; country: string } {
  const piece = ownedPieceRow(owner, pieceId);
  const studio = getDb().select().from(studios).where(eq(studios.id, piece.studioId)).get()!;
  const current = piecePlan(piece.id);
  if (current) return { current, offers: [], country: studio.country };
  const offers = templatesFitting(piece).map((t): PlanOffer => {
    const price = planPrice(studio, t);
    return { id: t.id, name: t.name, summary: t.summary, version: t.version, interval: t.interval, currency: t.currency, priceMinor: price.totalMinor, taxMinor: price.taxMinor, included: t.included, lastYear: lastYearOf(studio, piece, t, owner.id, now) };
  });
  return { current, offers, country: studio.country };
}
