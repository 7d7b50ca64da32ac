// Where care-plan money could still go wrong, each tried as it would happen: the process stopping right
// after a release commits (before the plan's hand-over step), a plan refund the payment service refuses,
// and the mail about a renewal paid back on a moved plan when the payment service can't say who paid.
// Real SQLite file, the real stripe SDK against the local Stripe fake over HTTP (its signed webhooks reach
// the handlers through tests/support/plans-stripe.ts), the SMTP sink. Invented studios, owners and pieces.
import { and, eq } from "drizzle-orm";
import { describe, expect, it } from "vitest";
import { getDb } from "@/db/client";
import { planInvoices, planRefunds } from "@/db/schema";
import { planTransfersJob } from "@/jobs/plan-transfers";
import { addDays, localDate } from "@/lib/care/dates";
import { commitRelease, releasePiece } from "@/lib/owner/transfer";
import { getStripe } from "@/lib/payments/stripe";
import { cancelMyPlan, myPlanControl, studioPlanDetail } from "@/lib/plans/cancel";
import { finishRequestedPlanRefunds, refundOf } from "@/lib/plans/refund";
import { auditsOf, createPiece, createStudio, createUser, memberContext, unique } from "../support/fixtures";
import { waitForMail } from "../support/mail";
import { buyPlan, knob, plansStripeForFile, subRow, until, yearlyPlan } from "../support/plans-stripe";

const stripe = plansStripeForFile();

/** Every event the fake has made so far has reached the handlers and been answered 200. */
const settled = () => until(() => stripe.fake.deliveries().length >= stripe.fake.events().length && stripe.fake.deliveries().every((d) => d.status === 200), 15_000);
const invoicesOf = (subscriptionId: string) => getDb().select().from(planInvoices).where(eq(planInvoices.subscriptionId, subscriptionId)).all();
/** The fake's charges of a Stripe subscription, oldest first. */
const chargesOf = (stripeSubId: string) => {
  const intents = stripe.fake.invoices().filter((i) => i.parent.subscription_details.subscription === stripeSubId).flatMap((i) => i.payments.data.map((p) => p.payment.payment_intent));
  return stripe.fake.charges().filter((c) => intents.includes(c.payment_intent));
};
const refundCalls = () => stripe.fake.requests().filter((r) => r.path === "/v1/refunds").length;

async function ownerWithPlan(prefix: string, over: { refundRule: "none" | "unused_share"; transfers: boolean }) {
  const studio = createStudio({ email: `${unique(prefix)}@test.example`, taxRateBp: 0 });
  const admin = await memberContext(studio, "admin");
  const owner = await createUser();
  const { piece } = createPiece(studio, { ownerId: owner.id, deliveredOn: addDays(localDate(new Date(), "UTC"), -60) });
  const plan = yearlyPlan(admin, over);
  const sub = await buyPlan(stripe.fake, owner, piece.id, plan.id);
  return { studio, admin, owner, piece, plan, sub, sid: sub.stripeSubscriptionId! };
}

