// Where money moves, tried as someone who shouldn't move it would: a former owner paying a checkout
// opened before they handed the piece on, two plan checkouts paid for one piece, a plan checkout
// opened twice at once. Real SQLite file, the real stripe SDK against the local Stripe fake over HTTP
// (its signed webhooks reach the handlers through tests/support/plans-stripe.ts), the SMTP sink.
// Invented studios, owners and pieces.
import { and, eq } from "drizzle-orm";
import { describe, expect, it } from "vitest";
import { getDb } from "@/db/client";
import { payments, planInvoices, planSubscriptions } from "@/db/schema";
import { addDays, localDate } from "@/lib/care/dates";
import { SUCCESS_CARD } from "@/lib/fakes/stripe-fake";
import { releasePiece } from "@/lib/owner/transfer";
import { cancelPlanAtPeriodEnd, keepStudioPlan, studioPlanDetail } from "@/lib/plans/cancel";
import { resolveHeldPayment } from "@/lib/plans/held";
import { finishRequestedPlanRefunds, refundOf } from "@/lib/plans/refund";
import { finishPlanTransfer } from "@/lib/plans/transfer";
import { startPlanByOtherMeans, startPlanCheckout } from "@/lib/plans/subscriptions";
import { getStudioJob } from "@/lib/repairs/jobs";
import { approveJob, sendQuote, updateJobQuote } from "@/lib/repairs/payment";
import { auditsOf, createPiece, createStudio, createUser, memberContext, unique } from "../support/fixtures";
import { buyPlan, knob, monthlyPlan, plansStripeForFile, subRow, until, yearlyPlan } from "../support/plans-stripe";
import { listMail, waitForMail } from "../support/mail";
import { quotedRepairJob } from "../support/repair-quote";

const stripe = plansStripeForFile();

const payOnPage = (url: string) => fetch(url, { method: "POST", body: new URLSearchParams({ card: SUCCESS_CARD }), redirect: "manual" });
/** Every event the fake has made so far has reached the handlers and been answered 200. */
const settled = () => until(() => stripe.fake.deliveries().length >= stripe.fake.events().length && stripe.fake.deliveries().every((d) => d.status === 200), 15_000);

describe("a former owner and a repair checkout opened before the hand-over", () => {
  it("paying it after handing the piece on, when Stripe did not answer the page's closing at the hand-over, does not pay the job: the money goes back automatically", async () => {
    const studio = createStudio({ email: `${unique("handon-job")}@test.example`, taxRateBp: 0 });
    const { staff, owner, job } = await quotedRepairJob(studio);
    const since = new Date();
    const { checkoutUrl } = await approveJob(owner, job.id);
    // The hand-over closes the page at Stripe (lib/repairs/handed-on.ts); here Stripe is down for that call.
    const sessionId = getDb().select().from(payments).where(eq(payments.jobId, job.id)).get()!.checkoutSessionId;
    stripe.fake.failNext("POST", `/v1/checkout/sessions/${sessionId}/expire`);
    await releasePiece({ ...owner }, job.pieceId, { confirm: true });
    expect(getStudioJob(staff, job.id).job.state).toBe("draft");
    // The payment page was still open in a tab.
    expect((await payOnPage(checkoutUrl!)).status).toBe(303);
    await until(() => getDb().select().from(payments).where(and(eq(payments.jobId, job.id), eq(payments.status, "refunded"))).get(), 15_000);
    await settled();
    const after = getStudioJob(staff, job.id);
    expect(after.job.state).toBe("draft");
    expect(after.payments).toHaveLength(1);
    expect(after.payments[0]).toMatchObject({ status: "refunded", refundedMinor: after.payments[0]!.amountMinor });
    expect(stripe.fake.charges().find((c) => c.payment_intent === after.payments[0]!.paymentIntentId)!.amount_refunded).toBe(after.payments[0]!.amountMinor);
    expect(after.payments[0]!.refundReason).toBe("piece_handed_on");
    // The person who paid is told why, once.
    const mail = await waitForMail({ to: owner.email, subject: /^Refund of /, since });
    expect(mail.text).toContain("after you had handed the piece on");
    expect((await listMail({ to: owner.email })).filter((m) => /^Refund of /.test(m.subject))).toHaveLength(1);
  });
});

