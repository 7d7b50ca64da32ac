// Care plans' money edges through the real stripe SDK against the local Stripe fake over HTTP: the
// refund rule on cancellation, the owner's cancel and keep, a piece changing hands, concurrent
// cancellations and events, and a renewal paid at an amount that isn't the plan's (tests/support/plans-stripe.ts
// starts the fake and the receiver of its signed webhooks).
import { and, eq } from "drizzle-orm";
import { describe, expect, it } from "vitest";
import { getDb } from "@/db/client";
import { planInvoices, planRefunds, pieces, type Piece, type PlanSubscription } from "@/db/schema";
import { addDays, localDate } from "@/lib/care/dates";
import { releasePiece } from "@/lib/owner/transfer";
import { cancelMyPlan, cancelPlanAtPeriodEnd, cancelPreview, keepMyPlan, myPlanControl, studioPlanDetail } from "@/lib/plans/cancel";
import { addPeriod } from "@/lib/plans/periods";
import { payRefund, refundOf, refundQuote } from "@/lib/plans/refund";
import { startPlanByOtherMeans } from "@/lib/plans/subscriptions";
import { createTemplate } from "@/lib/plans/templates";
import { planTemplateSchema } from "@/lib/plans/validation";
import { runPlanVisits } from "@/lib/plans/visits";
import { auditsOf, createPiece, createStudio, createUser, memberContext, unique } from "../support/fixtures";
import { waitForMail } from "../support/mail";
import { buyPlan, knob as stripeKnob, plansStripeForFile, subRow, until } from "../support/plans-stripe";

const stripe = plansStripeForFile();

const knob = (subId: string, action: string, body = "") => stripeKnob(stripe.fake, subId, action, body);
const fakeSub = (id: string) => stripe.fake.subscriptions().find((s) => s.id === id)!;
/** What the fake's charge book says was refunded of the plan's first payment. */
const refundedOfFirstPayment = (stripeSubId: string) => {
  const inv = stripe.fake.invoices().find((i) => i.parent.subscription_details.subscription === stripeSubId && i.billing_reason === "subscription_create")!;
  const pi = inv.payments.data[0]!.payment.payment_intent;
  return stripe.fake.charges().find((c) => c.payment_intent === pi)!.amount_refunded;
};

/** A studio with 8.25 % tax on top (a 120.00 plan costs 129.90 a year) and an owner's piece. */
async function setup(over: { refundRule?: "none" | "unused_share"; transfers?: boolean; interval?: "year" | "month" } = {}) {
  const studio = createStudio({ email: `${unique("studio")}@test.example`, taxMode: "single", taxRateBp: 825, taxInclusive: false });
  const admin = await memberContext(studio, "admin");
  const owner = await createUser({ timeZone: "Europe/Berlin" });
  const { piece } = createPiece(studio, { ownerId: owner.id, deliveredOn: addDays(localDate(new Date(), "UTC"), -400) });
  const plan = createTemplate(
    admin,
    planTemplateSchema.parse({
      name: "Yearly finish keeping (test)",
      included: { tasks: ["reoil"], visitsPerYear: 0, visitSharePct: 0, extendedLines: [], repairDiscountPct: 0 },
      fits: { finishClasses: [], pieceKinds: [], minTopAreaM2: null, maxTopAreaM2: null },
      priceMinor: 12_000,
      interval: over.interval ?? "year",
      refundRule: over.refundRule ?? "none",
      transfers: over.transfers ?? false,
    }),
  );
  return { studio, admin, owner, piece, plan };
}

const buy = (owner: { id: string; email: string; name: string }, piece: Piece, templateId: string) => buyPlan(stripe.fake, owner, piece.id, templateId);