describe("the process stops right after a release commits, before the plan's hand-over step", () => {
  for (const transfers of [true, false]) {
    it(`${transfers ? "a plan that moves with the piece" : "a plan that ends at the release"}: the hand-over was written with the release; a renewal charged meanwhile is paid back, not counted; the pass finishes it once`, async () => {
      const { owner, piece, sub, sid } = await ownerWithPlan(transfers ? "crash-moves" : "crash-ends", { refundRule: "unused_share", transfers });
      // The release's transaction commits; the steps after it (Stripe, refund, mail) never run.
      await commitRelease(owner, piece.id, new Date());
      expect(subRow(sub.id)).toMatchObject(transfers ? { state: "ending", ownerId: null, payerId: owner.id, transferStep: "stripe" } : { state: "ended", ownerId: owner.id, transferStep: "stripe" });
      if (!transfers) expect(refundOf(sub.id)).toMatchObject({ status: "requested", reason: "changed_hands" });
      expect(stripe.fake.subscriptions().find((s) => s.id === sid)!).toMatchObject({ status: "active", cancel_at_period_end: false });

      // Stripe renews on the former owner's card before anyone tells it.
      const since = new Date();
      expect((await knob(stripe.fake, sid, "renew", "outcome=pay")).status).toBe(200);
      await until(() => invoicesOf(sub.id).length === 2, 15_000);
      await settled();
      const renewal = invoicesOf(sub.id).find((i) => i.periodStart! >= sub.periodEnd!)!;
      expect(renewal.counts).toBe(false);
      expect(subRow(sub.id).periodEnd).toEqual(sub.periodEnd);
      expect(chargesOf(sid).map((c) => c.amount - c.amount_refunded)).toEqual([12_000, 0]);
      await waitForMail({ to: owner.email, subject: /^Your care plan payment is on its way back — /, since });

      // The scheduled pass (after a restart) finishes the hand-over: Stripe told once, the refund paid once, the former owner mailed.
      expect(await planTransfersJob()).toContain(`finished plan change of hands ${sub.id}`);
      await settled();
      expect(subRow(sub.id).transferStep).toBeNull();
      const atStripe = stripe.fake.subscriptions().find((s) => s.id === sid)!;
      if (transfers) expect(atStripe.cancel_at_period_end || atStripe.status === "canceled").toBe(true);
      else {
        expect(atStripe.status).toBe("canceled");
        const refund = refundOf(sub.id)!;
        expect(refund.status).toBe("refunded");
        expect(chargesOf(sid)[0]!.amount_refunded).toBe(refund.amountMinor);
        await waitForMail({ to: owner.email, subject: /has ended with the piece's new owner/, since });
      }
      expect((await planTransfersJob()).some((l) => l.includes(sub.id))).toBe(false);
      expect(auditsOf(sub.id, "plan.changed_hands")).toHaveLength(1);
      expect(auditsOf(sub.id, "plan.payment_refunded_automatically")).toHaveLength(1);
    });
  }
});

describe("a plan refund the payment service refuses", () => {
  it("is asked once: marked refused with words for staff and an audit row, not retried by the pass; the owner is told the studio pays it back", async () => {
    const { admin, owner, sub, sid } = await ownerWithPlan("refund-refused", { refundRule: "unused_share", transfers: false });
    // The payment was already paid back in full at the payment service (outside the app).
    const charge = chargesOf(sid)[0]!;
    await getStripe().refunds.create({ payment_intent: charge.payment_intent });
    const control = myPlanControl(owner, sub.pieceId)!;
    const calls = refundCalls();
    const since = new Date();
    const cancelled = await cancelMyPlan(owner, sub.id, { version: control.version, refundMinor: control.quote!.refundMinor });
    expect(cancelled.state).toBe("ending");
    expect(refundCalls()).toBe(calls + 1);
    const refused = refundOf(sub.id)!;
    expect(refused).toMatchObject({ status: "refused", amountMinor: control.quote!.refundMinor });
    expect(refused.refusedWords).toMatch(/^The payment service refused this refund, so nothing went back to the owner's card\./);
    const audits = auditsOf(sub.id, "plan.refund_refused");
    expect(audits).toHaveLength(1);
    expect(audits[0]!.data).toMatchObject({ refundId: refused.id, amountMinor: refused.amountMinor });

    // The pass doesn't ask again, however late.
    const later = new Date(Date.now() + 60 * 60_000);
    const pass = await finishRequestedPlanRefunds(later);
    expect([...pass.finished, ...pass.failed]).not.toContain(refused.id);
    await finishRequestedPlanRefunds(later);
    expect(refundCalls()).toBe(calls + 1);
    expect(getDb().select().from(planRefunds).where(and(eq(planRefunds.id, refused.id), eq(planRefunds.status, "refused"))).all()).toHaveLength(1);

    // Staff see why on the plan, with the day and its zone; the owner isn't told it is on its way to their card.
    const words = studioPlanDetail(admin, sub.id).refundRefused!;
    expect(words).toMatch(/^Refund of \$\d+\.\d\d refused on \d+ \w+ \d{4} \(.+\)\. The payment service refused this refund/);
    expect(words).not.toMatch(/amount_too_large|greater than unrefunded/);
    const after = myPlanControl(owner, sub.pieceId)!;
    expect(after).toMatchObject({ refundedMinor: refused.amountMinor, refundBy: "studio" });
    const mail = (await waitForMail({ to: owner.email, subject: /^Your care plan is cancelled/, since })).text.replace(/\s+/g, " ");
    expect(mail).toContain(`${admin.studio.name} will pay you back`);
    expect(mail).not.toContain("on its way back to the card");
  });
});

describe("a plan refund left owed by an outage, then refused when the pass asks", () => {
  it("is marked refused by the pass and not asked again on later passes", async () => {
    const { admin, owner, sub, sid } = await ownerWithPlan("refund-refused-later", { refundRule: "unused_share", transfers: false });
    const control = myPlanControl(owner, sub.pieceId)!;
    stripe.fake.failNext("POST", "/v1/refunds");
    await cancelMyPlan(owner, sub.id, { version: control.version, refundMinor: control.quote!.refundMinor });
    const owed = refundOf(sub.id)!;
    expect(owed.status).toBe("requested");
    // Meanwhile the payment is paid back in full at the payment service.
    await getStripe().refunds.create({ payment_intent: chargesOf(sid)[0]!.payment_intent });
    const calls = refundCalls();
    const later = new Date(Date.now() + 10 * 60_000);
    const lines = await planTransfersJob(later);
    expect(lines).toContain(`plan refund ${owed.id} refused by the payment service: not asked again, staff see why on the plan`);
    expect(refundOf(sub.id)).toMatchObject({ status: "refused" });
    for (let i = 0; i < 3; i++) await planTransfersJob(new Date(later.getTime() + i * 10 * 60_000));
    expect(refundCalls()).toBe(calls + 1);
    expect(auditsOf(sub.id, "plan.refund_refused")).toHaveLength(1);
    expect(studioPlanDetail(admin, sub.id).refundRefused).toMatch(/^Refund of .* refused on /);
  });
});

describe("a renewal paid back on a plan that moved with its piece", () => {
  it("is mailed to the person who paid, found from our records, even when the payment service can't say who its customer is", async () => {
    const { owner, piece, sub, sid } = await ownerWithPlan("payer-mail", { refundRule: "none", transfers: true });
    stripe.fake.failNext("POST", `/v1/subscriptions/${sid}`);
    await releasePiece(owner, piece.id, { confirm: true });
    expect(subRow(sub.id)).toMatchObject({ ownerId: null, payerId: owner.id, transferStep: "stripe" });
    // Any read of the Stripe customer fails meanwhile.
    stripe.fake.failNext("GET", `/v1/customers/${sub.stripeCustomerId}`, 10);
    const since = new Date();
    expect((await knob(stripe.fake, sid, "renew", "outcome=pay")).status).toBe(200);
    await until(() => invoicesOf(sub.id).length === 2, 15_000);
    await settled();
    expect(chargesOf(sid).map((c) => c.amount - c.amount_refunded)).toEqual([12_000, 0]);
    const mail = (await waitForMail({ to: owner.email, subject: /^Your care plan payment is on its way back — /, since })).text.replace(/\s+/g, " ");
    expect(mail).toContain(`Hello ${owner.name}`);
  });
});
