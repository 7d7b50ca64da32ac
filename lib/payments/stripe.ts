// The one Stripe client. In development and tests STRIPE_API_HOST points the real SDK at the local
// fake (lib/fakes/stripe-fake.ts); in production leave it empty to reach Stripe itself.
import Stripe from "stripe";
import { env } from "@/lib/env";
import { conflict, serviceUnavailable } from "@/lib/errors";

let client: Stripe | undefined;

export function getStripe(): Stripe {
  client ??= new Stripe(env.STRIPE_SECRET_KEY, {
    ...(env.STRIPE_API_HOST ? { host: env.STRIPE_API_HOST, port: env.STRIPE_API_PORT, protocol: env.STRIPE_API_PROTOCOL } : {}),
    maxNetworkRetries: 2,
    timeout: 10_000,
    appInfo: { name: "Grainward" },
  });
  return client;
}

/**
 * Runs a call to Stripe and turns its failures into answers a person can act on: a refusal is a 409
 * with Stripe's message, an unreachable service a 503. Nothing of ours has changed at that point.
 */
export async function callStripe<T>(what: string, fn: (stripe: Stripe) => Promise<T>): Promise<T> {
  try {
    return await fn(getStripe());
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
 * Expires an open Checkout Session so it can no longer take a payment, and returns the session as
 * Stripe then holds it: expired, or (when the owner finished paying first) complete. Expiring a
 * session that is no longer open is refused by Stripe; the session is read back instead.
 */
export async function expireCheckoutSession(sessionId: string): Promise<Stripe.Checkout.Session> {
  return callStripe("close the open payment page", async (stripe) => {
    try {
      return await stripe.checkout.sessions.expire(sessionId);
    } catch (e) {
      if (e instanceof Stripe.errors.StripeInvalidRequestError && e.statusCode === 400) return stripe.checkout.sessions.retrieve(sessionId);
      throw e;
    }
  });
}

export type { Stripe };