describe("the refund rule", () => {
  // Pro rata by whole unused months, the month in progress counted as used, rounded down to the cent:
  // common practice, no published source. 129.90 = 120.00 + 8.25 % tax.
  const sub = { state: "running", amountMinor: 12_990, currency: "USD", periodStart: new Date("2026-01-15T00:00:00Z"), periodEnd: new Date("2027-01-15T00:00:00Z") } as PlanSubscription;
  const at = new Date("2026-03-20T10:00:00Z"); // in the third plan month (15 March – 15 April)

  it("none: runs to the period's end, nothing back", () => {
    expect(refundQuote(sub, { interval: "year", refundRule: "none" }, at)).toMatchObject({ endsAt: sub.periodEnd, months: 0, refundMinor: 0 });
  });

  it("unused share: ends at the end of the plan month in progress; the 9 whole months left are paid back", () => {
    // 12 990 × 9 / 12 = 9 742.5 → 9 742 (rounded down).
    expect(refundQuote(sub, { interval: "year", refundRule: "unused_share" }, at)).toMatchObject({ endsAt: new Date("2026-04-15T00:00:00Z"), months: 9, monthsInPeriod: 12, refundMinor: 9_742 });
    // On the boundary itself the new month has begun: 8 months left, 12 990 × 8 / 12 = 8 660.
    expect(refundQuote(sub, { interval: "year", refundRule: "unused_share" }, new Date("2026-04-15T00:00:00Z"))).toMatchObject({ endsAt: new Date("2026-05-15T00:00:00Z"), months: 8, refundMinor: 8_660 });
    // In the last month nothing is left: it ends with the period.
    expect(refundQuote(sub, { interval: "year", refundRule: "unused_share" }, new Date("2026-12-20T00:00:00Z"))).toMatchObject({ endsAt: sub.periodEnd, months: 0, refundMinor: 0 });
  });

  it("a monthly plan, a plan in grace, and a plan ending now at a transfer", () => {
    const monthly = { ...sub, periodEnd: new Date("2026-02-15T00:00:00Z") } as PlanSubscription;
    expect(refundQuote(monthly, { interval: "month", refundRule: "unused_share" }, new Date("2026-01-20T00:00:00Z"))).toMatchObject({ endsAt: monthly.periodEnd, months: 0, refundMinor: 0 });
    expect(refundQuote({ ...sub, state: "grace" }, { interval: "year", refundRule: "unused_share" }, at)).toMatchObject({ refundMinor: 0 });
    expect(refundQuote(sub, { interval: "year", refundRule: "unused_share" }, at, true)).toMatchObject({ endsAt: at, months: 9, refundMinor: 9_742 });
  });
});

