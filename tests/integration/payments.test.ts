// Repair jobs paid through the real stripe SDK against the local Stripe fake over HTTP. The fake's
// webhooks arrive at a small receiver in this test that hands the raw body to the product's handler.
import http from "node:http";
import type { AddressInfo } from "node:net";
import { eq } from "drizzle-orm";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { getDb } from "@/db/client";
import { payments, repairJobs, stripeEvents } from "@/db/schema";
import { DECLINE_CARD, startStripeFake, SUCCESS_CARD, type StripeFake } from "@/lib/fakes/stripe-fake";
import { AppError } from "@/lib/errors";
import { getStudioJob, createJob, updateJobQuote } from "@/lib/repairs/jobs";
import { approveJob, cancelJob, handleStripeWebhook, sendQuote } from "@/lib/repairs/payment";
import { getStripe } from "@/lib/payments/stripe";
import { currencyExponent, quote } from "@/lib/care/quote";
import { createAcceptedClaim, createPiece, createProduct, createStudio, createUser, memberContext } from "../support/fixtures";
import { listMail, waitForMail } from "../support/mail";

let fake: StripeFake;
let receiver: http.Server;
const webhookAnswers: number[] = [];

beforeAll(async () => {
  receiver = http.createServer(async (req, res) => {
    const chunks: Buffer[] = [];
    for await (const c of req) chunks.push(c as Buffer);
    try {
      await handleStripeWebhook(Buffer.concat(chunks).toString("utf8"), (req.headers["stripe-signature"] as string) ?? null);
      res.writeHead(200).end("{}");
      webhookAnswers.push(200);
    } catch (e) {
      const status = e instanceof AppError ? e.status : 500;
      webhookAnswers.push(status);
      res.writeHead(status).end();
    }
  });
  await new Promise<void>((r) => receiver.listen(0, "127.0.0.1", () => r()));
  fake = await startStripeFake({
    port: Number(process.env.STRIPE_API_PORT),
    secretKey: process.env.STRIPE_SECRET_KEY!,
    webhookSecret: process.env.STRIPE_WEBHOOK_SECRET!,
    webhookUrl: `http://127.0.0.1:${(receiver.address() as AddressInfo).port}/`,
    retryDelaysMs: [200, 400],
  });
});

afterAll(async () => {
  await fake.close();
  await new Promise((r) => receiver.close(r));
});

async function until<T>(fn: () => T | undefined | null | false, ms = 8000): Promise<T> {
  const end = Date.now() + ms;
  for (;;) {
    const v = fn();
    if (v) return v;
    if (Date.now() > end) throw new Error("timed out waiting");
    await new Promise((r) => setTimeout(r, 50));
  }
}

/** Pays on the fake's hosted page as a browser would: a form POST with the card number. */
async function payOnPage(url: string, card: string) {
  return fetch(url, { method: "POST", body: new URLSearchParams({ card }), redirect: "manual" });
}

async function quotedJob(currency = "USD", decision: "chargeable" | "partly_covered" | "covered" = "chargeable") {
  const studio = createStudio({ currency, labourRateMinor: currency === "JPY" ? 9000 : 8500, travelFeeMinor: currency === "JPY" ? 3000 : 4500, taxRateBp: 825 });
  const staff = await memberContext(studio, "staff");
  const owner = await createUser();
  const { piece } = createPiece(studio, { ownerId: owner.id });
  const product = createProduct(studio, { containers: [{ ml: 125, priceMinor: currency === "JPY" ? 2500 : 1900 }] });
  const claim = createAcceptedClaim(studio, piece.id, owner.id, decision, 40);
  const job = createJob(staff, "claim", claim.id);
  updateJobQuote(staff, job.id, { title: "Refresh the top", tasks: ["reoil"], productIds: [product.id], coats: 1, travel: true, coveredPct: job.coveredPct, notes: "" });
  await sendQuote(staff, job.id);
  return { studio, staff, owner, piece, product, job: getStudioJob(staff, job.id).job };
}

