// The demo's seeded paid repairs can be given money back on: the Stripe fake, started as the demo starts
// it (lib/fakes/stripe-fake-cli.ts with STRIPE_FAKE_SEEDED_FROM), knows the seed's invented payments as
// charges. Started empty (as before), it refused them with "No such payment_intent", which staff met in
// the demo. Real SQLite file (the demo seed), the stripe SDK against the fake over HTTP.
import { and, eq, inArray, like } from "drizzle-orm";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { getDb } from "@/db/client";
import { payments, repairJobs, studios } from "@/db/schema";
import { DEMO_STUDIO_SLUG } from "@/db/seed/demo";
import { env } from "@/lib/env";
import { seededCharges } from "@/lib/fakes/seeded-charges";
import { startStripeFake, type StripeFake } from "@/lib/fakes/stripe-fake";
import { refundJob } from "@/lib/repairs/refunds";
import { seededDemoStudio } from "../support/demo-studio";
import { memberContext } from "../support/fixtures";

let fake: StripeFake;
beforeAll(async () => {
  await seededDemoStudio();
  // Webhooks go nowhere: the test reads the fake's charges, not the app's payment rows.
  fake = await startStripeFake({ port: 0, secretKey: env.STRIPE_SECRET_KEY, webhookSecret: env.STRIPE_WEBHOOK_SECRET, webhookUrl: "http://127.0.0.1:9/", charges: seededCharges(env.DATABASE_URL) });
  env.STRIPE_API_PORT = fake.port;
}, 60_000);
afterAll(async () => {
  await fake.close();
});

/** A seeded job the studio can give money back on: paid by a seeded payment, and paid, booked or done. */
function seededPaidJob() {
  const studio = getDb().select().from(studios).where(eq(studios.slug, DEMO_STUDIO_SLUG)).get()!;
  const row = getDb()
    .select({ job: repairJobs, payment: payments })
    .from(repairJobs)
    .innerJoin(payments, and(eq(payments.jobId, repairJobs.id), like(payments.paymentIntentId, "pi_demo_%")))
    .where(and(eq(repairJobs.studioId, studio.id), inArray(repairJobs.state, ["paid", "scheduled", "done"])))
    .get()!;
  return { studio, ...row };
}

describe("giving money back on the demo's seeded paid repairs", () => {
  it("the fake knows every seeded payment as a charge of its amount", () => {
    const charges = seededCharges(env.DATABASE_URL);
    const seeded = getDb().select().from(payments).where(like(payments.paymentIntentId, "pi_demo_%")).all();
    expect(seeded.length).toBeGreaterThan(0);
    expect(charges).toHaveLength(seeded.length);
    expect(charges).toContainEqual({ paymentIntent: seeded[0]!.paymentIntentId, amount: seeded[0]!.amountMinor, currency: seeded[0]!.currency, amountRefunded: seeded[0]!.refundedMinor });
  });

  it("a part of a seeded payment goes back through the fake started as the demo starts it", async () => {
    const { studio, job, payment } = seededPaidJob();
    const staff = await memberContext(studio, "staff");
    const { refund } = await refundJob(staff, job.id, { version: job.version, refundableMinor: job.totalMinor, amountMinor: 300, reason: "The base touch-up ran short." });
    expect(refund).toMatchObject({ amountMinor: 300, stripeRefundId: expect.stringMatching(/^re_/) });
    expect(fake.charges().find((c) => c.payment_intent === payment.paymentIntentId)).toMatchObject({ amount: payment.amountMinor, amount_refunded: 300 });
  });
});