describe("an owner approving a quote from a page opened before the studio changed it", () => {
  it("is refused with words while the version or total shown isn't the current one: the job stays quoted and no payment page is opened; the current one goes through", async () => {
    const studio = createStudio({ email: `${unique("stale-approve")}@test.example`, taxRateBp: 0, travelFeeMinor: 4500 });
    const { staff, owner, job } = await quotedRepairJob(studio);
    const shown = { quoteVersion: job.quoteVersion, totalMinor: job.totalMinor };
    // The studio adds travel and sends the quote again while the owner's page is open.
    await updateJobQuote(staff, job.id, { title: "Refresh the top", tasks: ["reoil"], productIds: getStudioJob(staff, job.id).products.map((p) => p.id).slice(0, 1), coats: 1, travel: true, coveredPct: job.coveredPct, notes: "" });
    await sendQuote(staff, job.id);
    const now = getStudioJob(staff, job.id).job;
    expect(now.totalMinor).not.toBe(shown.totalMinor);
    const sessionsBefore = stripe.fake.sessions().length;
    const stale = await approveJob(owner, job.id, shown).catch((e: unknown) => e);
    expect(stale).toMatchObject({ status: 409, message: expect.stringMatching(/^The quote changed since you opened this page/) });
    expect(getStudioJob(staff, job.id).job.state).toBe("quoted");
    expect(stripe.fake.sessions().length).toBe(sessionsBefore);
    // Only the version with the old total is refused as well.
    expect(await approveJob(owner, job.id, { quoteVersion: now.quoteVersion, totalMinor: shown.totalMinor }).catch((e: unknown) => (e as { status: number }).status)).toBe(409);
    const { checkoutUrl } = await approveJob(owner, job.id, { quoteVersion: now.quoteVersion, totalMinor: now.totalMinor });
    expect(stripe.fake.sessions().find((s) => s.url === checkoutUrl)!.amount_total).toBe(now.totalMinor);
  });
});

async function ownerWithPiece(prefix: string) {
  const studio = createStudio({ email: `${unique(prefix)}@test.example`, taxRateBp: 0 });
  const admin = await memberContext(studio, "admin");
  const owner = await createUser();
  const { piece } = createPiece(studio, { ownerId: owner.id, deliveredOn: addDays(localDate(new Date(), "UTC"), -60) });
  return { studio, admin, owner, piece };
}

const invoicesOf = (subscriptionId: string) => getDb().select().from(planInvoices).where(eq(planInvoices.subscriptionId, subscriptionId)).all();