describe("repair job payment through the Stripe fake", () => {
  it("quote → approve → checkout → pay on the fake page → signed webhook → paid, recorded, receipt", async () => {
    const { owner, job, staff } = await quotedJob();
    const quoteMail = await waitForMail({ to: owner.email, subject: /quote/i });
    expect(quoteMail.text).toContain("To pay:");

    const { checkoutUrl } = await approveJob(owner, job.id);
    expect(checkoutUrl).toMatch(new RegExp(`^${fake.url}/pay/cs_test_`));
    const session = fake.sessions().find((s) => s.client_reference_id === job.id)!;
    expect(session.metadata.jobId).toBe(job.id);
    expect(session.amount_total).toBe(job.totalMinor);

    const res = await payOnPage(checkoutUrl!, SUCCESS_CARD);
    expect(res.status).toBe(303);
    expect(res.headers.get("location")).toContain(`/jobs/${job.id}?checkout=success&session_id=${session.id}`);

    const paid = await until(() => getDb().select().from(repairJobs).where(eq(repairJobs.id, job.id)).get()?.state === "paid" && true);
    expect(paid).toBe(true);
    const rows = getDb().select().from(payments).where(eq(payments.jobId, job.id)).all();
    expect(rows).toHaveLength(1);
    expect(rows[0]).toMatchObject({ status: "paid", amountMinor: job.totalMinor });
    expect(rows[0]!.paymentIntentId).toMatch(/^pi_test_/);
    const receipt = await waitForMail({ to: owner.email, subject: /receipt/i });
    expect(receipt.text).toContain(`${(job.totalMinor / 100).toFixed(2)} USD`);
    expect(getStudioJob(staff, job.id).job.paidAt).toBeInstanceOf(Date);
  });

  it("refuses a forged or stale signature with 400 and changes nothing", async () => {
    const payload = JSON.stringify({ id: "evt_forged", object: "event", type: "checkout.session.completed", data: { object: { id: "cs_x" } } });
    const forged = getStripe().webhooks.generateTestHeaderString({ payload, secret: "whsec_someone_else" });
    await expect(handleStripeWebhook(payload, forged)).rejects.toMatchObject({ status: 400 });
    const stale = getStripe().webhooks.generateTestHeaderString({ payload, secret: process.env.STRIPE_WEBHOOK_SECRET!, timestamp: Math.floor(Date.now() / 1000) - 3600 });
    await expect(handleStripeWebhook(payload, stale)).rejects.toMatchObject({ status: 400 });
    await expect(handleStripeWebhook(payload, null)).rejects.toMatchObject({ status: 400 });
    expect(getDb().select().from(stripeEvents).where(eq(stripeEvents.id, "evt_forged")).all()).toHaveLength(0);
  });

  it("the same event delivered three times makes one payment and one receipt", async () => {
    const { owner, job } = await quotedJob();
    const { checkoutUrl } = await approveJob(owner, job.id);
    await payOnPage(checkoutUrl!, SUCCESS_CARD);
    await until(() => getDb().select().from(repairJobs).where(eq(repairJobs.id, job.id)).get()?.state === "paid");
    const event = fake.events().find((e) => e.type === "checkout.session.completed" && (e.data.object as { client_reference_id: string }).client_reference_id === job.id)!;
    expect(await fake.redeliver(event.id)).toBe(200);
    expect(await fake.redeliver(event.id)).toBe(200);
    expect(getDb().select().from(payments).where(eq(payments.jobId, job.id)).all().filter((p) => p.status === "paid")).toHaveLength(1);
    await waitForMail({ to: owner.email, subject: /receipt/i });
    await new Promise((r) => setTimeout(r, 300));
    expect((await listMail({ to: owner.email })).filter((m) => /receipt/i.test(m.subject))).toHaveLength(1);
  });

  it("a completed event arriving after an expired one ends in the state the fake reports", async () => {
    const { owner, job } = await quotedJob();
    const first = await approveJob(owner, job.id);
    const firstSession = fake.sessions().find((s) => s.url === first.checkoutUrl)!;
    await getStripe().checkout.sessions.expire(firstSession.id);
    await until(() => getDb().select().from(payments).where(eq(payments.checkoutSessionId, firstSession.id)).get()?.status === "expired");
    // The owner tries again: a fresh session for the same quote version.
    const second = await approveJob(owner, job.id);
    expect(second.checkoutUrl).not.toBe(first.checkoutUrl);
    await payOnPage(second.checkoutUrl!, SUCCESS_CARD);
    await until(() => getDb().select().from(repairJobs).where(eq(repairJobs.id, job.id)).get()?.state === "paid");
    // The old session's expiry is delivered again, late: nothing goes back.
    const expired = fake.events().find((e) => e.type === "checkout.session.expired" && (e.data.object as { id: string }).id === firstSession.id)!;
    await fake.redeliver(expired.id);
    expect(getDb().select().from(repairJobs).where(eq(repairJobs.id, job.id)).get()!.state).toBe("paid");
    const rows = getDb().select().from(payments).where(eq(payments.jobId, job.id)).all();
    expect(rows.map((r) => r.status).sort()).toEqual(["expired", "paid"]);
  });

  it("a declined card leaves the job approved and unpaid, with the decline shown on the page", async () => {
    const { owner, job } = await quotedJob();
    const { checkoutUrl } = await approveJob(owner, job.id);
    const res = await payOnPage(checkoutUrl!, DECLINE_CARD);
    expect(res.status).toBe(402);
    expect(await res.text()).toContain("Your card was declined.");
    await new Promise((r) => setTimeout(r, 300));
    const after = getDb().select().from(repairJobs).where(eq(repairJobs.id, job.id)).get()!;
    expect(after.state).toBe("approved");
    expect(after.paidAt).toBeNull();
  });

  it("cancelling a paid job refunds it through the SDK; the payment shows it when charge.refunded arrives", async () => {
    const { owner, job, staff } = await quotedJob();
    const { checkoutUrl } = await approveJob(owner, job.id);
    await payOnPage(checkoutUrl!, SUCCESS_CARD);
    await until(() => getDb().select().from(repairJobs).where(eq(repairJobs.id, job.id)).get()?.state === "paid");
    const cancelled = await cancelJob({ ctx: staff }, job.id);
    expect(cancelled.state).toBe("cancelled");
    const refunded = await until(() => getDb().select().from(payments).where(eq(payments.jobId, job.id)).get()?.status === "refunded" && true);
    expect(refunded).toBe(true);
    await waitForMail({ to: owner.email, subject: /refund/i });
  });

  it.each([
    ["USD", 2],
    ["EUR", 2],
    ["JPY", 0],
  ] as const)("%s amounts reach the fake in minor units (ISO 4217 exponent %i) and match quote()", async (currency, exponent) => {
    const { owner, job, studio, product } = await quotedJob(currency, "partly_covered");
    const { checkoutUrl } = await approveJob(owner, job.id);
    const session = fake.sessions().find((s) => s.url === checkoutUrl)!;
    expect(session.currency).toBe(currency.toLowerCase());
    expect(session.amount_total).toBe(job.totalMinor);
    expect(Number.isInteger(session.amount_total)).toBe(true);
    // ISO 4217: the product prices the studio keeps are in the same minor unit the session carries.
    expect(currencyExponent(currency)).toBe(exponent);
    // Same inputs straight through the care engine: tax rounding and covered share agree to the minor unit.
    const expected = quote({
      tasks: ["reoil"],
      areaM2: 1.8,
      rates: { labourPerHourMinor: studio.labourRateMinor },
      products: [{ taskKind: "reoil", label: product.name, coverageM2PerL: 24, coats: 1, containerSizesMl: [125], containerPricesMinor: { 125: product.containers[0]!.priceMinor } }],
      travel: { flatMinor: studio.travelFeeMinor },
      taxRatePct: 8.25,
      coveredPct: 40,
      currency,
    });
    expect(job.totalMinor).toBe(expected.totalMinor);
    expect(job.taxMinor).toBe(expected.taxMinor);
  });

  it("refuses illegal moves: approving twice after payment, paying a fully covered job", async () => {
    const covered = await quotedJob("USD", "covered");
    expect(covered.job.state).toBe("covered");
    await expect(approveJob(covered.owner, covered.job.id)).rejects.toMatchObject({ status: 409 });
    const other = await createUser();
    await expect(approveJob(other, covered.job.id)).rejects.toMatchObject({ status: 404 });
  });
});
