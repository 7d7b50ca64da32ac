// Staff give back all or part of a paid job's payment while the job stays done (lib/repairs/refunds.ts):
// through the real stripe SDK against the Stripe fake over HTTP, on a real SQLite file, with the owner's
// mail read from the real SMTP sink. Also: every refund on the receipt (PDF data and mail), and the
// job lists' words for a part refund.
import { and, eq } from "drizzle-orm";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { getDb } from "@/db/client";
import { auditLog, jobRefunds, payments, repairJobs, users, type RepairJob } from "@/db/schema";
import { env } from "@/lib/env";
import { startStripeFake, SUCCESS_CARD, type StripeFake } from "@/lib/fakes/stripe-fake";
import { ownerActor } from "@/lib/auth/actor";
import { formatMoney } from "@/lib/format";
import { listOwnerJobs, listStudioJobs, moveJob } from "@/lib/repairs/jobs";
import { approveJob, cancelJob, handleStripeWebhook, sendQuote, updateJobQuote } from "@/lib/repairs/payment";
import { receiptPdf } from "@/lib/repairs/receipt";
import { finishJobRefund, PENDING_REFUND_WAIT_MS, refundJob } from "@/lib/repairs/refunds";
import { jobRefundsJob } from "@/jobs/job-refunds";
import { getStripe } from "@/lib/payments/stripe";
import { jobAmountText } from "@/lib/repairs/states";
import { createStudio, memberContext, unique } from "../support/fixtures";
import { extraCheckout, quotedRepairJob } from "../support/repair-quote";
import { listMail, waitForMail } from "../support/mail";
import { startWebhookReceiver, until, webhookGate, type WebhookReceiver } from "../support/stripe-receiver";

// While held, the fake's webhooks wait at the receiver: two payments can both complete before the app hears of either.
const gate = webhookGate();
let fake: StripeFake;
let receiver: WebhookReceiver;
const stripe = {
  get fake() {
    return fake;
  },
};
beforeAll(async () => {
  receiver = await startWebhookReceiver(async (raw, sig) => {
    await gate.passed();
    return handleStripeWebhook(raw, sig);
  });
  fake = await startStripeFake({ port: 0, secretKey: env.STRIPE_SECRET_KEY, webhookSecret: env.STRIPE_WEBHOOK_SECRET, webhookUrl: `${receiver.url}/`, retryDelaysMs: [200, 400] });
  env.STRIPE_API_PORT = fake.port;
});
afterAll(async () => {
  await fake.close();
  await receiver.close();
});

const jobRow = (jobId: string) => getDb().select().from(repairJobs).where(eq(repairJobs.id, jobId)).get()!;
const paymentRows = (jobId: string) => getDb().select().from(payments).where(eq(payments.jobId, jobId)).all();
/** What the fake's charges for this job hold: the money that really moved. */
function charged(jobId: string) {
  const intents = new Set(stripe.fake.sessions().filter((s) => s.client_reference_id === jobId && s.payment_intent).map((s) => s.payment_intent));
  const charges = stripe.fake.charges().filter((c) => intents.has(c.payment_intent));
  return { count: charges.length, refunded: charges.reduce((sum, c) => sum + c.amount_refunded, 0) };
}
const payOnPage = (url: string) => fetch(url, { method: "POST", body: new URLSearchParams({ card: SUCCESS_CARD }), redirect: "manual" });
// "3 December 2026, 14:05 PST": the formatter's date and time, with the zone named.
const INSTANT = /\d{1,2} [A-Z][a-z]+ \d{4}(?:,| at) \d{2}:\d{2} [A-Z][A-Za-z0-9+\-:]+/;

async function quotedJob() {
  const studio = createStudio({ email: `${unique("studio")}@test.example`, currency: "USD", labourRateMinor: 8500, travelFeeMinor: 4500, taxRateBp: 825 });
  const made = await quotedRepairJob(studio);
  // The owner reads times in their own zone.
  getDb().update(users).set({ timeZone: "America/Chicago" }).where(eq(users.id, made.owner.id)).run();
  return { studio, ...made };
}

/** A job paid on the fake's page, its visit done: the job the studio wants to give money back on. */
async function doneJob() {
  const made = await quotedJob();
  const { checkoutUrl } = await approveJob(made.owner, made.job.id);
  expect((await payOnPage(checkoutUrl!)).status).toBe(303);
  await until(() => jobRow(made.job.id).state === "paid");
  getDb().transaction((tx) => moveJob(tx, moveJob(tx, jobRow(made.job.id), "scheduled"), "done"));
  return { ...made, job: jobRow(made.job.id) };
}