describe("the owner cancels", () => {
  it("unused share: ending at the end of the plan month, 11 months paid back through Stripe once, audited and mailed; it can't be taken back; Stripe ends it then", async () => {
    const { owner, piece, plan } = await setup({ refundRule: "unused_share" });
    const sub = await buy(owner, piece, plan.id);
    const control = myPlanControl(owner, piece.id)!;
    // Bought now: the first plan month is in progress, so 11 of 12 months are unused. 12 990 × 11 / 12 = 11 907.5 → 11 907.
    expect(control).toMatchObject({ subscriptionId: sub.id, version: sub.version, quote: { refundMinor: 11_907, months: 11, endsAt: addPeriod(sub.periodStart!, "month").getTime() } });
    // Another owner can't see or cancel it.
    const stranger = await createUser();
    await expect(cancelMyPlan(stranger, sub.id, { version: sub.version, refundMinor: 11_907 })).rejects.toMatchObject({ status: 404 });
    // A refund other than the one now due is refused, and nothing moves.
    await expect(cancelMyPlan(owner, sub.id, { version: sub.version, refundMinor: 12_990 })).rejects.toMatchObject({ status: 409, code: "refund_changed" });
    expect(refundOf(sub.id)).toBeUndefined();
    expect(refundedOfFirstPayment(sub.stripeSubscriptionId!)).toBe(0);

    const ending = await cancelMyPlan(owner, sub.id, { version: sub.version, refundMinor: 11_907 });
    expect(ending).toMatchObject({ state: "ending", endsAt: new Date(control.quote!.endsAt) });
    expect(refundOf(sub.id)).toMatchObject({ status: "refunded", amountMinor: 11_907, months: 11, reason: "cancelled", subscriptionVersion: sub.version });
    expect(refundedOfFirstPayment(sub.stripeSubscriptionId!)).toBe(11_907);
    expect(fakeSub(sub.stripeSubscriptionId!)).toMatchObject({ cancel_at: Math.floor(control.quote!.endsAt / 1000), cancel_at_period_end: false });
    expect(auditsOf(sub.id, "plan.ending")[0]!.data).toMatchObject({ source: "owner" });
    expect(auditsOf(sub.id, "plan.refund_claimed")).toHaveLength(1);
    expect(auditsOf(sub.id, "plan.refunded")).toHaveLength(1);
    const mail = await waitForMail({ to: owner.email, subject: /Your care plan is cancelled/ });
    expect(mail.text).toMatch(/\$119\.07 for 11 unused months/);
    // The end date in the owner's zone, with the zone named.
    expect(mail.text).toMatch(/keeps working until \d{1,2} \w+ \d{4} \(Central European Time/);

    // Paying the same claim again is a no-op (the idempotency key is the claim's id).
    await payRefund({ ...refundOf(sub.id)!, status: "requested" }, subRow(sub.id));
    expect(refundedOfFirstPayment(sub.stripeSubscriptionId!)).toBe(11_907);
    // The old version can't cancel again; the cancellation can't be taken back once money went back.
    await expect(cancelMyPlan(owner, sub.id, { version: sub.version, refundMinor: 11_907 })).rejects.toMatchObject({ status: 409 });
    await expect(keepMyPlan(owner, sub.id, { version: subRow(sub.id).version })).rejects.toMatchObject({ status: 409 });

    await knob(sub.stripeSubscriptionId!, "renew", "outcome=pay");
    const ended = await until(() => subRow(sub.id).state === "ended" && subRow(sub.id));
    expect(ended.endedAt!.getTime()).toBe(control.quote!.endsAt);
  });

  it("none: ending at the period's end with nothing back; kept again before the end, Stripe renews it again", async () => {
    const { owner, piece, plan } = await setup();
    const sub = await buy(owner, piece, plan.id);
    expect(myPlanControl(owner, piece.id)!.quote).toMatchObject({ refundMinor: 0, endsAt: sub.periodEnd!.getTime() });
    const ending = await cancelMyPlan(owner, sub.id, { version: sub.version, refundMinor: 0 });
    expect(ending).toMatchObject({ state: "ending", endsAt: sub.periodEnd });
    expect(fakeSub(sub.stripeSubscriptionId!).cancel_at_period_end).toBe(true);
    expect(refundOf(sub.id)).toBeUndefined();
    await waitForMail({ to: owner.email, subject: /Your care plan is cancelled/ });
    expect(cancelPreview(ending).canUndo).toBe(true);

    const kept = await keepMyPlan(owner, sub.id, { version: ending.version });
    expect(kept).toMatchObject({ state: "running", endsAt: null });
    expect(fakeSub(sub.stripeSubscriptionId!)).toMatchObject({ cancel_at_period_end: false, cancel_at: null, status: "active" });
    expect(auditsOf(sub.id, "plan.running").map((a) => (a.data as { source: string }).source)).toContain("owner");
    // Renewed as usual afterwards.
    await knob(sub.stripeSubscriptionId!, "renew", "outcome=pay");
    await until(() => subRow(sub.id).periodEnd!.getTime() > sub.periodEnd!.getTime());
    expect(subRow(sub.id).state).toBe("running");
  });
});

describe("staff cancel a plan paid by other means", () => {
  it("the refund is recorded as the studio's to pay back; the scheduler ends the plan at the end of the plan month", async () => {
    const { admin, owner, piece, plan } = await setup({ refundRule: "unused_share" });
    const sub = startPlanByOtherMeans(admin, { pieceId: piece.id, templateId: plan.id, paidByNote: "Bank transfer" });
    const preview = studioPlanDetail(admin, sub.id).cancel;
    expect(preview.quote).toMatchObject({ refundMinor: 11_907, months: 11 });
    const ending = await cancelPlanAtPeriodEnd(admin, sub.id, { version: preview.version, refundMinor: 11_907 });
    expect(ending).toMatchObject({ state: "ending", endsAt: addPeriod(sub.periodStart!, "month") });
    expect(refundOf(sub.id)).toMatchObject({ status: "other_means", amountMinor: 11_907, stripeRefundId: null });
    expect(auditsOf(sub.id, "plan.ending")[0]!.data).toMatchObject({ source: "staff" });
    const mail = await waitForMail({ to: owner.email, subject: /Your care plan is cancelled/ });
    expect(mail.text).toMatch(/will pay you back \$119\.07 for 11 unused months/);
    // Before the end it still covers; the day after, the scheduler ends it on the day it was given.
    await runPlanVisits(new Date(ending.endsAt!.getTime() - 86_400_000));
    expect(subRow(sub.id).state).toBe("ending");
    await runPlanVisits(new Date(ending.endsAt!.getTime() + 86_400_000));
    expect(subRow(sub.id)).toMatchObject({ state: "ended", endedAt: ending.endsAt });
  });
});

describe("two at once leave one state and move money once", () => {
  it("the owner and staff cancel at the same moment: one succeeds, the other is a 409; one refund", async () => {
    const { admin, owner, piece, plan } = await setup({ refundRule: "unused_share" });
    const sub = await buy(owner, piece, plan.id);
    const ask = { version: sub.version, refundMinor: 11_907 };
    const results = await Promise.allSettled([cancelMyPlan(owner, sub.id, ask), cancelPlanAtPeriodEnd(admin, sub.id, ask), cancelMyPlan(owner, sub.id, ask)]);
    expect(results.filter((r) => r.status === "fulfilled")).toHaveLength(1);
    for (const r of results.filter((r): r is PromiseRejectedResult => r.status === "rejected")) expect(r.reason).toMatchObject({ status: 409 });
    expect(getDb().select().from(planRefunds).where(eq(planRefunds.subscriptionId, sub.id)).all()).toHaveLength(1);
    expect(refundedOfFirstPayment(sub.stripeSubscriptionId!)).toBe(11_907);
    expect(subRow(sub.id).state).toBe("ending");
  });

  it("a failed renewal's events and a staff cancellation at the same moment, then every event replayed out of order: the plan ends in the state Stripe holds", async () => {
    const { admin, owner, piece, plan } = await setup({ refundRule: "unused_share" });
    const sub = await buy(owner, piece, plan.id);
    const [renewal, cancel] = await Promise.allSettled([knob(sub.stripeSubscriptionId!, "renew", "outcome=fail"), cancelPlanAtPeriodEnd(admin, sub.id, { version: sub.version, refundMinor: 11_907 })]);
    expect(renewal.status).toBe("fulfilled");
    await until(() => stripe.fake.deliveries().length >= stripe.fake.events().length);
    const events = stripe.fake.events().filter((e) => JSON.stringify(e.data.object).includes(sub.stripeSubscriptionId!));
    for (const e of [...events].reverse()) {
      expect(await stripe.fake.redeliver(e.id)).toBe(200);
      expect(await stripe.fake.redeliver(e.id)).toBe(200);
    }
    const s = fakeSub(sub.stripeSubscriptionId!);
    // Cancelled wins over an overdue renewal: a past-due subscription set to cancel is ending, not in grace.
    const expected = s.status === "canceled" ? "ended" : s.cancel_at || s.cancel_at_period_end ? "ending" : s.status === "past_due" ? "grace" : "running";
    const row = await until(() => subRow(sub.id).state === expected && subRow(sub.id));
    // Money moved at most once, and only with a cancellation that went through.
    const refunds = getDb().select().from(planRefunds).where(eq(planRefunds.subscriptionId, sub.id)).all();
    expect(refunds.length).toBe(cancel.status === "fulfilled" ? 1 : 0);
    expect(refundedOfFirstPayment(sub.stripeSubscriptionId!)).toBe(refunds[0]?.amountMinor ?? 0);
    // Replaying once more changes nothing.
    for (const e of events) await stripe.fake.redeliver(e.id);
    expect(subRow(sub.id)).toMatchObject({ state: row.state, version: row.version });
  });
});

describe("cancelled while a renewal is overdue", () => {
  it("stays ending: Stripe's past-due subscription set to cancel does not put it back in grace, replayed or not", async () => {
    const { admin, owner, piece, plan } = await setup({ refundRule: "unused_share" });
    const sub = await buy(owner, piece, plan.id);
    await knob(sub.stripeSubscriptionId!, "renew", "outcome=fail");
    const inGrace = await until(() => subRow(sub.id).state === "grace" && subRow(sub.id));
    // In grace nothing is paid back (the period in hand is the unpaid one).
    await cancelPlanAtPeriodEnd(admin, sub.id, { version: inGrace.version, refundMinor: 0 });
    expect(subRow(sub.id).state).toBe("ending");
    await until(() => stripe.fake.deliveries().length >= stripe.fake.events().length);
    for (const e of stripe.fake.events().filter((e) => JSON.stringify(e.data.object).includes(sub.stripeSubscriptionId!))) expect(await stripe.fake.redeliver(e.id)).toBe(200);
    expect(fakeSub(sub.stripeSubscriptionId!).status).toBe("past_due");
    expect(subRow(sub.id).state).toBe("ending");
    expect(getDb().select().from(planRefunds).where(eq(planRefunds.subscriptionId, sub.id)).all().filter((r) => r.amountMinor > 0)).toEqual([]);
  });
});

describe("a renewal paid at an amount that isn't the plan's", () => {
  it("is not accepted as a renewal: the period stays, the payment is held for staff and audited once", async () => {
    const { admin, owner, piece, plan } = await setup();
    const sub = await buy(owner, piece, plan.id);
    await knob(sub.stripeSubscriptionId!, "renew", "outcome=pay&amount=999");
    const held = await until(() => getDb().select().from(planInvoices).where(and(eq(planInvoices.subscriptionId, sub.id), eq(planInvoices.counts, false))).get());
    expect(held).toMatchObject({ status: "paid", amountMinor: 999 });
    await until(() => stripe.fake.deliveries().length >= stripe.fake.events().length);
    expect(subRow(sub.id)).toMatchObject({ state: "running", periodStart: sub.periodStart, periodEnd: sub.periodEnd });
    for (const e of stripe.fake.events().filter((e) => JSON.stringify(e.data.object).includes(sub.stripeSubscriptionId!))) await stripe.fake.redeliver(e.id);
    expect(subRow(sub.id).periodEnd).toEqual(sub.periodEnd);
    expect(auditsOf(sub.id, "plan.payment_held")).toHaveLength(1);
    expect(auditsOf(sub.id, "plan.payment_held")[0]!.data).toMatchObject({ amountMinor: 999, expectedMinor: 12_990 });
    expect(studioPlanDetail(admin, sub.id).heldPayments).toEqual([expect.objectContaining({ amountMinor: 999, stripeInvoiceId: held.stripeInvoiceId })]);
    // A renewal at the plan's amount is accepted as before.
    await knob(sub.stripeSubscriptionId!, "renew", "outcome=pay");
    await until(() => subRow(sub.id).periodEnd!.getTime() > sub.periodEnd!.getTime());
  });
});

describe("a piece that changes hands", () => {
  it("default (the plan doesn't move): the plan ends at the transfer with the refund its rule gives, and Stripe ends it", async () => {
    const { owner, piece, plan } = await setup({ refundRule: "unused_share" });
    const sub = await buy(owner, piece, plan.id);
    await releasePiece(owner, piece.id, { confirm: true });
    const ended = await until(() => subRow(sub.id).state === "ended" && subRow(sub.id));
    expect(ended.endedAt).not.toBeNull();
    expect(refundOf(sub.id)).toMatchObject({ status: "refunded", reason: "changed_hands", amountMinor: 11_907, months: 11 });
    expect(refundedOfFirstPayment(sub.stripeSubscriptionId!)).toBe(11_907);
    expect(fakeSub(sub.stripeSubscriptionId!).status).toBe("canceled");
    expect(auditsOf(sub.id, "plan.changed_hands")[0]!.data).toMatchObject({ moves: false, refundMinor: 11_907 });
    await waitForMail({ to: owner.email, subject: /has ended with the piece's new owner/ });
  });

  it("when the studio lets it move: the plan stays with the piece to the period's end, for the next owner, and isn't renewed on the former owner's card", async () => {
    const { owner, piece, plan } = await setup({ refundRule: "unused_share", transfers: true });
    const sub = await buy(owner, piece, plan.id);
    await releasePiece(owner, piece.id, { confirm: true });
    const moved = await until(() => subRow(sub.id).ownerId === null && subRow(sub.id));
    expect(moved).toMatchObject({ state: "ending", endsAt: sub.periodEnd, pieceId: piece.id });
    expect(refundOf(sub.id)).toBeUndefined();
    expect(fakeSub(sub.stripeSubscriptionId!)).toMatchObject({ status: "active", cancel_at_period_end: true });
    expect(auditsOf(sub.id, "plan.changed_hands")[0]!.data).toMatchObject({ moves: true });
    expect(getDb().select().from(pieces).where(eq(pieces.id, piece.id)).get()!.ownerId).toBeNull();
  });
});
