// Repair jobs paid through the real stripe SDK against the local Stripe fake over HTTP. The fake's
// webhooks arrive at a small receiver in this test that hands the raw body to the product's handler.
import { eq } from "drizzle-orm";
import { createElement } from "react";
import { renderToStaticMarkup } from "react-dom/server";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { JobPayments } from "@/components/jobs/job-payments";
import { getDb } from "@/db/client";
import { payments, repairJobs, stripeEvents } from "@/db/schema";
import { DECLINE_CARD, startStripeFake, SUCCESS_CARD, type StripeFake } from "@/lib/fakes/stripe-fake";
import { getStudioJob, createJob, listOwnerJobs, listStudioJobs } from "@/lib/repairs/jobs";
import { jobAmountText } from "@/lib/repairs/states";
import { receiptPdf } from "@/lib/repairs/receipt";
import { ownerActor } from "@/lib/auth/actor";
import { approveJob, cancelJob, handleStripeWebhook, sendQuote, updateJobQuote } from "@/lib/repairs/payment";
import { getStripe } from "@/lib/payments/stripe";
import { formatMoney } from "@/lib/format";
import { currencyExponent, quote } from "@/lib/care/quote";
import { createAcceptedClaim, createPiece, createProduct, createStudio, createUser, memberContext, unique } from "../support/fixtures";
import { replyAddress } from "@/lib/messages/reply-address";
import { findThread } from "@/lib/messages/store";
import { listMail, waitForMail } from "../support/mail";
import { extraCheckout } from "../support/repair-quote";
import { startWebhookReceiver, until, webhookGate, type WebhookReceiver } from "../support/stripe-receiver";

let fake: StripeFake;
let receiver: WebhookReceiver;
const webhookAnswers: number[] = [];
const gate = webhookGate();
const holdWebhooks = gate.hold;
const release = gate.release;

beforeAll(async () => {
  receiver = await startWebhookReceiver(
    async (raw, sig) => {
      await gate.passed();
      return handleStripeWebhook(raw, sig);
    },
    (status) => webhookAnswers.push(status),
  );
  fake = await startStripeFake({
    port: Number(process.env.STRIPE_API_PORT),
    secretKey: process.env.STRIPE_SECRET_KEY!,
    webhookSecret: process.env.STRIPE_WEBHOOK_SECRET!,
    webhookUrl: `${receiver.url}/`,
    retryDelaysMs: [200, 400],
  });
});

afterAll(async () => {
  await fake.close();
  await receiver.close();
});

/** Pays on the fake's hosted page as a browser would: a form POST with the card number. */
async function payOnPage(url: string, card: string) {
  return fetch(url, { method: "POST", body: new URLSearchParams({ card }), redirect: "manual" });
}

async function quotedJob(currency = "USD", decision: "chargeable" | "partly_covered" | "covered" = "chargeable") {
  const studio = createStudio({ email: `${unique("studio")}@test.example`, currency, labourRateMinor: currency === "JPY" ? 9000 : 8500, travelFeeMinor: currency === "JPY" ? 3000 : 4500, taxRateBp: 825 });
  const staff = await memberContext(studio, "staff");
  const owner = await createUser();
  const { piece } = createPiece(studio, { ownerId: owner.id });
  const product = createProduct(studio, { containers: [{ ml: 125, priceMinor: currency === "JPY" ? 2500 : 1900 }] });
  const claim = createAcceptedClaim(studio, piece.id, owner.id, decision, 40);
  const job = createJob(staff, "claim", claim.id);
  await updateJobQuote(staff, job.id, { title: "Refresh the top", tasks: ["reoil"], productIds: [product.id], coats: 1, travel: true, coveredPct: job.coveredPct, notes: "" });
  await sendQuote(staff, job.id);
  return { studio, staff, owner, piece, product, job: getStudioJob(staff, job.id).job };
}

