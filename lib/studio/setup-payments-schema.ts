// The payments step's second input: the signing secret of the studio's own webhook endpoint. Shared by
// the form (loaded lazily) and the server action.
import { z } from "zod";

export const stripeWebhookSecretSchema = z.object({
  webhookSecret: z
    .string({ error: "Paste the endpoint's signing secret." })
    .trim()
    .min(1, "Paste the endpoint's signing secret.")
    .max(255, "That is longer than a signing secret.")
    .regex(/^whsec_[A-Za-z0-9_]+$/, "A signing secret starts with whsec_."),
});
export type StripeWebhookSecretInput = z.input<typeof stripeWebhookSecretSchema>;
export type StripeWebhookSecretValues = z.output<typeof stripeWebhookSecretSchema>;
