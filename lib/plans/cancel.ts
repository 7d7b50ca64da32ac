// Cancelling a plan, by staff or by the owner, and taking the cancellation back. A cancelled plan runs
// to the end its template's refund rule gives (lib/plans/refund.ts: the period's end, or the end of
// the plan month in progress with the unused months paid back).
//
// Money moves only when the plan version and refund amount the person confirmed are still the current
// ones: the check, the move to "ending" and the refund claim are one transaction (the version column
// and the one refund per plan make a racing second cancellation a 409 in any process), and the whole
// cancellation runs under the plan's lock (withPlanLock) so a Stripe event for the same plan is synced
// before or after it, never in between. Stripe is told after the claim; if Stripe refuses, the claim
// is undone and nothing was paid.
import { and, eq } from "drizzle-orm";
import type { User } from "lucia";
import { z } from "zod";
import { getDb } from "@/db/client";
import { planInvoices, planRefunds, planSubscriptions, studios, users, type PlanSubscription } from "@/db/schema";
import type { StudioActor } from "@/lib/auth/actor";
import { conflict, isAppError, notFound } from "@/lib/errors";
import { formatMoney } from "@/lib/format/money";
import { callStripe } from "@/lib/payments/stripe";
import { claimRefund, mailPlanEnding, payRefund, refundByStudio, refundOf, refundQuote, refundRefusedForStaff, type RefundQuote } from "./refund";
import { PLAN_STATE_LABELS } from "./states";
import { syncPlanSubscription, withPlanLock } from "./stripe-sync";
import { livePlanOfPiece, moveSubscription, studioSubscription, type PlanMover } from "./subscriptions";
import { templateOf } from "./templates";
import { transferPendingWords } from "./transfer";
import { heldForOwner, heldForStaff } from "./held";

/** What the person confirmed: the plan's version and the refund they were shown (minor units). */
export const cancelAskSchema = z.object({
  version: z.number({ error: "Reload the page: the plan's version is missing." }).int().min(0),
  refundMinor: z.number({ error: "Reload the page: the refund shown is missing." }).int().min(0),
});
export type CancelAsk = z.infer<typeof cancelAskSchema>;
export const keepAskSchema = cancelAskSchema.pick({ version: true });

export type CancelPreview = {
  subscriptionId: string;
  version: number;
  state: PlanSubscription["state"];
  quote: RefundQuote | null;
  canUndo: boolean;
};

const CANCELLABLE: readonly PlanSubscription["state"][] = ["running", "grace"];

/** What cancelling the plan now would give (null when it can't be cancelled), and whether a cancellation can be taken back. */
export function cancelPreview(sub: PlanSubscription, now = new Date()): CancelPreview {
  const template = templateOf(sub.studioId, sub.templateId);
  const quote = CANCELLABLE.includes(sub.state) ? refundQuote(sub, template, now) : null;
  // A plan that passed on with its piece (no owner, lib/plans/transfer.ts) isn't renewed on the former owner's card: it can't be kept.
  const canUndo = sub.state === "ending" && sub.ownerId !== null && !refundOf(sub.id) && (sub.endsAt ?? sub.periodEnd ?? now) > now;
  return {
    subscriptionId: sub.id,
    version: sub.version,
    state: sub.state,
    quote,
    canUndo,
  };
}

const lockKey = (sub: PlanSubscription) => sub.stripeSubscriptionId ?? sub.id;
const reread = (id: string) => getDb().select().from(planSubscriptions).where(eq(planSubscriptions.id, id)).get()!;

