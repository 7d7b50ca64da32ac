// A studio that starts on the install's Stripe account and saves its own key later: what was bought
// and paid before (a care plan, a repair payment) lives in the install's account, and every later
// call about it (cancelling, refunding, reading a renewal, the webhooks) must still reach it there,
// while new checkouts go to the studio's account. Real stripe SDK against the local Stripe fake over
// HTTP; the fake keeps accounts apart as Stripe does (another account's object is "not found").
// Invented studio, keys and owners.
import { eq } from "drizzle-orm";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { getDb } from "@/db/client";
import { payments, repairJobs } from "@/db/schema";
import { env } from "@/lib/env";
import { startStripeFake, SUCCESS_CARD, type StripeFake } from "@/lib/fakes/stripe-fake";
import { addDays, localDate } from "@/lib/care/dates";
import { cancelMyPlan, myPlanControl } from "@/lib/plans/cancel";
import { handlePlanWebhook } from "@/lib/plans/stripe-sync";
import { approveJob, cancelJob, handleStripeWebhook } from "@/lib/repairs/payment";
import { saveStripeWebhookSecret } from "@/lib/studio/setup-payments";
import { saveStripeKey } from "@/lib/studio/setup-steps";
import { createPiece, createStudio, createUser, memberContext, unique } from "../support/fixtures";
import { buyPlan, knob, subRow, yearlyPlan } from "../support/plans-stripe";
import { quotedRepairJob } from "../support/repair-quote";
import { startWebhookReceiver, until, type WebhookReceiver } from "../support/stripe-receiver";

const A = { secretKey: "sk_test_later_key_invented_61c3", webhookSecret: "whsec_later_key_invented_0d9e" };
const INSTALL_KEY = env.STRIPE_SECRET_KEY;

let fake: StripeFake;
let receiver: WebhookReceiver;
let studio: ReturnType<typeof createStudio>;
const answers: { path: string; status: number }[] = [];

beforeAll(async () => {
  // The app's two endpoints: /install (the install's), /studio/:id (the studio's own); plans first, then repairs, as the routes do.
  receiver = await startWebhookReceiver(
    async (raw, sig, path) => {
      const studioId = path.startsWith("/studio/") ? path.slice("/studio/".length) : undefined;
      return (await handlePlanWebhook(raw, sig, studioId)) ?? (await handleStripeWebhook(raw, sig, studioId));
    },
    (status, path) => answers.push({ path, status }),
  );
  studio = createStudio({ email: `${unique("later")}@test.example`, currency: "USD", labourRateMinor: 8000, taxRateBp: 0 });
  fake = await startStripeFake({
    port: 0,
    secretKey: INSTALL_KEY,
    webhookSecret: env.STRIPE_WEBHOOK_SECRET,
    webhookUrl: `${receiver.url}/install`,
    retryDelaysMs: [200],
    accounts: [{ ...A, webhookUrl: `${receiver.url}/studio/${studio.id}` }],
  });
  env.STRIPE_API_PORT = fake.port;
});

afterAll(async () => {
  await fake?.close();
  await receiver?.close();
});

const jobState = (id: string) => getDb().select({ s: repairJobs.state }).from(repairJobs).where(eq(repairJobs.id, id)).get()!.s;
const paymentOf = (jobId: string) => getDb().select().from(payments).where(eq(payments.jobId, jobId)).get()!;

async function paidPlan() {
  const admin = await memberContext(studio, "admin");
  const owner = await createUser();
  const { piece } = createPiece(studio, { ownerId: owner.id, deliveredOn: addDays(localDate(new Date(), "UTC"), -30) });
  const plan = yearlyPlan(admin, { refundRule: "unused_share", transfers: false });
  const { id: subscriptionId } = await buyPlan(fake, owner, piece.id, plan.id);
  return { admin, owner, piece, subscriptionId };
}

async function paidRepair() {
  const { staff, owner, job } = await quotedRepairJob(studio);
  const { checkoutUrl } = await approveJob(owner, job.id);
  await fetch(checkoutUrl!, { method: "POST", body: new URLSearchParams({ card: SUCCESS_CARD }), redirect: "manual" });
  await until(() => jobState(job.id) === "paid");
  return { staff, job };
}

describe("a studio that saves its own Stripe key after taking payments under the install's", () => {
  it("cancels, refunds and follows renewals of what was bought before under the install's account", async () => {
    const { admin, owner, piece, subscriptionId } = await paidPlan();
    const { staff, job } = await paidRepair();
    const stripeSub = subRow(subscriptionId).stripeSubscriptionId!;
    expect(subRow(subscriptionId).stripeAccount).toBe("install");
    expect(paymentOf(job.id).stripeAccount).toBe("install");

    await saveStripeKey(admin, { secretKey: A.secretKey });
    saveStripeWebhookSecret(admin, { webhookSecret: A.webhookSecret });
    // Sanity of the fake: under the studio's key the install's subscription is not found, as at Stripe.
    const asStudio = await fetch(`${fake.url}/v1/subscriptions/${stripeSub}`, { headers: { authorization: `Bearer ${A.secretKey}` } });
    expect(asStudio.status).toBe(404);

    // The plan is cancelled (with the unused months paid back) under the install's key, where it lives.
    const control = myPlanControl(owner, piece.id)!;
    expect(control.quote!.refundMinor).toBeGreaterThan(0);
    const mark = fake.requests().length;
    await cancelMyPlan(owner, control.subscriptionId, { version: control.version, refundMinor: control.quote!.refundMinor });
    expect(subRow(subscriptionId).state).toBe("ending");
    const planCalls = fake.requests().slice(mark);
    expect(planCalls.some((r) => r.method === "POST" && r.path === `/v1/subscriptions/${stripeSub}`)).toBe(true);
    expect(planCalls.some((r) => r.method === "POST" && r.path === "/v1/refunds")).toBe(true);
    expect(planCalls.every((r) => r.key === INSTALL_KEY)).toBe(true);
    const onFake = fake.subscriptions().find((s) => s.id === stripeSub)!;
    expect(onFake.cancel_at ?? onFake.cancel_at_period_end).toBeTruthy();
    const planInvoicePi = fake.invoices().find((i) => i.parent.subscription_details.subscription === stripeSub)!.payments.data[0]!.payment.payment_intent;
    expect(fake.charges().find((c) => c.payment_intent === planInvoicePi)!.amount_refunded).toBe(control.quote!.refundMinor);

    // The repair payment is refunded under the install's key too.
    const before = fake.requests().length;
    await cancelJob(staff, job.id);
    const refundCall = fake.requests().slice(before).find((r) => r.path === "/v1/refunds")!;
    expect(refundCall.key).toBe(INSTALL_KEY);
    const pi = paymentOf(job.id).paymentIntentId!;
    expect(fake.charges().find((c) => c.payment_intent === pi)!.amount_refunded).toBeGreaterThan(0);
    await until(() => paymentOf(job.id).status === "refunded");

    // The period's end at Stripe: its events come to the install's endpoint and are matched to the plan.
    await knob(fake, stripeSub, "renew", "outcome=pay");
    await until(() => subRow(subscriptionId).state === "ended");
    await until(() => fake.deliveries().length >= fake.events().length);
    expect(answers.filter((a) => a.status !== 200)).toEqual([]);

    // Something bought now goes to the studio's own account.
    const next = await paidRepair();
    expect(paymentOf(next.job.id).stripeAccount).toBe("studio");
    expect(fake.sessionKey(paymentOf(next.job.id).checkoutSessionId)).toBe(A.secretKey);
  });
});
