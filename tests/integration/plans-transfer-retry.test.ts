// A care plan's change of hands when Stripe fails in the middle of it: the move is recorded with the
// step still to do, the people involved get plain words (never a half-moved plan), and a retry — staff's
// "try again" or the scheduled pass — finishes it once: one moved plan, one Stripe subscription, one
// charge, one refund. Real stripe SDK against the local Stripe fake over HTTP; the fake's failNext
// switch (tests only) makes one call answer as an outage would. Invented studio and owners.
import { eq } from "drizzle-orm";
import { describe, expect, it } from "vitest";
import { getDb } from "@/db/client";
import { planSubscriptions } from "@/db/schema";
import { addDays, localDate } from "@/lib/care/dates";
import { AppError } from "@/lib/errors";
import { releasePiece } from "@/lib/owner/transfer";
import { studioPlanDetail } from "@/lib/plans/cancel";
import { refundOf } from "@/lib/plans/refund";
import { finishPlanTransfer, finishStudioPlanTransfer } from "@/lib/plans/transfer";
import { planTransfersJob } from "@/jobs/plan-transfers";
import { auditsOf, createPiece, createStudio, createUser, memberContext, unique } from "../support/fixtures";
import { waitForMail } from "../support/mail";
import { buyPlan, plansStripeForFile, subRow, yearlyPlan } from "../support/plans-stripe";

const stripe = plansStripeForFile();
const plansOfPiece = (pieceId: string) => getDb().select().from(planSubscriptions).where(eq(planSubscriptions.pieceId, pieceId)).all();
/** The money the fake says moved for a Stripe subscription: its charges and what was refunded of them. */
const chargesOf = (stripeSubId: string) => {
  const intents = stripe.fake.invoices().filter((i) => i.parent.subscription_details.subscription === stripeSubId).flatMap((i) => i.payments.data.map((p) => p.payment.payment_intent));
  return stripe.fake.charges().filter((c) => intents.includes(c.payment_intent));
};
const subscriptionCalls = (stripeSubId: string) => stripe.fake.requests().filter((r) => r.path === `/v1/subscriptions/${stripeSubId}` && r.method !== "GET").length;

async function setup(over: { refundRule: "none" | "unused_share"; transfers: boolean }) {
  const studio = createStudio({ email: `${unique("transfer-retry")}@test.example`, taxRateBp: 0 });
  const admin = await memberContext(studio, "admin");
  const owner = await createUser();
  const { piece } = createPiece(studio, { ownerId: owner.id, deliveredOn: addDays(localDate(new Date(), "UTC"), -60) });
  const plan = yearlyPlan(admin, { refundRule: over.refundRule, transfers: over.transfers });
  return { admin, owner, piece, plan };
}


