// `tsx lib/fakes/stripe-fake-cli.ts`: the Stripe fake as its own process (the demo and e2e start it).
import { seededCharges } from "./seeded-charges";
import { startStripeFake } from "./stripe-fake";

const port = Number(process.env.STRIPE_API_PORT ?? 12111);
const appUrl = process.env.APP_URL ?? "http://localhost:3000";
// The demo (scripts/demo.mjs) names its database: the seed's invented payments become the fake's charges.
const seededFrom = process.env.STRIPE_FAKE_SEEDED_FROM;
const fake = await startStripeFake({
  port,
  charges: seededFrom ? seededCharges(seededFrom) : [],
  secretKey: process.env.STRIPE_SECRET_KEY ?? "sk_test_grainward_demo",
  webhookSecret: process.env.STRIPE_WEBHOOK_SECRET ?? "whsec_grainward_demo",
  webhookUrl: process.env.STRIPE_WEBHOOK_URL ?? `${appUrl}/api/webhooks/stripe`,
});
console.log(`stripe-fake: API and payment page on ${fake.url} (development only), webhooks to ${appUrl}/api/webhooks/stripe`);
const stop = () => void fake.close().then(() => process.exit(0));
process.on("SIGINT", stop);
process.on("SIGTERM", stop);
