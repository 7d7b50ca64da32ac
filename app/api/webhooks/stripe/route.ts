import { BODY_LIMITS, readText } from "@/lib/http/body";
import { route } from "@/lib/http/route";
import { handlePlanWebhook } from "@/lib/plans/stripe-sync";
import { handleStripeWebhook } from "@/lib/repairs/payment";

// The signature is verified on the raw body, so read it as text before anything parses it.
// Care plan events (subscriptions, their invoices, subscription-mode checkouts) go to lib/plans;
// every other event to the repair payments code, as before.
export const POST = route({}, async ({ req }) => {
  const raw = await readText(req, BODY_LIMITS.webhook);
  const signature = req.headers.get("stripe-signature");
  const result = (await handlePlanWebhook(raw, signature)) ?? (await handleStripeWebhook(raw, signature));
  return result;
});