describe("repair job payment through the Stripe fake", () => {
  it("quote → approve → checkout → pay on the fake page → signed webhook → paid, recorded, receipt", async () => {
    const { owner, job, staff } = await quotedJob();
    const quoteMail = await waitForMail({ to: owner.email, subject: /quote/i });
    expect(quoteMail.text).toContain("To pay:");
    // Answering the quote mail reaches the job's conversation (lib/messages).
    expect(quoteMail.headers["reply-to"]).toContain(replyAddress(findThread(getDb(), { kind: "job", id: job.id })!.id));

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
    // Money reads one way (lib/owner/format formatMoney): "$207.30" for a US studio, never "207.30 USD".
    expect(receipt.text).toContain(formatMoney(job.totalMinor, "USD", "US"));
    expect(receipt.text).not.toMatch(/\d USD/);
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
    const cancelled = await cancelJob(staff, job.id);
    expect(cancelled.state).toBe("cancelled");
    const refunded = await until(() => getDb().select().from(payments).where(eq(payments.jobId, job.id)).get()?.status === "refunded" && true);
    expect(refunded).toBe(true);
    await waitForMail({ to: owner.email, subject: /refund/i });
    // Both lists of jobs say the money went back, not the bare total beside the Cancelled badge.
    for (const rows of [listOwnerJobs(owner), listStudioJobs(staff, {})]) {
      expect(jobAmountText(rows.find((r) => r.id === job.id)!, "US")).toBe(`Refunded ${formatMoney(job.totalMinor, "USD", "US")}`);
    }
    // The job had a payment: its receipt is still there, for the owner and for staff, with the payment and its refund (time with its zone).
    for (const actor of [ownerActor(owner), staff]) {
      const { buffer, data } = await receiptPdf(actor, job.id);
      expect(buffer.subarray(0, 5).toString()).toBe("%PDF-");
      expect(data.reference).toMatch(/^pi_test_/);
      expect(data.figures.text.total).toBe(formatMoney(job.totalMinor, "USD", "US"));
      expect(data.refunds).toHaveLength(1);
      expect(data.refunds[0]!.amount).toBe(formatMoney(job.totalMinor, "USD", "US"));
      expect(data.refunds[0]!.why).toBe("The job was cancelled.");
      expect(data.refunds[0]!.on).toMatch(/^\d{1,2} [A-Z][a-z]+ \d{4}(,| at) \d{2}:\d{2} \S+$/);
      expect(data.kept).toBe(formatMoney(0, "USD", "US"));
    }
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

const jobRow = (jobId: string) => getDb().select().from(repairJobs).where(eq(repairJobs.id, jobId)).get()!;
const paymentRows = (jobId: string) => getDb().select().from(payments).where(eq(payments.jobId, jobId)).all();
const sessionOf = (url: string | null) => fake.sessions().find((s) => s.url === url)!;
/** The payments list of the staff's job page, rendered from the job's rows as the page renders it. */
const staffPaymentsHtml = (jobId: string) =>
  renderToStaticMarkup(createElement(JobPayments, { currentQuoteVersion: jobRow(jobId).quoteVersion, payments: paymentRows(jobId).map((p) => ({ ...p, openedOn: "2 December 2026" })) }));

/** What the owner's card really paid for this job, net of refunds, as the fake holds it. */
function netCharged(jobId: string) {
  const intents = new Set(fake.sessions().filter((s) => s.client_reference_id === jobId && s.payment_intent).map((s) => s.payment_intent));
  const charges = fake.charges().filter((c) => intents.has(c.payment_intent));
  return { count: charges.length, net: charges.reduce((sum, c) => sum + c.amount - c.amount_refunded, 0), refunded: charges.filter((c) => c.amount_refunded === c.amount).length };
}

/** Staff re-price the job (two coats instead of one) and send the new quote. */
async function requote(staff: Awaited<ReturnType<typeof quotedJob>>["staff"], jobId: string, productId: string) {
  const before = getStudioJob(staff, jobId).job;
  await updateJobQuote(staff, jobId, { title: "Refresh the top", tasks: ["reoil"], productIds: [productId], coats: 2, travel: true, coveredPct: before.coveredPct, notes: "" });
  await sendQuote(staff, jobId);
  return getStudioJob(staff, jobId).job;
}

describe("a checkout that no longer matches its job never pays it", () => {
  it("stale session: after the quote changes and is sent again, the old checkout is closed and can't be paid; the new amount is what is charged", async () => {
    const { owner, staff, job, product } = await quotedJob();
    const first = await approveJob(owner, job.id);
    const oldSession = sessionOf(first.checkoutUrl);

    const requoted = await requote(staff, job.id, product.id);
    expect(requoted.totalMinor).toBeGreaterThan(job.totalMinor);
    expect(requoted.quoteVersion).toBe(job.quoteVersion + 1);
    // Closed through the SDK when the quote changed: the payment service itself refuses it now.
    expect(fake.sessions().find((s) => s.id === oldSession.id)!.status).toBe("expired");
    const refused = await payOnPage(first.checkoutUrl!, SUCCESS_CARD);
    expect(refused.status).toBe(410);
    await new Promise((r) => setTimeout(r, 300));
    expect(jobRow(job.id).state).toBe("quoted");
    expect(netCharged(job.id).count).toBe(0);
    expect(paymentRows(job.id).find((p) => p.checkoutSessionId === oldSession.id)!.status).toBe("expired");

    const second = await approveJob(owner, job.id);
    const newSession = sessionOf(second.checkoutUrl);
    expect(newSession.metadata.quoteVersion).toBe(String(requoted.quoteVersion));
    expect(newSession.amount_total).toBe(requoted.totalMinor);
    expect((await payOnPage(second.checkoutUrl!, SUCCESS_CARD)).status).toBe(303);
    await until(() => jobRow(job.id).state === "paid");
    expect(paymentRows(job.id).find((p) => p.checkoutSessionId === newSession.id)).toMatchObject({ status: "paid", quoteVersion: requoted.quoteVersion, amountMinor: requoted.totalMinor, refundReason: null });
    expect(netCharged(job.id)).toMatchObject({ count: 1, net: requoted.totalMinor });
  });

  it("stale session: a checkout for the old quote that completes anyway is refunded automatically, the job is not paid at the old amount, and both sides are told", async () => {
    const { owner, staff, studio, job, product } = await quotedJob();
    await approveJob(owner, job.id);
    const requoted = await requote(staff, job.id, product.id);
    await approveJob(owner, job.id);
    const stale = await extraCheckout(requoted, job.quoteVersion, job.totalMinor);

    const since = new Date();
    expect((await payOnPage(stale.url!, SUCCESS_CARD)).status).toBe(303);
    const row = await until(() => paymentRows(job.id).find((p) => p.checkoutSessionId === stale.id && p.status === "refunded"));
    expect(row).toMatchObject({ refundReason: "older_quote", refundedMinor: job.totalMinor, quoteVersion: job.quoteVersion });
    expect(jobRow(job.id)).toMatchObject({ state: "approved", paidAt: null, totalMinor: requoted.totalMinor });
    expect(netCharged(job.id)).toMatchObject({ count: 1, net: 0, refunded: 1 });

    const amount = formatMoney(job.totalMinor, "USD", "US");
    const toOwner = await waitForMail({ to: owner.email, subject: /refund/i, since });
    expect(toOwner.text).toContain(amount);
    expect(toOwner.text).toMatch(/earlier version of the quote/i);
    const toStudio = await waitForMail({ to: studio.email, subject: /refunded automatically/i, since });
    expect(toStudio.text).toContain(amount);
    expect((await listMail({ to: owner.email })).filter((m) => /receipt/i.test(m.subject))).toHaveLength(0);
    expect(staffPaymentsHtml(job.id)).toContain("Refunded automatically: paid for an older quote");
  });

  it("double pay: two checkouts for one job both completed → one counts, the other is refunded; cancelling then refunds the one that counted too", async () => {
    const { owner, staff, studio, job } = await quotedJob();
    const first = await approveJob(owner, job.id);
    const approved = jobRow(job.id);
    const extra = await extraCheckout(approved, approved.quoteVersion, approved.totalMinor);

    const since = new Date();
    holdWebhooks();
    expect((await payOnPage(first.checkoutUrl!, SUCCESS_CARD)).status).toBe(303);
    expect((await payOnPage(extra.url!, SUCCESS_CARD)).status).toBe(303);
    expect(netCharged(job.id)).toMatchObject({ count: 2, net: 2 * job.totalMinor });
    release();

    await until(() => paymentRows(job.id).some((p) => p.status === "refunded") && jobRow(job.id).state === "paid");
    const rows = paymentRows(job.id);
    expect(rows.filter((p) => p.status === "paid" && p.refundReason === null)).toHaveLength(1);
    expect(rows.filter((p) => p.status === "refunded" && p.refundReason === "already_paid")).toHaveLength(1);
    expect(netCharged(job.id)).toMatchObject({ count: 2, net: job.totalMinor, refunded: 1 });
    await waitForMail({ to: owner.email, subject: /refund/i, since });
    await waitForMail({ to: studio.email, subject: /refunded automatically/i, since });
    expect(staffPaymentsHtml(job.id)).toContain("Refunded automatically: the job was already paid");

    const cancelled = await cancelJob(staff, job.id);
    expect(cancelled.state).toBe("cancelled");
    await until(() => paymentRows(job.id).every((p) => p.status === "refunded"));
    expect(netCharged(job.id)).toMatchObject({ count: 2, net: 0, refunded: 2 });
  });

  it("cancel after two payments whose webhooks have not arrived yet: both are refunded, and replaying every event in reverse changes nothing", async () => {
    const { owner, staff, job } = await quotedJob();
    const first = await approveJob(owner, job.id);
    const approved = jobRow(job.id);
    const extra = await extraCheckout(approved, approved.quoteVersion, approved.totalMinor);

    holdWebhooks();
    await payOnPage(first.checkoutUrl!, SUCCESS_CARD);
    await payOnPage(extra.url!, SUCCESS_CARD);
    const cancelled = await cancelJob(staff, job.id);
    expect(cancelled.state).toBe("cancelled");
    release();

    await until(() => paymentRows(job.id).every((p) => p.status === "refunded"));
    expect(netCharged(job.id)).toMatchObject({ count: 2, net: 0, refunded: 2 });
    expect(jobRow(job.id).state).toBe("cancelled");
    await new Promise((r) => setTimeout(r, 300));
    const settled = () => paymentRows(job.id).map((p) => ({ ...p, updatedAt: null }));
    const rowsBefore = settled();
    const mailBefore = (await listMail({ to: owner.email })).length;

    const intents = new Set(fake.sessions().filter((s) => s.client_reference_id === job.id).map((s) => s.payment_intent));
    const mine = fake.events().filter((e) => {
      const o = e.data.object as { client_reference_id?: string; payment_intent?: string };
      return o.client_reference_id === job.id || (o.payment_intent && intents.has(o.payment_intent));
    });
    expect(mine.length).toBeGreaterThanOrEqual(4);
    for (const e of [...mine].reverse()) expect(await fake.redeliver(e.id)).toBe(200);
    await new Promise((r) => setTimeout(r, 300));
    expect(settled()).toEqual(rowsBefore);
    expect(jobRow(job.id).state).toBe("cancelled");
    expect(netCharged(job.id)).toMatchObject({ count: 2, net: 0, refunded: 2 });
    expect((await listMail({ to: owner.email })).length).toBe(mailBefore);
  });

  it("a cancel whose refund the payment service refuses still cancels, keeps the refund owed and flagged, and says how to try again", async () => {
    const { job, staff } = await quotedJob();
    // A paid job whose payment the payment service does not know (as the demo's seeded payments).
    getDb().update(repairJobs).set({ state: "paid", paidAt: new Date() }).where(eq(repairJobs.id, job.id)).run();
    getDb()
      .insert(payments)
      .values({ studioId: job.studioId, jobId: job.id, quoteVersion: job.quoteVersion, checkoutSessionId: `cs_test_unknown_${job.id}`, amountMinor: job.totalMinor, currency: job.currency, status: "paid", paymentIntentId: `pi_test_unknown_${job.id}`, paidAt: new Date() })
      .run();
    await expect(cancelJob(staff, job.id)).rejects.toMatchObject({ status: 409, message: expect.stringMatching(/^The job is cancelled, but its refund has not gone through yet\. .*Send the refund again/) });
    expect(jobRow(job.id).state).toBe("cancelled");
    expect(paymentRows(job.id)[0]).toMatchObject({ status: "paid", refundReason: "job_cancelled", refundRequestedAt: null });
    expect(staffPaymentsHtml(job.id)).toContain("Refund not sent yet");
    // Asking again goes to the payment service again (still refused here), rather than "can't cancel a cancelled job".
    await expect(cancelJob(staff, job.id)).rejects.toMatchObject({ status: 409, message: expect.stringMatching(/^The job stays cancelled, but/) });
  });
});
