// A piece under a plan changes hands (its owner releases it for a new owner; lib/owner/transfer.ts
// calls this once, after the release is committed). The template's `transfers` setting decides:
//  - off (the default): the plan ends at the transfer; the refund rule applies as to a cancellation
//    made that day (lib/plans/refund.ts), paid back to the owner who paid, who is mailed.
//  - on: the plan stays with the piece for the rest of the period paid, for whoever registers it next,
//    and is not renewed on the former owner's card (Stripe: cancel at the period's end).
// Either way the move goes through moveSubscription under the plan's lock and is audited.
import { eq } from "drizzle-orm";
import { getDb, type Db } from "@/db/client";
import { planSubscriptions, type PlanSubscription } from "@/db/schema";
import { recordAudit } from "@/lib/audit";
import { callStripe } from "@/lib/payments/stripe";
import { claimRefund, mailPlanEnding, payRefund, refundQuote } from "./refund";
import { syncPlanSubscription, withPlanLock } from "./stripe-sync";
import { livePlanOfPiece, moveSubscription } from "./subscriptions";

type Tx = Parameters<Parameters<Db["transaction"]>[0]>[0];

function auditChangedHands(tx: Tx, sub: PlanSubscription, fromOwnerId: string, data: Record<string, unknown>) {
  recordAudit(tx, { studioId: sub.studioId, actorId: fromOwnerId, action: "plan.changed_hands", subjectType: "plan_subscription", subjectId: sub.id, data: { ...data, fromOwnerId } });
}

export type PlanAfterTransfer = {
  outcome: "none" | "moved" | "ended";
  subscription: PlanSubscription | null;
};

export async function planFollowsTransfer(pieceId: string, fromOwnerId: string, now = new Date()): Promise<PlanAfterTransfer> {
  const live = livePlanOfPiece(pieceId);
  if (!live || live.sub.ownerId !== fromOwnerId) return { outcome: "none", subscription: null };
  const { template } = live;
  const by = { actorId: fromOwnerId, source: "owner" } as const;
  const reread = () => getDb().select().from(planSubscriptions).where(eq(planSubscriptions.id, live.sub.id)).get()!;
  try {
    return await withPlanLock(live.sub.stripeSubscriptionId ?? live.sub.id, async () => {
      if (template.transfers) {
        const moved = getDb().transaction((tx) => {
          const fresh = tx.select().from(planSubscriptions).where(eq(planSubscriptions.id, live.sub.id)).get()!;
          const next = moveSubscription(tx, fresh, fresh.state === "grace" ? "grace" : "ending", { ownerId: null, endsAt: fresh.endsAt ?? fresh.periodEnd }, by);
          auditChangedHands(tx, fresh, fromOwnerId, { moves: true, endsAt: next.endsAt?.toISOString() ?? null });
          return next;
        });
        // A plan already cancelled keeps the end it was given; otherwise it isn't renewed on the former owner's card.
        if (moved.paidBy === "card" && moved.stripeSubscriptionId && live.sub.state !== "ending") {
          await callStripe("stop renewing the plan", (s) => s.subscriptions.update(moved.stripeSubscriptionId!, { cancel_at_period_end: true }, { idempotencyKey: `plan-transfer-${moved.id}` }), moved);
        }
        return { outcome: "moved" as const, subscription: reread() };
      }
      // The plan ends today, with the refund its rule gives for the months left.
      const { sub, quote, refund } = getDb().transaction((tx) => {
        const fresh = tx.select().from(planSubscriptions).where(eq(planSubscriptions.id, live.sub.id)).get()!;
        const quote = refundQuote(fresh, template, now, true);
        const sub = moveSubscription(tx, fresh, "ended", { endedAt: now, endsAt: now }, by);
        auditChangedHands(tx, fresh, fromOwnerId, { moves: false, refundMinor: quote.refundMinor });
        return {
          sub,
          quote,
          refund: claimRefund(tx, fresh, quote, "changed_hands", fromOwnerId),
        };
      });
      if (sub.paidBy === "card" && sub.stripeSubscriptionId) {
        await callStripe("end the plan", (s) => s.subscriptions.cancel(sub.stripeSubscriptionId!, {}, { idempotencyKey: `plan-transfer-${sub.id}` }), sub);
      }
      const paid = refund ? await payRefund(refund, sub) : null;
      await mailPlanEnding(sub, quote, paid, "changed_hands");
      return { outcome: "ended" as const, subscription: reread() };
    }).then(async (r) => {
      if (r.subscription?.stripeSubscriptionId) await syncPlanSubscription(r.subscription.stripeSubscriptionId, undefined, r.subscription);
      return { ...r, subscription: reread() };
    });
  } catch (e) {
    // The piece has changed hands already; what Stripe couldn't be told is in the log and the audit
    // trail (the plan's state and any refund claim are written), for staff to finish by hand.
    console.error("plan after transfer: Stripe step failed", e);
    return {
      outcome: template.transfers ? "moved" : "ended",
      subscription: reread(),
    };
  }
}