describe("one piece, one plan", () => {
  it("two plan checkouts opened in two tabs: opening the second closes the first, so only one can be paid and one plan covers the piece", async () => {
    const { admin, owner, piece } = await ownerWithPiece("two-plans");
    const yearly = yearlyPlan(admin, { refundRule: "none", transfers: false });
    const monthly = monthlyPlan(admin);
    const first = await startPlanCheckout(owner, piece.id, yearly.id);
    const second = await startPlanCheckout(owner, piece.id, monthly.id);
    // The first tab's page no longer takes the card.
    expect((await payOnPage(first.checkoutUrl)).status).not.toBe(303);
    expect((await payOnPage(second.checkoutUrl)).status).toBe(303);
    await until(() => subRow(second.subscriptionId).state === "running", 15_000);
    await settled();

    const covering = getDb().select().from(planSubscriptions).where(eq(planSubscriptions.pieceId, piece.id)).all().filter((s) => ["running", "grace", "ending"].includes(s.state));
    expect(covering.map((s) => s.id)).toEqual([second.subscriptionId]);
    expect(invoicesOf(first.subscriptionId)).toEqual([]);
    expect(stripe.fake.subscriptions().filter((s) => s.metadata.planSubscriptionId === first.subscriptionId)).toEqual([]);
    // The closed page's plan was never paid: it ended, and isn't asked about again.
    expect(subRow(first.subscriptionId).state).toBe("ended");
  });

  it("a plan paid a moment ago whose webhook hasn't been written yet: starting another plan for the piece is refused, and one plan covers it", async () => {
    const { admin, owner, piece } = await ownerWithPiece("paid-then-other");
    const yearly = yearlyPlan(admin, { refundRule: "none", transfers: false });
    const monthly = monthlyPlan(admin);
    const first = await startPlanCheckout(owner, piece.id, yearly.id);
    expect((await payOnPage(first.checkoutUrl)).status).toBe(303);
    // Straight after paying, before (or while) the webhook is handled.
    const again = await startPlanCheckout(owner, piece.id, monthly.id).catch((e: unknown) => e);
    expect(again).toMatchObject({ status: 409, message: "This piece is already under a care plan." });
    await until(() => subRow(first.subscriptionId).state === "running", 15_000);
    await settled();
    const rows = getDb().select().from(planSubscriptions).where(eq(planSubscriptions.pieceId, piece.id)).all();
    expect(rows.map((r) => [r.id, r.state])).toEqual([[first.subscriptionId, "running"]]);
    expect(stripe.fake.subscriptions().filter((s) => s.customer === subRow(first.subscriptionId).stripeCustomerId && s.status !== "canceled")).toHaveLength(1);
  });

  it("the same plan's checkout opened twice at once gives one payment page; a second subscription paid anyway is not taken as the plan's", async () => {
    const { admin, owner, piece } = await ownerWithPiece("twice-at-once");
    const yearly = yearlyPlan(admin, { refundRule: "none", transfers: false });
    // The second click lands while the first is still talking to Stripe.
    const [a, b] = await Promise.all([startPlanCheckout(owner, piece.id, yearly.id), new Promise((r) => setTimeout(r, 3)).then(() => startPlanCheckout(owner, piece.id, yearly.id))]);
    expect(a.subscriptionId).toBe(b.subscriptionId);
    expect(b.checkoutUrl).toBe(a.checkoutUrl);
    // Whatever the pages were, both are paid.
    for (const url of new Set([a.checkoutUrl, b.checkoutUrl])) expect((await payOnPage(url)).status).toBe(303);
    await until(() => subRow(a.subscriptionId).state === "running", 15_000);
    await settled();
    const row = subRow(a.subscriptionId);
    const live = stripe.fake.subscriptions().filter((s) => s.metadata.planSubscriptionId === a.subscriptionId && s.status !== "canceled");
    expect(live.map((s) => s.id)).toEqual([row.stripeSubscriptionId]);
  });
});

describe("a renewal charged on the former owner's card after the hand-over, before Stripe was told", () => {
  const chargesOf = (stripeSubId: string) => {
    const intents = stripe.fake.invoices().filter((i) => i.parent.subscription_details.subscription === stripeSubId).flatMap((i) => i.payments.data.map((p) => p.payment.payment_intent));
    return stripe.fake.charges().filter((c) => intents.includes(c.payment_intent));
  };

  for (const transfers of [true, false]) {
    it(`${transfers ? "a plan that moves with the piece" : "a plan that ends at the hand-over"}: the renewal does not count, the plan gets no new period, and the money goes back`, async () => {
      const { admin, owner, piece } = await ownerWithPiece(transfers ? "renew-moved" : "renew-ended");
      const plan = yearlyPlan(admin, { refundRule: "none", transfers });
      const sub = await buyPlan(stripe.fake, owner, piece.id, plan.id);
      const sid = sub.stripeSubscriptionId!;
      stripe.fake.failNext(transfers ? "POST" : "DELETE", `/v1/subscriptions/${sid}`);
      await releasePiece({ ...owner }, piece.id, { confirm: true });
      expect(subRow(sub.id).transferStep).toBe("stripe");
      const before = subRow(sub.id);
      const since = new Date();
      // The period ends before the retry reaches Stripe: Stripe renews on the card it has.
      expect((await knob(stripe.fake, sid, "renew", "outcome=pay")).status).toBe(200);
      await until(() => getDb().select().from(planInvoices).where(eq(planInvoices.subscriptionId, sub.id)).all().length === 2, 15_000);
      await settled();
      const after = subRow(sub.id);
      expect(after.state).toBe(before.state);
      expect(after.periodEnd).toEqual(before.periodEnd);
      const renewal = invoicesOf(sub.id).find((i) => i.stripeInvoiceId !== invoicesOf(sub.id)[0]!.stripeInvoiceId && i.at >= before.updatedAt) ?? invoicesOf(sub.id)[1]!;
      expect(renewal.counts).toBe(false);
      // The retry finishes the hand-over at Stripe; the renewal's money is back on the former owner's card.
      await finishPlanTransfer(sub.id);
      await settled();
      const charges = chargesOf(sid);
      expect(charges).toHaveLength(2);
      expect(charges.map((c) => c.amount - c.amount_refunded).sort()).toEqual([0, 12_000]);
      // Once, audited once, whatever is replayed; the former owner is told in plain words; Stripe charges nothing more.
      for (const e of stripe.fake.events()) await stripe.fake.redeliver(e.id);
      await settled();
      expect(chargesOf(sid).map((c) => c.amount_refunded).sort()).toEqual([0, 12_000]);
      expect(auditsOf(sub.id, "plan.payment_refunded_automatically")).toHaveLength(1);
      expect(auditsOf(sub.id, "plan.payment_held")).toHaveLength(0);
      const mail = await waitForMail({ to: owner.email, subject: /^Your care plan payment is on its way back — /, since });
      expect(mail.text).toMatch(/Your card was charged \$120\.00 on .* to renew the .* care plan on your .*\. The plan had already been set to end before that renewal/);
      const atStripe = stripe.fake.subscriptions().find((s) => s.id === sid)!;
      expect(atStripe.status === "canceled" || atStripe.cancel_at_period_end).toBe(true);
    });
  }
});