const ask = (job: RepairJob, refundableMinor: number, amountMinor: number, reason = "The second drawer's runner was not replaced as quoted.") => ({ version: job.version, refundableMinor, amountMinor, reason });

describe("staff give money back on a job that stays done", () => {
  it("a part: Stripe refunds that amount, the job stays done, the owner is mailed with the reason, lists, receipt and audit say it", async () => {
    const { owner, staff, studio, job } = await doneJob();
    const since = new Date();
    const { job: after, refund } = await refundJob(staff, job.id, ask(job, job.totalMinor, 4000));
    expect(after.state).toBe("done");
    expect(charged(job.id)).toEqual({ count: 1, refunded: 4000 });
    expect(refund).toMatchObject({ amountMinor: 4000, stripeRefundId: expect.stringMatching(/^re_/), refundedAt: expect.any(Date) });
    expect(paymentRows(job.id)[0]).toMatchObject({ status: "partially_refunded", refundedMinor: 4000, refundReason: null });

    const paid = formatMoney(job.totalMinor, "USD", "US");
    const mail = await waitForMail({ to: owner.email, subject: /gave back \$40\.00/, since });
    expect(mail.text).toContain("The second drawer's runner was not replaced as quoted.");
    expect(mail.text).toMatch(INSTANT);
    expect(mail.text).toContain(`You paid ${paid}; after what was given back, ${formatMoney(job.totalMinor - 4000, "USD", "US")} stays paid.`);
    // One mail for one refund: the charge.refunded that follows does not send the cancellation's "Refund from …" too.
    await new Promise((r) => setTimeout(r, 500));
    expect((await listMail({ to: owner.email })).filter((m) => /refund|gave back/i.test(m.subject))).toHaveLength(1);

    for (const rows of [listOwnerJobs(owner), listStudioJobs(staff, {})]) {
      expect(jobAmountText(rows.find((r) => r.id === job.id)!, "US")).toBe(`${paid} paid, $40.00 refunded`);
    }
    for (const actor of [ownerActor(owner), staff]) {
      const { data } = await receiptPdf(actor, job.id);
      expect(data.refunds).toHaveLength(1);
      expect(data.refunds[0]).toMatchObject({ amount: "$40.00", why: "The second drawer's runner was not replaced as quoted." });
      expect(data.refunds[0]!.on).toMatch(INSTANT);
      expect(data.kept).toBe(formatMoney(job.totalMinor - 4000, "USD", "US"));
    }
    const audit = getDb().select().from(auditLog).where(and(eq(auditLog.action, "job.refunded"), eq(auditLog.subjectId, job.id))).all();
    expect(audit).toHaveLength(1);
    expect(audit[0]).toMatchObject({ studioId: studio.id, actorId: staff.user.id, data: expect.objectContaining({ amountMinor: 4000, reason: "The second drawer's runner was not replaced as quoted.", part: true }) });
  });

  it("the same confirmation sent again, or two clicks at once, gives back once; a stale amount is a 409 and moves no money", async () => {
    const { staff, job } = await doneJob();
    const confirm = ask(job, job.totalMinor, 1500);
    const both = await Promise.allSettled([refundJob(staff, job.id, confirm), refundJob(staff, job.id, confirm)]);
    expect(both.filter((r) => r.status === "fulfilled")).toHaveLength(1);
    expect(both.find((r) => r.status === "rejected")).toMatchObject({ reason: { status: 409, message: expect.stringMatching(/^The job changed since this page was opened, so nothing was given back\./) } });
    await expect(refundJob(staff, job.id, confirm)).rejects.toMatchObject({ status: 409 });
    // The current version, but the refundable amount from before the first refund.
    await expect(refundJob(staff, job.id, ask(jobRow(job.id), job.totalMinor, 1500))).rejects.toMatchObject({ status: 409, message: expect.stringMatching(/^What can still be given back isn't the amount shown/) });
    expect(charged(job.id)).toEqual({ count: 1, refunded: 1500 });
    expect(getDb().select().from(jobRefunds).where(eq(jobRefunds.jobId, job.id)).all()).toHaveLength(1);
  });

  it("the rest, then nothing more: lists read 'Refunded' and a further refund is refused", async () => {
    const { owner, staff, job } = await doneJob();
    await refundJob(staff, job.id, ask(job, job.totalMinor, 1000));
    const rest = job.totalMinor - 1000;
    await refundJob(staff, job.id, ask(jobRow(job.id), rest, rest, "Goodwill: the owner waited three weeks."));
    expect(charged(job.id)).toEqual({ count: 1, refunded: job.totalMinor });
    await until(() => paymentRows(job.id)[0]!.status === "refunded");
    expect(jobRow(job.id).state).toBe("done");
    expect(jobAmountText(listOwnerJobs(owner).find((r) => r.id === job.id)!, "US")).toBe(`Refunded ${formatMoney(job.totalMinor, "USD", "US")}`);
    await expect(refundJob(staff, job.id, ask(jobRow(job.id), 0, 1))).rejects.toMatchObject({ status: 409, message: "Everything paid for this job has already been given back." });
    // The receipt is still there, with both refunds and nothing left paid.
    const { data } = await receiptPdf(ownerActor(owner), job.id);
    expect(data.refunds.map((r) => r.why)).toEqual(["The second drawer's runner was not replaced as quoted.", "Goodwill: the owner waited three weeks."]);
    expect(data.kept).toBe("$0.00");
  });

  it("more than is left is a 400 with the field's words; a cancelled or unpaid job is a 409; another studio gets a 404", async () => {
    const { staff, job, studio } = await doneJob();
    await expect(refundJob(staff, job.id, ask(job, job.totalMinor, job.totalMinor + 1))).rejects.toMatchObject({
      status: 400,
      message: `At most ${formatMoney(job.totalMinor, "USD", "US")} can be given back.`,
      fieldErrors: { amountMinor: [`Enter ${formatMoney(job.totalMinor, "USD", "US")} or less.`] },
    });
    const other = createStudio({ email: `${unique("other")}@test.example` });
    await expect(refundJob(await memberContext(other, "admin"), job.id, ask(job, job.totalMinor, 100))).rejects.toMatchObject({ status: 404 });
    const unpaid = await quotedJob();
    await expect(refundJob(unpaid.staff, unpaid.job.id, ask(unpaid.job, 0, 100))).rejects.toMatchObject({ status: 409, message: "This job has no card payment to give money back from." });
    expect(charged(job.id).refunded).toBe(0);
    expect(studio.id).not.toBe(other.id);
  });

  it("when Stripe answers no, nothing is given back and nothing stays set aside; asked again on the reloaded page, it goes through once", async () => {
    const { staff, job } = await doneJob();
    // Stripe refuses a refund of a payment it does not know (resource_missing): a definite no.
    const paid = paymentRows(job.id).find((p) => p.paymentIntentId)!;
    getDb().update(payments).set({ paymentIntentId: "pi_not_at_stripe" }).where(eq(payments.id, paid.id)).run();
    await expect(refundJob(staff, job.id, ask(job, job.totalMinor, 2500))).rejects.toMatchObject({ status: 409, code: "payment_service_refused" });
    expect(getDb().select().from(jobRefunds).where(eq(jobRefunds.jobId, job.id)).all()).toHaveLength(0);
    getDb().update(payments).set({ paymentIntentId: paid.paymentIntentId }).where(eq(payments.id, paid.id)).run();
    expect(charged(job.id).refunded).toBe(0);
    await refundJob(staff, job.id, ask(jobRow(job.id), job.totalMinor, 2500));
    expect(charged(job.id).refunded).toBe(2500);
  });

  it("when the payment service does not answer, the refund stays pending with its amount set aside; finishing it asks with the same key, so the money goes back once and the owner is mailed once", async () => {
    const { owner, staff, job } = await doneJob();
    const since = new Date();
    stripe.fake.failNext("POST", "/v1/refunds"); // the fake says not to retry: the SDK gives up at once
    await expect(refundJob(staff, job.id, ask(job, job.totalMinor, 2500))).rejects.toMatchObject({ status: 503, code: "refund_pending", message: expect.stringMatching(/can't tell yet whether \$25\.00 went back/) });
    const [pending] = getDb().select().from(jobRefunds).where(eq(jobRefunds.jobId, job.id)).all();
    expect(pending).toMatchObject({ amountMinor: 2500, refundedAt: null, stripeRefundId: null });
    expect(charged(job.id).refunded).toBe(0);
    // Set aside: another refund on the same page can't give the same money back again.
    await expect(refundJob(staff, job.id, ask(jobRow(job.id), job.totalMinor, job.totalMinor))).rejects.toMatchObject({ status: 409, message: expect.stringMatching(/^What can still be given back isn't the amount shown/) });
    // Two presses of "Finish giving back" at once: one refund at Stripe, one audit row, one mail.
    const both = await Promise.all([finishJobRefund(staff, job.id, pending!.id), finishJobRefund(staff, job.id, pending!.id)]);
    expect(both.map((b) => b.refund.stripeRefundId)).toEqual([expect.stringMatching(/^re_/), both[0].refund.stripeRefundId]);
    expect(charged(job.id)).toEqual({ count: 1, refunded: 2500 });
    expect(getDb().select().from(auditLog).where(and(eq(auditLog.action, "job.refunded"), eq(auditLog.subjectId, job.id))).all()).toHaveLength(1);
    await waitForMail({ to: owner.email, subject: /gave back \$25\.00/, since });
    await new Promise((r) => setTimeout(r, 300));
    expect((await listMail({ to: owner.email })).filter((m) => /gave back \$25\.00/.test(m.subject) && Date.parse(m.receivedAt) >= since.getTime())).toHaveLength(1);
    // Finishing one already finished changes nothing.
    expect((await finishJobRefund(staff, job.id, pending!.id)).refund.stripeRefundId).toBe(both[0].refund.stripeRefundId);
    expect(charged(job.id).refunded).toBe(2500);
    // Another studio can't reach it.
    const other = await memberContext(createStudio({ email: `${unique("other")}@test.example` }), "admin");
    await expect(finishJobRefund(other, job.id, pending!.id)).rejects.toMatchObject({ status: 404 });
  });

  it("a refund Stripe made whose answer was lost is not made twice when it is finished", async () => {
    const { staff, job } = await doneJob();
    stripe.fake.failNext("POST", "/v1/refunds");
    await expect(refundJob(staff, job.id, ask(job, job.totalMinor, 1200))).rejects.toMatchObject({ status: 503 });
    const [pending] = getDb().select().from(jobRefunds).where(eq(jobRefunds.jobId, job.id)).all();
    // The request reached Stripe after all (as when the answer is lost on the way back): the same key.
    const paid = paymentRows(job.id).find((p) => p.paymentIntentId)!;
    const made = await getStripe(paid).refunds.create({ payment_intent: paid.paymentIntentId!, amount: 1200, metadata: { jobId: job.id, jobRefundId: pending!.id } }, { idempotencyKey: `job-refund-${pending!.id}` });
    expect(charged(job.id).refunded).toBe(1200);
    const { refund } = await finishJobRefund(staff, job.id, pending!.id);
    expect(refund.stripeRefundId).toBe(made.id);
    expect(charged(job.id).refunded).toBe(1200);
  });

  it("a booked job given a part back and then cancelled refunds only the rest, and the owner reads the rest", async () => {
    const { owner, staff, job } = await doneJob();
    // Back to booked: a job whose visit is still to come.
    getDb().update(repairJobs).set({ state: "scheduled" }).where(eq(repairJobs.id, job.id)).run();
    await refundJob(staff, job.id, ask(jobRow(job.id), job.totalMinor, 3000));
    const since = new Date();
    await cancelJob(staff, job.id);
    await until(() => paymentRows(job.id)[0]!.status === "refunded");
    expect(charged(job.id).refunded).toBe(job.totalMinor);
    const mail = await waitForMail({ to: owner.email, subject: /^Refund from/, since });
    expect(mail.text).toContain(formatMoney(job.totalMinor - 3000, "USD", "US"));
    const { data } = await receiptPdf(staff, job.id);
    expect(data.refunds.map((r) => r.amount)).toEqual(["$30.00", formatMoney(job.totalMinor - 3000, "USD", "US")]);
  });

  it("a refund made at Stripe by hand on a job that stands tells the owner what was refunded, not that the work was cancelled", async () => {
    const { owner, job } = await doneJob();
    const since = new Date();
    const paid = paymentRows(job.id).find((p) => p.paymentIntentId)!;
    await getStripe(paid).refunds.create({ payment_intent: paid.paymentIntentId!, amount: 700 });
    const mail = await waitForMail({ to: owner.email, subject: /^Refund from/, since });
    expect(mail.text).toContain(`refunded $7.00 of your payment for “${job.title}”`);
    expect(mail.text).not.toContain("cancelled the work");
    expect(jobRow(job.id).state).toBe("done");
  });
});

describe("the scheduled pass finishes a refund nobody finished", () => {
  /** A done job with a refund of `amount` the payment service didn't answer, pending for `ageMs`. */
  async function leftPending(amount: number, ageMs = PENDING_REFUND_WAIT_MS + 60_000) {
    const made = await doneJob();
    stripe.fake.failNext("POST", "/v1/refunds");
    await expect(refundJob(made.staff, made.job.id, ask(made.job, made.job.totalMinor, amount))).rejects.toMatchObject({ status: 503, code: "refund_pending" });
    const [row] = getDb().select().from(jobRefunds).where(eq(jobRefunds.jobId, made.job.id)).all();
    getDb().update(jobRefunds).set({ createdAt: new Date(Date.now() - ageMs) }).where(eq(jobRefunds.id, row!.id)).run();
    return { ...made, pending: row! };
  }
  const refundRow = (id: string) => getDb().select().from(jobRefunds).where(eq(jobRefunds.id, id)).get();
  const refundAudits = (jobId: string) => getDb().select().from(auditLog).where(and(eq(auditLog.action, "job.refunded"), eq(auditLog.subjectId, jobId))).all();
  const refundMails = async (to: string, subject: RegExp, since: Date) => (await listMail({ to })).filter((m) => subject.test(m.subject) && Date.parse(m.receivedAt) >= since.getTime());

  it("leaves a refund pending for less than the wait alone; then finishes it once, audited as the scheduler's, and mails the owner once", async () => {
    const since = new Date();
    const { owner, staff, job, pending } = await leftPending(1800, 60_000);
    expect((await jobRefundsJob()).some((l) => l.includes(pending.id))).toBe(false);
    expect(refundRow(pending.id)!.refundedAt).toBeNull();
    expect(charged(job.id).refunded).toBe(0);

    // Still no answer from the payment service: it stays pending for the next pass.
    getDb().update(jobRefunds).set({ createdAt: new Date(Date.now() - PENDING_REFUND_WAIT_MS - 60_000) }).where(eq(jobRefunds.id, pending.id)).run();
    stripe.fake.failNext("POST", "/v1/refunds");
    expect((await jobRefundsJob()).some((l) => l.includes(pending.id))).toBe(false);
    expect(refundRow(pending.id)).toMatchObject({ refundedAt: null, stripeRefundId: null });

    const lines = await jobRefundsJob();
    expect(lines).toContain(`finished job refund ${pending.id}`);
    expect(refundRow(pending.id)).toMatchObject({ stripeRefundId: expect.stringMatching(/^re_/), refundedAt: expect.any(Date) });
    expect(charged(job.id)).toEqual({ count: 1, refunded: 1800 });
    const audit = refundAudits(job.id);
    expect(audit).toHaveLength(1);
    expect(audit[0]).toMatchObject({ actorId: null, data: expect.objectContaining({ amountMinor: 1800, source: "scheduler", finishedLater: true, askedBy: staff.user.id }) });
    await waitForMail({ to: owner.email, subject: /gave back \$18\.00/, since });

    // A later pass and a late press of "Finish giving back" change nothing.
    expect((await jobRefundsJob()).some((l) => l.includes(pending.id))).toBe(false);
    expect((await finishJobRefund(staff, job.id, pending.id)).refund.stripeRefundId).toBe(refundRow(pending.id)!.stripeRefundId);
    await new Promise((r) => setTimeout(r, 300));
    expect(charged(job.id).refunded).toBe(1800);
    expect(refundAudits(job.id)).toHaveLength(1);
    expect(await refundMails(owner.email, /gave back \$18\.00/, since)).toHaveLength(1);
  });

  it("a staff press and the pass at the same moment give back once, audit once and mail once", async () => {
    const since = new Date();
    const { owner, staff, job, pending } = await leftPending(2200);
    const [pressed] = await Promise.all([finishJobRefund(staff, job.id, pending.id), jobRefundsJob()]);
    expect(pressed.refund.stripeRefundId).toMatch(/^re_/);
    expect(refundRow(pending.id)!.stripeRefundId).toBe(pressed.refund.stripeRefundId);
    expect(charged(job.id)).toEqual({ count: 1, refunded: 2200 });
    expect(refundAudits(job.id)).toHaveLength(1);
    await waitForMail({ to: owner.email, subject: /gave back \$22\.00/, since });
    await new Promise((r) => setTimeout(r, 300));
    expect(await refundMails(owner.email, /gave back \$22\.00/, since)).toHaveLength(1);
  });

  it("a refusal removes the pending refund: nothing given back, nothing set aside, no mail", async () => {
    const since = new Date();
    const { owner, job, pending } = await leftPending(900);
    const paid = paymentRows(job.id).find((p) => p.paymentIntentId)!;
    getDb().update(payments).set({ paymentIntentId: "pi_not_at_stripe" }).where(eq(payments.id, paid.id)).run();
    try {
      const lines = await jobRefundsJob();
      expect(lines.some((l) => l.includes(pending.id) && /refused/.test(l))).toBe(true);
    } finally {
      getDb().update(payments).set({ paymentIntentId: paid.paymentIntentId }).where(eq(payments.id, paid.id)).run();
    }
    expect(refundRow(pending.id)).toBeUndefined();
    expect(charged(job.id).refunded).toBe(0);
    expect(refundAudits(job.id)).toHaveLength(0);
    await new Promise((r) => setTimeout(r, 300));
    expect(await refundMails(owner.email, /gave back/, since)).toHaveLength(0);
  });
});

describe("every refund on the receipt", () => {
  it("a second checkout paid for the job and refunded on its own shows on the receipt with its time; the list keeps the job's total", async () => {
    const { owner, staff, job } = await quotedJob();
    const first = await approveJob(owner, job.id);
    const approved = jobRow(job.id);
    // A second checkout for the same quote (a second device at the same moment), opened as approveJob does.
    const session = await extraCheckout(approved, approved.quoteVersion, approved.totalMinor);
    gate.hold();
    expect((await payOnPage(first.checkoutUrl!)).status).toBe(303);
    expect((await payOnPage(session.url!)).status).toBe(303);
    gate.release();
    await until(() => jobRow(job.id).state === "paid");
    await until(() => paymentRows(job.id).some((p) => p.refundReason === "already_paid" && p.status === "refunded"));

    for (const actor of [ownerActor(owner), staff]) {
      const { data } = await receiptPdf(actor, job.id);
      expect(data.refunds).toHaveLength(1);
      expect(data.refunds[0]).toMatchObject({ amount: formatMoney(job.totalMinor, "USD", "US"), why: "The work had already been paid by another payment of yours." });
      expect(data.refunds[0]!.on).toMatch(INSTANT);
      // The payment the receipt is for was not given back.
      expect(data.kept).toBeNull();
    }
    for (const rows of [listOwnerJobs(owner), listStudioJobs(staff, {})]) {
      expect(jobAmountText(rows.find((r) => r.id === job.id)!, "US")).toBe(formatMoney(job.totalMinor, "USD", "US"));
    }
  });

  it("the e-mailed receipt lists a refund made before it: a payment for an older quote given back", async () => {
    const { owner, staff, job } = await quotedJob();
    await approveJob(owner, job.id);
    await updateJobQuote(staff, job.id, { title: "Refresh the top", tasks: ["reoil"], productIds: job.quoteInput.productIds ?? [], coats: 2, travel: false, coveredPct: job.coveredPct, notes: "" });
    await sendQuote(staff, job.id);
    const requoted = jobRow(job.id);
    // A checkout for the old quote that completes anyway (opened in the instant the quote changed).
    const stale = await extraCheckout(job, job.quoteVersion, job.totalMinor);
    await payOnPage(stale.url!);
    await until(() => paymentRows(job.id).some((p) => p.refundReason === "older_quote" && p.status === "refunded"));

    const since = new Date();
    const { checkoutUrl } = await approveJob(owner, job.id);
    await payOnPage(checkoutUrl!);
    const receipt = await waitForMail({ to: owner.email, subject: /^Receipt from/, since });
    expect(receipt.text).toContain(formatMoney(requoted.totalMinor, "USD", "US"));
    // The owner's piece, as theirs ("for the work on Cherry writing desk" read as a machine's fill-in).
    expect(receipt.text).toMatch(/for the work on your \S/);
    expect(receipt.text).toMatch(/Refunded/);
    expect(receipt.text).toContain("It was for an earlier version of the quote, which the studio has changed since");
    expect(receipt.text).toContain(formatMoney(job.totalMinor, "USD", "US"));
    expect(receipt.text).toMatch(new RegExp(`On ${INSTANT.source}`));
  });
});
