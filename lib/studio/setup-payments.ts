import "server-only";
// The payments step's own account: what is shown of the studio's saved Stripe secrets (never more than
// their last four characters) and the signing secret of its webhook endpoint. The secret key itself is
// checked and saved by saveStripeKey (./setup-steps.tsx); charging under it is lib/payments/stripe.ts.
import { eq } from "drizzle-orm";
import { getDb } from "@/db/client";
import { studios } from "@/db/schema";
import { recordAudit } from "@/lib/audit";
import type { StudioContext } from "@/lib/auth/guards";
import { decrypt, encrypt } from "@/lib/crypto";
import { env } from "@/lib/env";
import { lastFour, SEALED } from "@/lib/payments/stripe";
import { assertAdmin, freshStudio } from "@/lib/settings";
import type { StripeWebhookSecretValues } from "./setup-payments-schema";

export type StripeAccountStatus = {
  /** "…abcd" of the saved secret key; null: the studio is charged under the install's account. */
  keyEnding: string | null;
  checkedAt: Date | null;
  /** "…abcd" of the saved signing secret; null: none saved. */
  webhookSecretEnding: string | null;
  /** Where the studio points its Stripe webhook endpoint. */
  webhookUrl: string;
};

/** The studio's own webhook endpoint, to enter in its Stripe dashboard. */
export function studioWebhookUrl(studioId: string): string {
  return new URL(`/api/webhooks/stripe/studio/${studioId}`, env.APP_URL).toString();
}

/** What the payments step shows about the stored secrets: their last four characters, never more. */
export function stripeAccountStatus(ctx: StudioContext): StripeAccountStatus {
  assertAdmin(ctx);
  const s = freshStudio(ctx);
  return {
    keyEnding: s.stripeSecretSealed ? lastFour(decrypt(SEALED.secretKey, s.stripeSecretSealed)) : null,
    checkedAt: s.stripeCheckedAt,
    webhookSecretEnding: s.stripeWebhookSecretSealed ? lastFour(decrypt(SEALED.webhookSecret, s.stripeWebhookSecretSealed)) : null,
    webhookUrl: studioWebhookUrl(s.id),
  };
}

/** Keeps the signing secret of the studio's webhook endpoint, sealed; the audit names its last four only. */
export function saveStripeWebhookSecret(ctx: StudioContext, { webhookSecret }: StripeWebhookSecretValues): void {
  assertAdmin(ctx);
  getDb().transaction((tx) => {
    tx.update(studios).set({ stripeWebhookSecretSealed: encrypt(SEALED.webhookSecret, webhookSecret) }).where(eq(studios.id, ctx.studio.id)).run();
    recordAudit(tx, { studioId: ctx.studio.id, actorId: ctx.user.id, action: "settings.stripe_webhook_secret_saved", subjectType: "studio", subjectId: ctx.studio.id, data: { last4: webhookSecret.slice(-4) } });
  });
}