describe("one piece, one plan, whoever starts the other", () => {
  it("staff start a plan paid by other means while the owner's payment page is open; the owner pays it anyway: it doesn't start, is paid back in full and ends, and Stripe charges nothing more", async () => {
    const { admin, owner, piece } = await ownerWithPiece("other-means-race");
    const yearly = yearlyPlan(admin, { refundRule: "none", transfers: false });
    const since = new Date();
    const page = await startPlanCheckout(owner, piece.id, yearly.id);
    const byOtherMeans = startPlanByOtherMeans(admin, { pieceId: piece.id, templateId: yearly.id, paidByNote: "Paid at the studio counter (invented)" });
    expect((await payOnPage(page.checkoutUrl)).status).toBe(303);
    await until(() => invoicesOf(page.subscriptionId).some((i) => i.status === "paid"), 15_000);
    await settled();
    await until(() => subRow(page.subscriptionId).state === "ended", 15_000);
    await settled();

    const covering = getDb().select().from(planSubscriptions).where(eq(planSubscriptions.pieceId, piece.id)).all().filter((s) => ["running", "grace", "ending"].includes(s.state));
    expect(covering.map((s) => s.id)).toEqual([byOtherMeans.id]);
    expect(invoicesOf(page.subscriptionId)).toMatchObject([{ status: "paid", counts: false, heldResolution: "refunded_not_owed" }]);
    const stripeSub = stripe.fake.subscriptions().find((s) => s.metadata.planSubscriptionId === page.subscriptionId)!;
    expect(stripeSub.status).toBe("canceled");
    const intents = stripe.fake.invoices().filter((i) => i.parent.subscription_details.subscription === stripeSub.id).flatMap((i) => i.payments.data.map((p) => p.payment.payment_intent));
    expect(stripe.fake.charges().filter((c) => intents.includes(c.payment_intent)).map((c) => c.amount - c.amount_refunded)).toEqual([0]);
    expect(auditsOf(page.subscriptionId, "plan.payment_refunded_automatically")).toHaveLength(1);
    const mail = await waitForMail({ to: owner.email, subject: /^Your care plan payment is on its way back — /, since });
    expect(mail.text).toMatch(/already under a care plan/);
    // Replayed, nothing more moves.
    for (const e of stripe.fake.events()) await stripe.fake.redeliver(e.id);
    await settled();
    expect(stripe.fake.charges().filter((c) => intents.includes(c.payment_intent)).map((c) => c.amount_refunded)).toEqual([12_000]);
    expect(invoicesOf(page.subscriptionId)).toMatchObject([{ counts: false }]);
  });
});

describe("a plan that passed on with its piece", () => {
  it("can't be kept by staff after the hand-over: that would renew it on the former owner's card", async () => {
    const { admin, owner, piece } = await ownerWithPiece("keep-moved");
    const plan = yearlyPlan(admin, { refundRule: "none", transfers: true });
    const sub = await buyPlan(stripe.fake, owner, piece.id, plan.id);
    await releasePiece({ ...owner }, piece.id, { confirm: true });
    await settled();
    const moved = subRow(sub.id);
    expect(moved).toMatchObject({ state: "ending", ownerId: null, transferStep: null });
    expect(studioPlanDetail(admin, sub.id).cancel.canUndo).toBe(false);
    const kept = await keepStudioPlan(admin, sub.id, { version: moved.version }).catch((e: unknown) => e);
    expect(kept).toMatchObject({ status: 409, message: expect.stringMatching(/passed on with its piece/) });
    expect(subRow(sub.id).state).toBe("ending");
    expect(stripe.fake.subscriptions().find((s) => s.id === moved.stripeSubscriptionId)!.cancel_at_period_end).toBe(true);
  });
});

