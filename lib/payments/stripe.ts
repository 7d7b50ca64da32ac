// The Stripe clients. In development and tests STRIPE_API_HOST points the real SDK at the local
// fake (lib/fakes/stripe-fake.ts); in production leave it empty to reach Stripe itself.
//
// Whose account: a studio that saved its own secret key in set-up (lib/studio/setup-steps.tsx) is
// charged, refunded and read under that key; every other studio under the install's
// STRIPE_SECRET_KEY. Events from a studio's own account arrive at its own webhook endpoint
// (/api/webhooks/stripe/studio/:studioId) and are verified with the signing secret it saved; the
// install's endpoint (/api/webhooks/stripe) keeps STRIPE_WEBHOOK_SECRET. Keys are stored sealed
// (lib/crypto.ts), are never logged, and are shown back by their last four characters only.
import Stripe from "stripe";
import { eq } from "drizzle-orm";
import { getDb } from "@/db/client";
import { studios } from "@/db/schema";
import { decrypt } from "@/lib/crypto";
import { env } from "@/lib/env";
import { badRequest, conflict, notFound, serviceUnavailable } from "@/lib/errors";

/** Sealing purposes of a studio's own Stripe secrets (lib/crypto.ts encrypt/decrypt). */
export const SEALED = { secretKey: "stripe-key", webhookSecret: "stripe-webhook-secret" } as const;

const clients = new Map<string, Stripe>();

function clientFor(secretKey: string): Stripe {
  let client = clients.get(secretKey);
  if (!client) {
    client = new Stripe(secretKey, {
      ...(env.STRIPE_API_HOST ? { host: env.STRIPE_API_HOST, port: env.STRIPE_API_PORT, protocol: env.STRIPE_API_PROTOCOL } : {}),
      maxNetworkRetries: 2,
      timeout: 10_000,
      appInfo: { name: "Grainward" },
    });
    clients.set(secretKey, client);
  }
  return client;
}

function studioSecrets(studioId: string) {
  return getDb().select({ key: studios.stripeSecretSealed, webhook: studios.stripeWebhookSecretSealed }).from(studios).where(eq(studios.id, studioId)).get();
}

/**
 * The Stripe client for a studio: under its own key when it saved one, else the install's key
 * (also when no studio is named).
 */
export function getStripe(studioId?: string | null): Stripe {
  const sealed = studioId ? studioSecrets(studioId)?.key : null;
  return clientFor(sealed ? decrypt(SEALED.secretKey, sealed) : env.STRIPE_SECRET_KEY);
}

/** The last four characters of a secret, the only part of it ever shown back. */
export function lastFour(secret: string): string {
  return `…${secret.slice(-4)}`;
}

/**
 * Runs a call to Stripe (under the studio's own key when `studioId` names a studio that saved one)
 * and turns its failures into answers a person can act on: a refusal is a 409 with Stripe's message,
 * an unreachable service a 503. Nothing of ours has changed at that point.
 */
export async function callStripe<T>(what: string, fn: (stripe: Stripe) => Promise<T>, studioId?: string | null): Promise<T> {
  try {
    return await fn(getStripe(studioId));
  } catch (e) {
    if (e instanceof Stripe.errors.StripeConnectionError || e instanceof Stripe.errors.StripeAPIError) {
      throw serviceUnavailable("payment_service_unavailable", `The payment service can't be reached right now, so we couldn't ${what}. Nothing was charged; try again in a minute.`);
    }
    if (e instanceof Stripe.errors.StripeError) {
      throw conflict(`The payment service refused to ${what}: ${e.message}`, { code: "payment_service_refused" });
    }
    throw e;
  }
}

/**
 * Verifies a webhook's Stripe-Signature on the raw body: with the studio's own signing secret when the
 * event came to that studio's endpoint, else with the install's STRIPE_WEBHOOK_SECRET. A studio that
 * saved no signing secret has no endpoint (404); a signature that doesn't match is a 400.
 */
export function verifyStripeEvent(rawBody: string, signature: string | null, studioId?: string): Stripe.Event {
  let secret = env.STRIPE_WEBHOOK_SECRET;
  if (studioId !== undefined) {
    const sealed = studioSecrets(studioId)?.webhook;
    if (!sealed) throw notFound("This studio has no Stripe webhook endpoint.");
    secret = decrypt(SEALED.webhookSecret, sealed);
  }
  try {
    return getStripe().webhooks.constructEvent(rawBody, signature ?? "", secret);
  } catch {
    throw badRequest("The Stripe-Signature header doesn't match this payload.");
  }
}

/**
 * Expires an open Checkout Session so it can no longer take a payment, and returns the session as
 * Stripe then holds it: expired, or (when the owner finished paying first) complete. Expiring a
 * session that is no longer open is refused by Stripe; the session is read back instead.
 */
export async function expireCheckoutSession(sessionId: string, studioId?: string | null): Promise<Stripe.Checkout.Session> {
  return callStripe(
    "close the open payment page",
    async (stripe) => {
      try {
        return await stripe.checkout.sessions.expire(sessionId);
      } catch (e) {
        if (e instanceof Stripe.errors.StripeInvalidRequestError && e.statusCode === 400) return stripe.checkout.sessions.retrieve(sessionId);
        throw e;
      }
    },
    studioId,
  );
}

export type { Stripe };
