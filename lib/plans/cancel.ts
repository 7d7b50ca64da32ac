// Cancelling a plan: it runs to the end of the period already paid. A card plan is told to Stripe
// (cancel at period end) and re-read; a plan paid by other means is moved by the staff action itself.
import { getDb } from "@/db/client";
import type { PlanSubscription } from "@/db/schema";
import type { StudioActor } from "@/lib/auth/actor";
import { conflict } from "@/lib/errors";
import { callStripe } from "@/lib/payments/stripe";
import { syncPlanSubscription } from "./stripe-sync";
import { moveSubscription, studioSubscription } from "./subscriptions";

export async function cancelPlanAtPeriodEnd(ctx: StudioActor, subscriptionId: string): Promise<PlanSubscription> {
  const sub = studioSubscription(ctx.studio.id, subscriptionId);
  if (sub.state === "ending") return sub;
  if (sub.state !== "running" && sub.state !== "grace") throw conflict("Only a running plan can be cancelled.");
  if (sub.paidBy === "card" && sub.stripeSubscriptionId) {
    await callStripe("cancel the plan at the end of its period", (s) => s.subscriptions.update(sub.stripeSubscriptionId!, { cancel_at_period_end: true }, { idempotencyKey: `plan-cancel-${sub.id}` }));
    const after = await syncPlanSubscription(sub.stripeSubscriptionId);
    return after ?? sub;
  }
  return getDb().transaction((tx) => moveSubscription(tx, sub, "ending", {}, { actorId: ctx.user.id, source: "staff" }));
}
