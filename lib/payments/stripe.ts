// The Stripe clients. In development and tests STRIPE_API_HOST points the real SDK at the local
// fake (lib/fakes/stripe-fake.ts); in production leave it empty to reach Stripe itself.
//
// Whose account: a studio that saved its own secret key in set-up (lib/studio/setup-steps.tsx) is
// charged under that key; every other studio under the install's STRIPE_SECRET_KEY. Each payment and
// plan row records the account it was made under (stripeAccount), and every later call about it
// (refund, cancellation, renewal read) uses that account's key, so saving a key later leaves the
// install's objects reachable. Events from a studio's own account arrive at its own webhook endpoint
// (/api/webhooks/stripe/studio/:studioId) and are verified with the signing secret it saved; the
// install's endpoint (/api/webhooks/stripe) keeps STRIPE_WEBHOOK_SECRET. Keys are stored sealed
// (lib/crypto.ts), are never logged, and are shown back by their last four characters only.
import Stripe from "stripe";
import { eq } from "drizzle-orm";
import { z } from "zod";
import { getDb } from "@/db/client";
import { STRIPE_ACCOUNTS, studios } from "@/db/schema";
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

export type StripeAccount = (typeof STRIPE_ACCOUNTS)[number];

/**
 * Where a Stripe object lives: its studio and the account it was made under (a payment or plan row has
 * both fields). A bare studio id means the studio's account as it is now: its own key when it saved
 * one, else the install's; nothing means the install's.
 */
export type StripeHome = { studioId: string; stripeAccount: StripeAccount | null };
export type StripeScope = string | StripeHome | null | undefined;

/** The account a new Checkout Session or subscription of the studio is made under now. */
export function accountFor(studioId: string): StripeAccount {
  return studioSecrets(studioId)?.key ? "studio" : "install";
}

/**
 * The Stripe client for a scope. An object made under the install's key is read and changed under it
 * even after the studio saved its own key (Stripe would answer "not found" under the studio's); a
 * studio-made object, a row made before the account was recorded, and a bare studio id use the
 * studio's key when it has one.
 */
export function getStripe(scope?: StripeScope): Stripe {
  const home = typeof scope === "string" ? { studioId: scope, stripeAccount: null } : scope;
  const sealed = home && home.stripeAccount !== "install" ? studioSecrets(home.studioId)?.key : null;
  return clientFor(sealed ? decrypt(SEALED.secretKey, sealed) : env.STRIPE_SECRET_KEY);
}

/** The last four characters of a secret, the only part of it ever shown back. */
export function lastFour(secret: string): string {
  return `…${secret.slice(-4)}`;
}

/**
 * Runs a call to Stripe under the scope's account (getStripe: the account a row was made under, or a
 * studio's own key when it saved one)
 * and turns its failures into answers a person can act on: a refusal is a 409 with Stripe's message,
 * an unreachable service a 503. Nothing of ours has changed at that point.
 */
export async function callStripe<T>(what: string, fn: (stripe: Stripe) => Promise<T>, scope?: StripeScope): Promise<T> {
  try {
    return await fn(getStripe(scope));
  } catch (e) {
    if (e instanceof Stripe.errors.StripeConnectionError || e instanceof Stripe.errors.StripeAPIError) {
      throw serviceUnavailable("payment_service_unavailable", `The payment service can't be reached right now, so we couldn't ${what}. Nothing was charged; try again in a minute.`);
    }
    // Not a refusal: a request under the same key reached Stripe before (a refund may have been made).
    if (e instanceof Stripe.errors.StripeIdempotencyError) {
      throw conflict(`The payment service already has a request like this one, so we couldn't ${what} again. Reload the page to see where it stands.`, { code: "payment_service_key_reused" });
    }
    if (e instanceof Stripe.errors.StripeError) {
      throw conflict(`The payment service refused to ${what}: ${e.message}`, { code: "payment_service_refused" });
    }
    throw e;
  }
}

/**
 * What every event must carry: its id, its type, and the object it is about, whose id (when it has one:
 * a balance has none) is text. A studio's signing secret is its own admin's to know, so a correctly
 * signed body is still checked before it is read.
 */
const eventShape = z.object({
  id: z.string().min(1).max(255),
  type: z.string().min(1).max(255),
  data: z.object({ object: z.object({ id: z.string().min(1).max(255).optional() }) }),
});

/** The id of the object an event the app handles is about (it is re-read from Stripe by that id); a 400 when it has none. */
export function eventObjectId(event: Stripe.Event): string {
  const id = (event.data.object as { id?: string }).id;
  if (!id) throw badRequest("This event names no object to read, so nothing was done with it.");
  return id;
}

/**
 * Verifies a webhook's Stripe-Signature on the raw body: with the studio's own signing secret when the
 * event came to that studio's endpoint, else with the install's STRIPE_WEBHOOK_SECRET. A studio that
 * saved no signing secret has no endpoint (404); a signature that doesn't match is a 400, and so is a
 * signed body that isn't an event about one object.
 */
export function verifyStripeEvent(rawBody: string, signature: string | null, studioId?: string): Stripe.Event {
  let secret = env.STRIPE_WEBHOOK_SECRET;
  if (studioId !== undefined) {
    const sealed = studioSecrets(studioId)?.webhook;
    if (!sealed) throw notFound("This studio has no Stripe webhook endpoint.");
    secret = decrypt(SEALED.webhookSecret, sealed);
  }
  let event: Stripe.Event;
  try {
    event = getStripe().webhooks.constructEvent(rawBody, signature ?? "", secret);
  } catch (e) {
    if (e instanceof Stripe.errors.StripeSignatureVerificationError) throw badRequest("The Stripe-Signature header doesn't match this payload.");
    throw badRequest("This isn't a Stripe event: its body isn't JSON.");
  }
  if (!eventShape.safeParse(event).success) throw badRequest("This isn't a Stripe event we can read: it needs an id, a type and the object it is about.");
  return event;
}

/**
 * Expires an open Checkout Session so it can no longer take a payment, and returns the session as
 * Stripe then holds it: expired, or (when the owner finished paying first) complete. Expiring a
 * session that is no longer open is refused by Stripe; the session is read back instead.
 */
export async function expireCheckoutSession(sessionId: string, scope?: StripeScope): Promise<Stripe.Checkout.Session> {
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
    scope,
  );
}

export type { Stripe };
