// A piece under a plan changes hands (its owner releases it for a new owner, lib/owner/transfer.ts).
// The template's `transfers` setting decides:
//  - off (the default): the plan ends at the transfer; the refund rule applies as to a cancellation
//    made that day (lib/plans/refund.ts), paid back to the owner who paid, who is mailed.
//  - on: the plan stays with the piece for the rest of the period paid, for whoever registers it next,
//    and is not renewed on the former owner's card (Stripe: cancel at the period's end).
// Either way the move goes through moveSubscription under the plan's lock and is audited.
//
// Durable and safe to retry: the move, the refund claim and the step still to do at Stripe (transferStep:
// "stripe", then "refund" for a plan that ends) are written in the release's own transaction
// (recordPlanHandOver), so a crash right after the release commits leaves the work recorded for the
// scheduled pass, and a renewal Stripe charges meanwhile is paid back, not counted (lib/plans/stripe-sync.ts
// notOwed: the plan has ended, or has no owner). After the commit, finishPlanTransfer
// does what is left, each Stripe call with an idempotency key of the plan, and moves the step on only
// after Stripe answered. If Stripe fails, the plan shows what is left in plain words, and the next try
// (staff's "try again", or the scheduled pass every few minutes) finishes it: one move, one Stripe
// subscription, one refund, one mail.
import { and, desc, eq, inArray, isNotNull } from "drizzle-orm";
import { getDb, type Tx } from "@/db/client";
import { planSubscriptions, studios, type PlanSubscription } from "@/db/schema";
import { recordAudit } from "@/lib/audit";
import type { User } from "lucia";
import type { StudioActor } from "@/lib/auth/actor";
import { callStripe } from "@/lib/payments/stripe";
import { claimRefund, mailPlanEnding, monthsIn, payRefund, refundOf, refundQuote } from "./refund";
import { PLAN_COVERS, PLAN_FINAL } from "./states";
import { syncPlanSubscription, withPlanLock } from "./stripe-sync";
import { livePlanOfPiece, moveSubscription, studioSubscription } from "./subscriptions";
import { templateOf } from "./templates";

type TransferStep = NonNullable<PlanSubscription["transferStep"]>;

function auditChangedHands(tx: Tx, sub: PlanSubscription, fromOwnerId: string, data: Record<string, unknown>) {
  recordAudit(tx, { studioId: sub.studioId, actorId: fromOwnerId, action: "plan.changed_hands", subjectType: "plan_subscription", subjectId: sub.id, data: { ...data, fromOwnerId } });
}

export type PlanAfterTransfer = {
  outcome: "none" | "moved" | "ended";
  subscription: PlanSubscription | null;
  /** Plain words for the people involved while part of the change is still to finish at Stripe; null when done. */
  pending: string | null;
};

const reread = (id: string) => getDb().select().from(planSubscriptions).where(eq(planSubscriptions.id, id)).get()!;
const lockKey = (sub: PlanSubscription) => sub.stripeSubscriptionId ?? sub.id;

/** What releasing the piece now does to the plan its owner pays for on it, told before they release it. */
export type PlanOnRelease = {
  planName: string;
  /** The plan stays with the piece until `endsAt` for its next owner (not renewed); else it ends at the release. */
  moves: boolean;
  endsAt: number | null;
  refundMinor: number;
  months: number;
  currency: string;
  paidBy: PlanSubscription["paidBy"];
  country: string;
};

/** For the owner's release page: recordPlanHandOver's rule, read without changing anything; null when they pay for no plan on the piece. */
export function planOnRelease(owner: Pick<User, "id">, pieceId: string, now = new Date()): PlanOnRelease | null {
  const live = livePlanOfPiece(pieceId);
  if (!live || live.sub.ownerId !== owner.id) return null;
  const { sub, template } = live;
  const country = getDb().select({ country: studios.country }).from(studios).where(eq(studios.id, sub.studioId)).get()!.country;
  const base = { planName: template.name, currency: sub.currency, paidBy: sub.paidBy, country };
  if (template.transfers) return { ...base, moves: true, endsAt: (sub.endsAt ?? sub.periodEnd)?.getTime() ?? null, refundMinor: 0, months: 0 };
  const q = refundQuote(sub, template, now, true);
  return { ...base, moves: false, endsAt: q.endsAt.getTime(), refundMinor: q.refundMinor, months: q.months };
}