describe("a plan's change of hands when Stripe fails during it", () => {
  it("a plan that moves: recorded with the step left, plain words for staff, finished once by the retry", async () => {
    const { admin, owner, piece, plan } = await setup({ refundRule: "none", transfers: true });
    const sub = await buyPlan(stripe.fake, owner, piece.id, plan.id);
    const sid = sub.stripeSubscriptionId!;
    stripe.fake.failNext("POST", `/v1/subscriptions/${sid}`);

    // The release itself goes through; the plan is moved, with Stripe still to be told.
    await releasePiece(owner, piece.id, { confirm: true });
    expect(subRow(sub.id)).toMatchObject({ state: "ending", ownerId: null, transferStep: "stripe", endsAt: sub.periodEnd });
    expect(stripe.fake.subscriptions().find((s) => s.id === sid)!.cancel_at_period_end).toBe(false);
    const words = studioPlanDetail(admin, sub.id).transferPending!;
    expect(words).toMatch(/moving with its piece to the next owner/);
    expect(words).toMatch(/try again every few minutes/);
    expect(words).not.toMatch(/transfer_step|stripe"|ending|_/);

    // Staff try again while Stripe still fails: a plain 503, and nothing moves twice.
    stripe.fake.failNext("POST", `/v1/subscriptions/${sid}`);
    const refused = await finishStudioPlanTransfer(admin, sub.id).catch((e: unknown) => e);
    expect(refused).toBeInstanceOf(AppError);
    expect((refused as AppError).status).toBe(503);
    expect((refused as AppError).message).toMatch(/can't be reached right now/);
    expect(subRow(sub.id).transferStep).toBe("stripe");

    // The scheduled pass finishes it (the test database is shared: only this plan's line is read).
    const lines = await planTransfersJob();
    expect(lines).toContain(`finished plan change of hands ${sub.id}`);
    expect(subRow(sub.id)).toMatchObject({ state: "ending", ownerId: null, transferStep: null });
    expect(studioPlanDetail(admin, sub.id).transferPending).toBeNull();
    expect(stripe.fake.subscriptions().find((s) => s.id === sid)!).toMatchObject({ status: "active", cancel_at_period_end: true });

    // Exactly one moved plan, one Stripe subscription, one charge; the move audited once.
    expect(plansOfPiece(piece.id)).toHaveLength(1);
    expect(stripe.fake.subscriptions().filter((s) => s.metadata.planSubscriptionId === sub.id)).toHaveLength(1);
    expect(chargesOf(sid)).toHaveLength(1);
    expect(auditsOf(sub.id, "plan.changed_hands")).toHaveLength(1);
    expect(auditsOf(sub.id, "plan.transfer_finished")).toHaveLength(1);

    // Another try finds nothing left and tells Stripe nothing more.
    const calls = subscriptionCalls(sid);
    expect((await planTransfersJob()).some((l) => l.includes(sub.id))).toBe(false);
    await finishStudioPlanTransfer(admin, sub.id);
    expect(subscriptionCalls(sid)).toBe(calls);
  });

  it("a plan that ends: the refund that failed is paid once by the retry, and the former owner is mailed", async () => {
    const { admin, owner, piece, plan } = await setup({ refundRule: "unused_share", transfers: false });
    const sub = await buyPlan(stripe.fake, owner, piece.id, plan.id);
    const sid = sub.stripeSubscriptionId!;
    stripe.fake.failNext("POST", "/v1/refunds");

    await releasePiece(owner, piece.id, { confirm: true });
    expect(subRow(sub.id)).toMatchObject({ state: "ended", transferStep: "refund" });
    expect(stripe.fake.subscriptions().find((s) => s.id === sid)!.status).toBe("canceled");
    const claim = refundOf(sub.id)!;
    expect(claim).toMatchObject({ status: "requested", reason: "changed_hands" });
    expect(claim.amountMinor).toBeGreaterThan(0);
    expect(chargesOf(sid)[0]!.amount_refunded).toBe(0);
    expect(studioPlanDetail(admin, sub.id).transferPending).toMatch(/refund to the former owner is still being paid/);

    const done = await finishStudioPlanTransfer(admin, sub.id);
    expect(done.pending).toBeNull();
    expect(refundOf(sub.id)).toMatchObject({ status: "refunded" });
    const ended = (await waitForMail({ to: owner.email, subject: /has ended with the piece's new owner/ })).text.replace(/\s+/g, " ");
    expect(ended).toContain(`Hello ${owner.name}, as your ${piece.title} has passed to a new owner, the ${plan.name} care plan on it ended on `);
    // The piece is no longer theirs (its page answers "not found" to them): the link is to their pieces.
    expect(ended).toMatch(/See your pieces \S*\/pieces .*copy this link into your browser: \S*\/pieces /);
    expect(ended).not.toContain(piece.id);
    expect(ended).toContain(`Reply to this mail if you'd like ${admin.studio.name} to help.`);

    // Retried again (a second click, the pass): no second refund.
    await finishPlanTransfer(sub.id);
    expect((await planTransfersJob()).some((l) => l.includes(sub.id))).toBe(false);
    const charges = chargesOf(sid);
    expect(charges).toHaveLength(1);
    expect(charges[0]!.amount_refunded).toBe(claim.amountMinor);
    expect(stripe.fake.requests().filter((r) => r.path === "/v1/refunds").length).toBe(2); // the failed call and the one that paid
    expect(auditsOf(sub.id, "plan.refunded")).toHaveLength(1);
    expect(plansOfPiece(piece.id)).toHaveLength(1);
  });
});
