import { z } from "zod";
import { BODY_LIMITS, readText } from "@/lib/http/body";
import { route } from "@/lib/http/route";
import { handlePlanWebhook } from "@/lib/plans/stripe-sync";
import { handleStripeWebhook } from "@/lib/repairs/payment";

const params = z.object({ studioId: z.string().min(1).max(64) });

// The webhook endpoint of a studio that charges under its own Stripe account: events are verified
// with the signing secret that studio saved in set-up (lib/payments/stripe.ts verifyStripeEvent), and
// re-read under its own key. The signature is checked on the raw body, so it is read as text first.
export const POST = route({ params }, async ({ req, params }) => {
  const raw = await readText(req, BODY_LIMITS.webhook);
  const signature = req.headers.get("stripe-signature");
  // Care plan events go to lib/plans, every other event to the repair payments code, as on the install's endpoint.
  return (await handlePlanWebhook(raw, signature, params.studioId)) ?? (await handleStripeWebhook(raw, signature, params.studioId));
});