describe("a plan's refund on cancelling", () => {
  it("is a share of what was paid for the period: a renewal kept by staff at a lower amount is not paid back as if the full price had been", async () => {
    const { admin, owner, piece } = await ownerWithPiece("refund-of-lower");
    const plan = yearlyPlan(admin, { refundRule: "unused_share", transfers: false });
    const sub = await buyPlan(stripe.fake, owner, piece.id, plan.id);
    expect((await knob(stripe.fake, sub.stripeSubscriptionId!, "renew", "outcome=pay&amount=6000")).status).toBe(200);
    await until(() => studioPlanDetail(admin, sub.id).held, 15_000);
    await settled();
    const held = studioPlanDetail(admin, sub.id).held!;
    await resolveHeldPayment(admin, sub.id, { invoiceId: held.invoiceId, resolution: "accept", version: held.version, amountMinor: 6_000, refundMinor: 0 });
    await settled();
    const { cancel } = studioPlanDetail(admin, sub.id);
    const q = cancel.quote!;
    expect(q.months).toBeGreaterThan(0);
    // Whole months left of 6,000 paid, rounded down (lib/plans/refund.ts; common practice, no published source).
    expect(q.refundMinor).toBe(Math.floor((6_000 * q.months) / q.monthsInPeriod));
    await cancelPlanAtPeriodEnd(admin, sub.id, { version: cancel.version, refundMinor: q.refundMinor });
    const renewal = getDb().select().from(planInvoices).where(eq(planInvoices.id, held.invoiceId)).get()!;
    const pi = stripe.fake.invoices().find((i) => i.id === renewal.stripeInvoiceId)!.payments.data[0]!.payment.payment_intent;
    expect(stripe.fake.charges().find((c) => c.payment_intent === pi)!.amount_refunded).toBe(q.refundMinor);
  });
});

describe("a plan's refund when the payment service fails during the cancellation", () => {
  it("the cancellation stands, the refund stays owed, and the scheduled pass pays it once", async () => {
    const { admin, owner, piece } = await ownerWithPiece("refund-outage");
    const plan = yearlyPlan(admin, { refundRule: "unused_share", transfers: false });
    const sub = await buyPlan(stripe.fake, owner, piece.id, plan.id);
    const { cancel } = studioPlanDetail(admin, sub.id);
    stripe.fake.failNext("POST", "/v1/refunds");
    const since = new Date();
    const cancelled = await cancelPlanAtPeriodEnd(admin, sub.id, { version: cancel.version, refundMinor: cancel.quote!.refundMinor }).catch((e: unknown) => e);
    expect(cancelled).toMatchObject({ state: "ending" });
    expect(refundOf(sub.id)).toMatchObject({ status: "requested", amountMinor: cancel.quote!.refundMinor });
    const pi = stripe.fake.invoices().find((i) => i.parent.subscription_details.subscription === sub.stripeSubscriptionId)!.payments.data[0]!.payment.payment_intent;
    const refundedAtStripe = () => stripe.fake.charges().find((c) => c.payment_intent === pi)!.amount_refunded;
    expect(refundedAtStripe()).toBe(0);
    await waitForMail({ to: owner.email, subject: /./, since });
    // Not yet: the pass leaves a claim alone for a few minutes.
    expect((await finishRequestedPlanRefunds(new Date())).finished).not.toContain(refundOf(sub.id)!.id);
    const later = new Date(Date.now() + 10 * 60_000);
    expect((await finishRequestedPlanRefunds(later)).finished).toContain(refundOf(sub.id)!.id);
    expect(refundOf(sub.id)).toMatchObject({ status: "refunded" });
    expect(refundedAtStripe()).toBe(cancel.quote!.refundMinor);
    await finishRequestedPlanRefunds(later);
    expect(refundedAtStripe()).toBe(cancel.quote!.refundMinor);
    expect(auditsOf(sub.id, "plan.refunded")).toHaveLength(1);
  });
});
