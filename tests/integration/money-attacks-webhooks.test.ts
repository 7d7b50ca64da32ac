// The Stripe webhook endpoints, tried as someone who holds a signing secret but not the right to move
// another studio's money would: a studio that saved a signing secret of its own (and no key) signs events
// about another studio's payments, or events of any shape, and posts them to its own endpoint. The app's
// webhook routes are called as Stripe calls them; the real stripe SDK against the local Stripe fake over
// HTTP; the install's deliveries reach the handlers through a receiver that can hold them. Invented studios.
import { eq } from "drizzle-orm";
import { NextRequest } from "next/server";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { POST as installEndpoint } from "@/app/api/webhooks/stripe/route";
import { POST as studioEndpoint } from "@/app/api/webhooks/stripe/studio/[studioId]/route";
import { getDb } from "@/db/client";
import { payments, repairJobs, stripeEvents } from "@/db/schema";
import { startStripeFake, SUCCESS_CARD, type StripeFake } from "@/lib/fakes/stripe-fake";
import { getStripe } from "@/lib/payments/stripe";
import { handlePlanWebhook } from "@/lib/plans/stripe-sync";
import { approveJob, handleStripeWebhook } from "@/lib/repairs/payment";
import { AWAITING_PAYMENT } from "@/lib/repairs/states";
import { saveStripeWebhookSecret } from "@/lib/studio/setup-payments";
import { createStudio, memberContext, unique } from "../support/fixtures";
import { quotedRepairJob } from "../support/repair-quote";
import { startWebhookReceiver, until, webhookGate, type WebhookReceiver } from "../support/stripe-receiver";

// An invented signing secret that studio X saved in set-up, with no key of its own.
const X_SECRET = "whsec_studio_x_invented_5d0e";

let fake: StripeFake;
let receiver: WebhookReceiver;
const gate = webhookGate();

beforeAll(async () => {
  receiver = await startWebhookReceiver(async (raw, sig) => {
    await gate.passed();
    return (await handlePlanWebhook(raw, sig)) ?? (await handleStripeWebhook(raw, sig));
  });
  fake = await startStripeFake({
    port: Number(process.env.STRIPE_API_PORT),
    secretKey: process.env.STRIPE_SECRET_KEY!,
    webhookSecret: process.env.STRIPE_WEBHOOK_SECRET!,
    webhookUrl: `${receiver.url}/`,
    retryDelaysMs: [200, 400, 800],
  });
});

afterAll(async () => {
  gate.release();
  await fake.close();
  await receiver.close();
});

const sign = (payload: string, secret: string) => getStripe().webhooks.generateTestHeaderString({ payload, secret });

async function post(studioId: string | null, payload: string, signature: string) {
  const path = studioId ? `/api/webhooks/stripe/studio/${studioId}` : "/api/webhooks/stripe";
  const req = new NextRequest(`http://localhost:3999${path}`, { method: "POST", body: payload, headers: { "content-type": "application/json", "stripe-signature": signature } });
  const res = studioId ? await studioEndpoint(req, { params: Promise.resolve({ studioId }) }) : await installEndpoint(req, { params: Promise.resolve({} as never) });
  return { status: res.status, body: await res.text() };
}

async function studioWithOwnSecret() {
  const studio = createStudio({ email: `${unique("x")}@test.example`, taxRateBp: 0 });
  saveStripeWebhookSecret(await memberContext(studio, "admin"), { webhookSecret: X_SECRET });
  return studio;
}

/** Studio B's owner approves a quote: the job, its payment page's address and its session at the fake. */
async function approvedAtB() {
  const b = createStudio({ email: `${unique("b")}@test.example`, taxRateBp: 0 });
  const { owner, job } = await quotedRepairJob(b);
  const { checkoutUrl } = await approveJob(owner, job.id);
  const session = fake.sessions().find((s) => s.client_reference_id === job.id)!;
  return { job, checkoutUrl, session };
}

/** Pays on the fake's payment page with its card that succeeds, as the owner's browser posts it. */
const payOnPage = (url: string) => fetch(url, { method: "POST", body: new URLSearchParams({ card: SUCCESS_CARD }), redirect: "manual" });

const jobState = (id: string) => getDb().select({ s: repairJobs.state }).from(repairJobs).where(eq(repairJobs.id, id)).get()!.s;

describe("a studio's own endpoint and another studio's money", () => {
  it("an event about another studio's paid checkout, signed with studio X's own secret, moves nothing; the other studio's own event then pays its job once", async () => {
    const x = await studioWithOwnSecret();
    const { job, checkoutUrl, session } = await approvedAtB();
    gate.hold();
    try {
      // B's owner pays; the install's endpoint hasn't heard of it yet.
      expect((await payOnPage(checkoutUrl!)).status).toBe(303);
      const forged = JSON.stringify({ id: `evt_${unique("forged")}`, object: "event", type: "checkout.session.completed", data: { object: { id: session.id, object: "checkout.session" } } });
      const answer = await post(x.id, forged, sign(forged, X_SECRET));
      expect(answer.status).toBeLessThan(500);
      expect(jobState(job.id)).toBe(AWAITING_PAYMENT);
      expect(getDb().select().from(payments).where(eq(payments.jobId, job.id)).get()!.status).toBe("open");
      // A charge of B's named at X's endpoint changes nothing either.
      const refunded = JSON.stringify({ id: `evt_${unique("forged")}`, object: "event", type: "charge.refunded", data: { object: { id: fake.charges().at(-1)!.id, object: "charge" } } });
      expect((await post(x.id, refunded, sign(refunded, X_SECRET))).status).toBeLessThan(500);
    } finally {
      gate.release();
    }
    await until(() => jobState(job.id) === "paid", 15_000);
    await until(() => fake.deliveries().length >= fake.events().length && fake.deliveries().every((d) => d.status === 200), 15_000);
    expect(getDb().select().from(payments).where(eq(payments.jobId, job.id)).all().map((p) => p.status)).toEqual(["paid"]);
  });
});

