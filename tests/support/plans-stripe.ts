// Care plan tests against the local Stripe fake over HTTP, through the real stripe SDK: the fake's
// signed webhooks arrive at a small receiver here that hands the raw body to the webhook route's
// handlers (plans first, then repair payments, as app/api/webhooks/stripe/route.ts does).
import { eq } from "drizzle-orm";
import { getDb } from "@/db/client";
import { planSubscriptions } from "@/db/schema";
import { env } from "@/lib/env";
import { startStripeFake, type StripeFake } from "@/lib/fakes/stripe-fake";
import { handlePlanWebhook } from "@/lib/plans/stripe-sync";
import { handleStripeWebhook } from "@/lib/repairs/payment";
import { startWebhookReceiver } from "./stripe-receiver";

export { until } from "./stripe-receiver";

/** Starts the fake and the webhook receiver, and points the app's Stripe client at the fake. */
export async function startPlansStripe(): Promise<{ fake: StripeFake; close: () => Promise<void> }> {
  const receiver = await startWebhookReceiver(async (raw, sig) => (await handlePlanWebhook(raw, sig)) ?? (await handleStripeWebhook(raw, sig)));
  const fake = await startStripeFake({ port: 0, secretKey: env.STRIPE_SECRET_KEY, webhookSecret: env.STRIPE_WEBHOOK_SECRET, webhookUrl: `${receiver.url}/`, retryDelaysMs: [200, 400] });
  env.STRIPE_API_PORT = fake.port;
  return {
    fake,
    close: async () => {
      await fake.close();
      await receiver.close();
    },
  };
}

export const subRow = (id: string) => getDb().select().from(planSubscriptions).where(eq(planSubscriptions.id, id)).get()!;

/** The fake's test knob: renew (outcome=pay|fail, amount=…), settle or lapse a subscription. */
export const knob = (fake: StripeFake, subId: string, action: string, body = "") =>
  fetch(`${fake.url}/_test/subscriptions/${subId}/${action}`, { method: "POST", headers: { authorization: `Bearer ${env.STRIPE_SECRET_KEY}`, "content-type": "application/x-www-form-urlencoded" }, body });