async function cancel(subId: string, ask: CancelAsk, by: PlanMover, now: Date): Promise<PlanSubscription> {
  const first = reread(subId);
  return withPlanLock(lockKey(first), async () => {
    const template = templateOf(first.studioId, first.templateId);
    // 1. Check what was confirmed, move to "ending" and claim the refund: one transaction.
    const { before, sub, quote, refund } = getDb().transaction((tx) => {
      const fresh = tx.select().from(planSubscriptions).where(eq(planSubscriptions.id, subId)).get()!;
      if (fresh.version !== ask.version) throw conflict("The plan changed since this page was opened. Reload to see it as it is now.", { code: "plan_changed" });
      if (!CANCELLABLE.includes(fresh.state)) throw conflict(`A plan that is ${PLAN_STATE_LABELS[fresh.state].toLowerCase()} can't be cancelled.`);
      const quote = refundQuote(fresh, template, now);
      if (quote.refundMinor !== ask.refundMinor) {
        throw conflict(`The refund for cancelling now is ${formatMoney(quote.refundMinor, quote.currency)}, not what was shown. Reload and confirm again.`, { code: "refund_changed" });
      }
      const sub = moveSubscription(tx, fresh, "ending", { endsAt: quote.endsAt }, by);
      const refund = claimRefund(tx, fresh, quote, "cancelled", by.actorId);
      return { before: fresh, sub, quote, refund };
    });
    // 2. Tell Stripe when the plan ends; if it refuses, take the claim back (nothing was paid).
    if (sub.paidBy === "card" && sub.stripeSubscriptionId) {
      const endsAtPeriodEnd = quote.endsAt.getTime() === sub.periodEnd?.getTime();
      try {
        await callStripe("cancel the plan", (s) =>
          s.subscriptions.update(sub.stripeSubscriptionId!, endsAtPeriodEnd ? { cancel_at_period_end: true } : { cancel_at: Math.floor(quote.endsAt.getTime() / 1000) }, {
            idempotencyKey: `plan-cancel-${sub.id}-${before.version}`,
          }),
          sub,
        );
      } catch (e) {
        getDb().transaction((tx) => {
          if (refund) tx.delete(planRefunds).where(eq(planRefunds.id, refund.id)).run();
          const cur = tx.select().from(planSubscriptions).where(eq(planSubscriptions.id, sub.id)).get()!;
          if (cur.version === sub.version) moveSubscription(tx, cur, before.state, { endsAt: before.endsAt }, by);
        });
        throw e;
      }
    }
    // 3. Pay the refund (idempotent on the claim) and mail the owner once it is all committed. The plan
    // is cancelled at Stripe by now: if the refund can't be asked for, the cancellation stands and the
    // claim stays owed for the scheduled pass (lib/plans/refund.ts finishRequestedPlanRefunds).
    const paid = refund
      ? await payRefund(refund, sub).catch((e: unknown) => {
          if (!isAppError(e)) throw e;
          console.error("plan cancel: the refund is left for the refund pass", e);
          return refund;
        })
      : null;
    await mailPlanEnding(sub, quote, paid, "cancelled");
    return reread(sub.id);
  }).then(async (sub) => (sub.stripeSubscriptionId ? ((await syncPlanSubscription(sub.stripeSubscriptionId, undefined, sub)) ?? sub) : sub));
}

/** Takes a cancellation back before the plan ends: only while nothing has been refunded for it. */
async function undo(subId: string, ask: Pick<CancelAsk, "version">, by: PlanMover, now: Date): Promise<PlanSubscription> {
  const first = reread(subId);
  return withPlanLock(lockKey(first), async () => {
    const { before, sub } = getDb().transaction((tx) => {
      const fresh = tx.select().from(planSubscriptions).where(eq(planSubscriptions.id, subId)).get()!;
      if (fresh.version !== ask.version) throw conflict("The plan changed since this page was opened. Reload to see it as it is now.", { code: "plan_changed" });
      if (fresh.state !== "ending") throw conflict("Only a cancelled plan that hasn't ended yet can be kept.");
      if ((fresh.endsAt ?? fresh.periodEnd ?? now) <= now) throw conflict("This plan has already ended.");
      if (fresh.ownerId === null) throw conflict("This plan passed on with its piece when it changed hands: it runs to the end of the period paid and can't be renewed on the former owner's card. Once it ends, the new owner can start a plan of their own.");
      if (refundOf(fresh.id, tx)) throw conflict("Part of this plan has been paid back, so the cancellation can't be taken back. A new plan can be started instead.");
      return {
        before: fresh,
        sub: moveSubscription(tx, fresh, "running", { endsAt: null }, by),
      };
    });
    if (sub.paidBy === "card" && sub.stripeSubscriptionId) {
      try {
        await callStripe("keep the plan", (s) =>
          s.subscriptions.update(sub.stripeSubscriptionId!, { cancel_at_period_end: false, cancel_at: "" }, { idempotencyKey: `plan-keep-${sub.id}-${before.version}` }),
          sub,
        );
      } catch (e) {
        getDb().transaction((tx) => {
          const cur = tx.select().from(planSubscriptions).where(eq(planSubscriptions.id, sub.id)).get()!;
          if (cur.version === sub.version) moveSubscription(tx, cur, "ending", { endsAt: before.endsAt }, by);
        });
        throw e;
      }
    }
    return reread(sub.id);
  }).then(async (sub) => (sub.stripeSubscriptionId ? ((await syncPlanSubscription(sub.stripeSubscriptionId, undefined, sub)) ?? sub) : sub));
}

/** The owner's own plan by id (a plan of a piece they no longer hold, or someone else's, is a 404). */
export function myPlan(user: Pick<User, "id">, subId: string): PlanSubscription {
  const sub = getDb().select().from(planSubscriptions).where(eq(planSubscriptions.id, subId)).get();
  if (!sub || sub.ownerId !== user.id) throw notFound("No such plan among yours.");
  return sub;
}

/** Staff cancel a plan of their studio, confirming the version and refund they were shown. */
export async function cancelPlanAtPeriodEnd(ctx: StudioActor, subscriptionId: string, ask: CancelAsk, now = new Date()): Promise<PlanSubscription> {
  const sub = studioSubscription(ctx.studio.id, subscriptionId);
  return cancel(sub.id, ask, { actorId: ctx.user.id, source: "staff" }, now);
}