describe("events out of order", () => {
  it("a refund made at Stripe whose charge.refunded arrives before the checkout's own event is not lost: the payment shows it once the checkout is written", async () => {
    const { job, checkoutUrl, session } = await approvedAtB();
    gate.hold();
    try {
      expect((await payOnPage(checkoutUrl!)).status).toBe(303);
      // Someone refunds it at Stripe by hand at once; its event is the first to reach the app.
      const pi = fake.sessions().find((s) => s.id === session.id)!.payment_intent!;
      await getStripe().refunds.create({ payment_intent: pi });
      const refundedEvent = fake.events().find((e) => e.type === "charge.refunded" && (e.data.object as { payment_intent?: string }).payment_intent === pi)!;
      const payload = JSON.stringify(refundedEvent);
      expect((await post(null, payload, sign(payload, process.env.STRIPE_WEBHOOK_SECRET!))).status).toBe(200);
    } finally {
      gate.release();
    }
    await until(() => jobState(job.id) === "paid", 15_000);
    await until(() => fake.deliveries().length >= fake.events().length && fake.deliveries().every((d) => d.status === 200), 15_000);
    const payment = getDb().select().from(payments).where(eq(payments.jobId, job.id)).get()!;
    expect(payment).toMatchObject({ status: "refunded", refundedMinor: payment.amountMinor });
  });
});

describe("signed events of any shape", () => {
  it("an event with no object, an object with no id, a number for an id, no type, or not JSON at all is a 400 with words, and nothing is recorded", async () => {
    const x = await studioWithOwnSecret();
    const id = () => `evt_${unique("shape")}`;
    const bodies = [
      JSON.stringify({ id: id(), object: "event", type: "checkout.session.completed" }),
      JSON.stringify({ id: id(), object: "event", type: "checkout.session.completed", data: null }),
      JSON.stringify({ id: id(), object: "event", type: "checkout.session.completed", data: { object: null } }),
      JSON.stringify({ id: id(), object: "event", type: "charge.refunded", data: { object: {} } }),
      JSON.stringify({ id: id(), object: "event", type: "invoice.paid", data: { object: { id: 42 } } }),
      JSON.stringify({ id: id(), object: "event", type: "customer.subscription.updated", data: { object: "sub_x" } }),
      JSON.stringify({ id: id(), object: "event", data: { object: { id: "cs_test_x" } } }),
      JSON.stringify({ object: "event", type: "checkout.session.completed", data: { object: { id: "cs_test_x" } } }),
      JSON.stringify([1, 2, 3]),
      "null",
      "not json at all",
    ];
    for (const body of bodies) {
      const answer = await post(x.id, body, sign(body, X_SECRET));
      expect(answer.status, body).toBe(400);
      expect(JSON.parse(answer.body).error.message, body).toMatch(/^[A-Z].*\.$/);
    }
    // The same at the install's endpoint, signed with its secret.
    for (const body of bodies) expect((await post(null, body, sign(body, process.env.STRIPE_WEBHOOK_SECRET!))).status, body).toBe(400);
    expect(getDb().select().from(stripeEvents).where(eq(stripeEvents.objectId, "cs_test_x")).all()).toEqual([]);
  });

  it("an event of a kind the app doesn't handle, about an object with no id (a balance), is taken and ignored, not refused", async () => {
    const x = await studioWithOwnSecret();
    const body = JSON.stringify({ id: `evt_${unique("balance")}`, object: "event", type: "balance.available", data: { object: { object: "balance", available: [{ amount: 1200, currency: "usd" }] } } });
    const answer = await post(x.id, body, sign(body, X_SECRET));
    expect(answer.status).toBe(200);
    expect(JSON.parse(answer.body)).toMatchObject({ received: true, ignored: true });
    // An invoice whose subscription id isn't text names no plan: nothing to sync, taken and ignored.
    const odd = JSON.stringify({ id: `evt_${unique("odd")}`, object: "event", type: "invoice.paid", data: { object: { id: "in_test_odd", parent: { subscription_details: { subscription: { id: 7 } } } } } });
    expect(JSON.parse((await post(x.id, odd, sign(odd, X_SECRET))).body)).toMatchObject({ received: true, ignored: true });
  });

  it("an unsigned, wrongly signed or over-large body is refused before anything is read from Stripe", async () => {
    const x = await studioWithOwnSecret();
    const body = JSON.stringify({ id: `evt_${unique("sig")}`, object: "event", type: "checkout.session.completed", data: { object: { id: "cs_test_y" } } });
    const before = fake.requests().length;
    expect((await post(x.id, body, "")).status).toBe(400);
    expect((await post(x.id, body, "t=1,v1=00")).status).toBe(400);
    expect((await post(x.id, body, sign(body, "whsec_someone_else_invented"))).status).toBe(400);
    const huge = JSON.stringify({ id: "evt_huge", type: "checkout.session.completed", data: { object: { id: "cs_test_y", pad: "x".repeat(2_000_000) } } });
    expect((await post(x.id, huge, sign(huge, X_SECRET))).status).toBe(413);
    expect((await post(null, huge, sign(huge, process.env.STRIPE_WEBHOOK_SECRET!))).status).toBe(413);
    expect(fake.requests().length).toBe(before);
  });
});
