// The overview's care plan figures: plans running, renewals due in the next 30 days, plans lapsed in
// the last 12 months, and plan revenue by month (counted payments only, less what was paid back of a
// held payment staff kept; by the month paid, studio zone).
import { and, desc, eq, gte, inArray, lte, type SQL } from "drizzle-orm";
import { getDb } from "@/db/client";
import { pieces, planInvoices, planSubscriptions, planTemplates, users } from "@/db/schema";
import type { StudioActor } from "@/lib/auth/actor";
import { addMonths, localDate } from "@/lib/care/dates";
import { plansWithHeldPayment } from "./held";
import { PLAN_FINAL, PLAN_STATE_LABELS } from "./states";

const DAY = 86_400_000;
export const RENEWAL_WINDOW_DAYS = 30;

export function planOverview(ctx: StudioActor, now = new Date()) {
  const db = getDb();
  const studioId = ctx.studio.id;
  const subs = db.select({ state: planSubscriptions.state, periodEnd: planSubscriptions.periodEnd, lapsedAt: planSubscriptions.lapsedAt }).from(planSubscriptions).where(eq(planSubscriptions.studioId, studioId)).all();
  const yearAgo = new Date(now.getTime() - 365 * DAY);
  const running = subs.filter((s) => s.state === "running" || s.state === "grace" || s.state === "ending").length;
  const renewalsDue = subs.filter((s) => s.state === "running" && s.periodEnd && s.periodEnd.getTime() <= now.getTime() + RENEWAL_WINDOW_DAYS * DAY).length;
  const lapsed = subs.filter((s) => s.state === "lapsed" && s.lapsedAt && s.lapsedAt >= yearAgo).length;
  const inGrace = subs.filter((s) => s.state === "grace").length;
  const today = localDate(now, ctx.studio.timeZone);
  const months = Array.from({ length: 12 }, (_, i) => addMonths(`${today.slice(0, 7)}-01`, i - 11).slice(0, 7));
  const paid = db
    .select({ amountMinor: planInvoices.amountMinor, refundedMinor: planInvoices.heldRefundedMinor, at: planInvoices.at })
    .from(planInvoices)
    .where(and(eq(planInvoices.studioId, studioId), eq(planInvoices.status, "paid"), eq(planInvoices.counts, true), gte(planInvoices.at, new Date(Date.parse(`${months[0]}-01T00:00:00Z`) - 2 * DAY))))
    .all();
  const byMonth = new Map(months.map((m) => [m, 0]));
  for (const p of paid) {
    const m = localDate(p.at, ctx.studio.timeZone).slice(0, 7);
    // A held payment staff kept with the difference paid back counts at what was kept.
    if (byMonth.has(m)) byMonth.set(m, byMonth.get(m)! + p.amountMinor - p.refundedMinor);
  }
  const revenue = months.map((month) => ({ month, amountMinor: byMonth.get(month)! }));
  return { running, renewalsDue, lapsed, inGrace, revenue, totalMinor: revenue.reduce((s, r) => s + r.amountMinor, 0), currency: ctx.studio.currency };
}

function studioPlanRows(ctx: StudioActor, where: SQL | undefined, limit: number) {
  const rows = getDb()
    .select({ id: planSubscriptions.id, state: planSubscriptions.state, paidBy: planSubscriptions.paidBy, periodEnd: planSubscriptions.periodEnd, amountMinor: planSubscriptions.amountMinor, currency: planSubscriptions.currency, planName: planTemplates.name, interval: planTemplates.interval, pricedAt: planTemplates.createdAt, supersededAt: planTemplates.supersededAt, pieceId: pieces.id, pieceTitle: pieces.title, ownerName: users.name })
    .from(planSubscriptions)
    .innerJoin(planTemplates, eq(planTemplates.id, planSubscriptions.templateId))
    .innerJoin(pieces, eq(pieces.id, planSubscriptions.pieceId))
    .leftJoin(users, eq(users.id, planSubscriptions.ownerId))
    .where(and(eq(planSubscriptions.studioId, ctx.studio.id), where))
    .orderBy(desc(planSubscriptions.createdAt), desc(planSubscriptions.id))
    .limit(limit)
    .all();
  const held = plansWithHeldPayment(rows.map((r) => r.id));
  return rows.map(({ supersededAt, ...r }) => ({ ...r, superseded: supersededAt !== null, stateLabel: held.has(r.id) && !PLAN_FINAL.includes(r.state) ? `${PLAN_STATE_LABELS[r.state]}, ${r.state === "awaiting_payment" ? "a payment" : "renewal payment"} held for you to check` : PLAN_STATE_LABELS[r.state] }));
}

export type StudioPlanRow = ReturnType<typeof studioPlanRows>[number];

/** Every plan of the studio for the plans list (staff), newest first (the newest 500). */
export function listStudioPlans(ctx: StudioActor, filter: { renewalsDue?: boolean } = {}, now = new Date()): StudioPlanRow[] {
  const which = filter.renewalsDue
    ? and(eq(planSubscriptions.state, "running"), lte(planSubscriptions.periodEnd, new Date(now.getTime() + RENEWAL_WINDOW_DAYS * DAY)))
    : inArray(planSubscriptions.state, ["running", "grace", "ending", "lapsed", "ended"]);
  return studioPlanRows(ctx, which, 500);
}

/** One plan of the studio, as the list shows it (its own page); another studio's is undefined. */
export function studioPlanRow(ctx: StudioActor, subscriptionId: string): StudioPlanRow | undefined {
  return studioPlanRows(ctx, eq(planSubscriptions.id, subscriptionId), 1)[0];
}