/** Staff take a cancellation back. */
export async function keepStudioPlan(ctx: StudioActor, subscriptionId: string, ask: Pick<CancelAsk, "version">, now = new Date()): Promise<PlanSubscription> {
  const sub = studioSubscription(ctx.studio.id, subscriptionId);
  return undo(sub.id, ask, { actorId: ctx.user.id, source: "staff" }, now);
}

/** The owner cancels their own plan, confirming the version and refund they were shown. */
export async function cancelMyPlan(user: Pick<User, "id">, subscriptionId: string, ask: CancelAsk, now = new Date()): Promise<PlanSubscription> {
  const sub = myPlan(user, subscriptionId);
  return cancel(sub.id, ask, { actorId: user.id, source: "owner" }, now);
}

/** The owner takes their cancellation back before the plan ends. */
export async function keepMyPlan(user: Pick<User, "id">, subscriptionId: string, ask: Pick<CancelAsk, "version">, now = new Date()): Promise<PlanSubscription> {
  const sub = myPlan(user, subscriptionId);
  return undo(sub.id, ask, { actorId: user.id, source: "owner" }, now);
}

export type HeldPayment = { stripeInvoiceId: string | null; amountMinor: number; currency: string; at: number };

/** Staff's view of one plan: the plan, what cancelling now gives, its refund, and payments held because their amount wasn't the plan's. */
export function studioPlanDetail(ctx: StudioActor, subscriptionId: string, now = new Date()) {
  const sub = studioSubscription(ctx.studio.id, subscriptionId);
  const held: HeldPayment[] = getDb()
    .select({ stripeInvoiceId: planInvoices.stripeInvoiceId, amountMinor: planInvoices.amountMinor, currency: planInvoices.currency, at: planInvoices.at })
    .from(planInvoices)
    .where(and(eq(planInvoices.subscriptionId, sub.id), eq(planInvoices.status, "paid"), eq(planInvoices.counts, false)))
    .all()
    .map((r) => ({ ...r, at: r.at.getTime() }));
  const refund = refundOf(sub.id) ?? null;
  return {
    subscription: sub,
    cancel: cancelPreview(sub, now),
    refund,
    refundRefused: refundRefusedForStaff(refund, ctx.studio.country, ctx.studio.timeZone),
    heldPayments: held,
    held: heldForStaff(sub, ctx.studio.timeZone),
    transferPending: transferPendingWords(sub),
  };
}

export type OwnerPlanControl = {
  subscriptionId: string;
  planName: string;
  state: PlanSubscription["state"];
  version: number;
  endsAt: number | null;
  quote: { endsAt: number; refundMinor: number; months: number; monthsInPeriod: number; currency: string; rule: RefundQuote["rule"] } | null;
  canUndo: boolean;
  refundedMinor: number | null;
  /** Who pays the refund back: the card it was paid with, or the studio (a plan paid by other means, or a card refund the payment service refused). */
  refundBy: "card" | "studio" | null;
  paidBy: PlanSubscription["paidBy"];
  /** Plain words when a renewal payment is held for the studio to check (what happened, what happens next); else null. */
  held: string | null;
  /** The studio's country, for writing money. */
  country: string;
};

/** The owner's time zone, else their studio's. */
function ownerZone(userId: string, studioId: string): string {
  const db = getDb();
  return db.select({ zone: users.timeZone }).from(users).where(eq(users.id, userId)).get()?.zone || db.select({ zone: studios.timeZone }).from(studios).where(eq(studios.id, studioId)).get()!.zone;
}

/** For the owner's piece page: their live plan on the piece (else null) with what cancelling it now gives. */
export function myPlanControl(user: Pick<User, "id">, pieceId: string, now = new Date()): OwnerPlanControl | null {
  const live = livePlanOfPiece(pieceId);
  if (!live || live.sub.ownerId !== user.id) return null;
  const { sub, template } = live;
  const preview = cancelPreview(sub, now);
  const q = preview.quote;
  const refund = refundOf(sub.id);
  return {
    subscriptionId: sub.id,
    planName: template.name,
    state: sub.state,
    version: sub.version,
    endsAt: (sub.endsAt ?? sub.periodEnd)?.getTime() ?? null,
    quote: q ? { endsAt: q.endsAt.getTime(), refundMinor: q.refundMinor, months: q.months, monthsInPeriod: q.monthsInPeriod, currency: q.currency, rule: q.rule } : null,
    canUndo: preview.canUndo,
    refundedMinor: refund?.amountMinor ?? null,
    refundBy: refund ? (refundByStudio(refund) ? "studio" : "card") : null,
    paidBy: sub.paidBy,
    held: heldForOwner(sub, ownerZone(user.id, sub.studioId)),
    country: getDb().select({ country: studios.country }).from(studios).where(eq(studios.id, sub.studioId)).get()!.country,
  };
}