/**
 * Runs `release` (the release's transaction, which calls recordPlanHandOver) once no sync, cancellation
 * or hand-over of the piece's plan is in flight in this process (lib/plans/stripe-sync.ts withPlanLock),
 * so none of them reads the plan before the release and writes after it. Across processes the plan's
 * version column holds (moveSubscription).
 */
export function underPiecePlanLock<T>(pieceId: string, release: () => T): Promise<T> {
  const live = livePlanOfPiece(pieceId);
  return live ? withPlanLock(lockKey(live.sub), async () => release()) : Promise.resolve().then(release);
}

/**
 * Written inside the release's transaction (lib/owner/transfer.ts): the plan `fromOwnerId` pays for on
 * the piece moves or ends by its template's setting, the refund its rule gives is claimed (unless a
 * cancellation already claimed one: one refund per plan), and the step left at Stripe is recorded.
 * Null when they pay for no plan on the piece. finishPlanHandOver does the rest after the commit.
 */
export function recordPlanHandOver(tx: Tx, pieceId: string, fromOwnerId: string, now = new Date()): PlanSubscription | null {
  const fresh = tx
    .select()
    .from(planSubscriptions)
    .where(and(eq(planSubscriptions.pieceId, pieceId), eq(planSubscriptions.ownerId, fromOwnerId), inArray(planSubscriptions.state, [...PLAN_COVERS])))
    .orderBy(desc(planSubscriptions.createdAt))
    .get();
  if (!fresh) return null;
  const template = templateOf(fresh.studioId, fresh.templateId);
  const by = { actorId: fromOwnerId, source: "owner" } as const;
  const byCard = fresh.paidBy === "card" && Boolean(fresh.stripeSubscriptionId);
  if (template.transfers) {
    // A plan already cancelled keeps the end it was given; otherwise it isn't renewed on the former owner's card.
    const transferStep = byCard && fresh.state !== "ending" ? ("stripe" as const) : null;
    const next = moveSubscription(tx, fresh, fresh.state === "grace" ? "grace" : "ending", { ownerId: null, endsAt: fresh.endsAt ?? fresh.periodEnd, transferStep }, by);
    auditChangedHands(tx, fresh, fromOwnerId, { moves: true, endsAt: next.endsAt?.toISOString() ?? null });
    return next;
  }
  // The plan ends today, with the refund its rule gives for the months left.
  const quote = refundQuote(fresh, template, now, true);
  const next = moveSubscription(tx, fresh, "ended", { endedAt: now, endsAt: now, transferStep: byCard ? "stripe" : "refund" }, by);
  auditChangedHands(tx, fresh, fromOwnerId, { moves: false, refundMinor: quote.refundMinor });
  if (!refundOf(fresh.id, tx)) claimRefund(tx, fresh, quote, "changed_hands", fromOwnerId);
  return next;
}

/** After the release committed: what is left at Stripe, the refund and the mail; a failure leaves the step recorded for the pass. */
export async function finishPlanHandOver(recorded: PlanSubscription | null): Promise<PlanAfterTransfer> {
  if (!recorded) return { outcome: "none", subscription: null, pending: null };
  let subscription: PlanSubscription;
  try {
    subscription = await finishPlanTransfer(recorded.id);
  } catch (e) {
    console.error("plan after transfer: Stripe step failed; it is tried again by the plan transfer pass", e);
    subscription = reread(recorded.id);
  }
  return { outcome: recorded.state === "ended" ? "ended" : "moved", subscription, pending: transferPendingWords(subscription) };
}

/** Moves the step on only from the one it was at (a racing try in another process moves it once). */
function advance(sub: PlanSubscription, from: TransferStep, to: TransferStep | null): PlanSubscription | undefined {
  return getDb().transaction((tx) => {
    const next = tx
      .update(planSubscriptions)
      .set({ transferStep: to, updatedAt: new Date() })
      .where(and(eq(planSubscriptions.id, sub.id), eq(planSubscriptions.transferStep, from)))
      .returning()
      .get();
    if (next && to === null) recordAudit(tx, { studioId: sub.studioId, actorId: null, action: "plan.transfer_finished", subjectType: "plan_subscription", subjectId: sub.id, data: {} });
    return next;
  });
}

