// The one Stripe client. In development and tests STRIPE_API_HOST points the real SDK at the local
// fake (lib/fakes/stripe-fake.ts); in production leave it empty to reach Stripe itself.
import Stripe from "stripe";
import { env } from "@/lib/env";

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

export type { Stripe };