/**
 * Does what is left of a plan's change of hands: tells Stripe (stop renewing a plan that moves, end one
 * that ends), then pays the refund claimed and mails the former owner. Each step runs once: Stripe calls
 * carry the plan's idempotency key, the refund is keyed by its claim, and the step moves on only from
 * where it was. Throws (503/409, plain words) when Stripe fails; the step stays for the next try.
 */
export async function finishPlanTransfer(subId: string): Promise<PlanSubscription> {
  const first = reread(subId);
  if (!first.transferStep) return first;
  const template = templateOf(first.studioId, first.templateId);
  await withPlanLock(lockKey(first), async () => {
    let sub: PlanSubscription | undefined = reread(subId);
    if (sub.transferStep === "stripe") {
      const id = sub.stripeSubscriptionId!;
      const key = { idempotencyKey: `plan-transfer-${sub.id}` };
      if (!template.transfers) await callStripe("end the plan", (s) => s.subscriptions.cancel(id, {}, key), sub);
      // A moved plan that has ended at Stripe meanwhile has nothing left to stop. One whose end has
      // passed (Stripe renewed before it was told; that renewal is paid back, lib/plans/stripe-sync.ts)
      // ends at Stripe now rather than at the end of a period nobody paid for.
      else if (!PLAN_FINAL.includes(sub.state) && sub.endsAt && sub.endsAt <= new Date()) await callStripe("end the plan", (s) => s.subscriptions.cancel(id, {}, key), sub);
      else if (!PLAN_FINAL.includes(sub.state)) await callStripe("stop renewing the plan", (s) => s.subscriptions.update(id, { cancel_at_period_end: true }, key), sub);
      sub = advance(sub, "stripe", template.transfers ? null : "refund");
    }
    if (sub?.transferStep === "refund") {
      const claim = refundOf(sub.id);
      const paid = claim ? await payRefund(claim, sub) : null;
      const done = advance(sub, "refund", null);
      if (done) {
        const endsAt = done.endsAt ?? done.endedAt ?? new Date();
        const quote = { rule: template.refundRule, endsAt, months: paid?.months ?? 0, monthsInPeriod: monthsIn(template), refundMinor: paid?.amountMinor ?? 0, currency: done.currency };
        await mailPlanEnding(done, quote, paid, "changed_hands");
      }
    }
  });
  const after = reread(subId);
  if (!after.transferStep && after.stripeSubscriptionId) await syncPlanSubscription(after.stripeSubscriptionId, undefined, after);
  return reread(subId);
}

/** Plain words for staff (and the people involved) while a change of hands is unfinished; null when nothing is left. */
export function transferPendingWords(sub: Pick<PlanSubscription, "transferStep" | "state">): string | null {
  if (sub.transferStep === "stripe" && sub.state !== "ended")
    return "This plan is moving with its piece to the next owner, but the payment service hasn't confirmed yet that it will stop renewing on the former owner's card. We try again every few minutes; nothing is charged twice.";
  if (sub.transferStep === "stripe") return "This plan ended when its piece changed hands, but the payment service hasn't confirmed the end yet. We try again every few minutes; nothing is charged or paid back twice.";
  if (sub.transferStep === "refund") return "This plan ended when its piece changed hands; the refund to the former owner is still being paid. We try again every few minutes; it is paid once.";
  return null;
}

/** Staff try again now to finish a plan's change of hands. */
export async function finishStudioPlanTransfer(ctx: StudioActor, subscriptionId: string): Promise<{ subscription: PlanSubscription; pending: string | null }> {
  const sub = studioSubscription(ctx.studio.id, subscriptionId);
  const subscription = await finishPlanTransfer(sub.id);
  return { subscription, pending: transferPendingWords(subscription) };
}

/** The scheduled pass: finishes every change of hands left unfinished (each on its own; one failing doesn't stop the rest). */
export async function finishPlanTransfers(): Promise<{ finished: string[]; failed: string[] }> {
  const open = getDb().select({ id: planSubscriptions.id }).from(planSubscriptions).where(isNotNull(planSubscriptions.transferStep)).all();
  const finished: string[] = [];
  const failed: string[] = [];
  for (const { id } of open) {
    try {
      if (!(await finishPlanTransfer(id)).transferStep) finished.push(id);
      else failed.push(id);
    } catch (e) {
      console.error(`plan transfer pass: ${id} not finished yet`, e);
      failed.push(id);
    }
  }
  return { finished, failed };
}
