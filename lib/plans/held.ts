// A renewal held because Stripe charged an amount (or a template version) that isn't the plan's: the
// payment is kept but not counted, and the plan's new period doesn't start (lib/plans/stripe-sync.ts).
// Here: how that is said to staff and to the owner, and what staff can do about it —
//  - accept: the payment is taken as the new period's payment as charged (no money moves);
//  - refund the difference (only when more than the plan's price was charged, in its currency): the
//    excess goes back to the owner's card and the rest is the new period's payment;
//  - refund and end: the whole payment goes back, Stripe stops the subscription, and the plan ends.
// As with cancelling (lib/plans/cancel.ts), money moves only when the plan version, the held amount and
// the refund the person was shown are still the current ones: they are checked and the decision claimed
// in one transaction under the plan's lock; Stripe is asked after (idempotency key of the held payment);
// if it refuses, the claim is undone and the payment waits as before.
import { and, desc, eq, inArray, isNotNull, isNull } from "drizzle-orm";
import { z } from "zod";
import { getDb } from "@/db/client";
import { planInvoices, planSubscriptions, studios, type PlanInvoice, type PlanSubscription } from "@/db/schema";
import { PlanHeldSettledEmail, planHeldSettledSubject } from "@/emails/plan-held-settled";
import { recordAudit } from "@/lib/audit";
import type { StudioActor } from "@/lib/auth/actor";
import { conflict, notFound } from "@/lib/errors";
import { formatInstant, formatMoney, formatZone } from "@/lib/format";
import { sendMail } from "@/lib/mail";
import { mailAfterCommit } from "@/lib/mail/after-commit";
import { callStripe } from "@/lib/payments/stripe";
import { mailPaidAfterHandOn, planMailContext } from "./plan-mail";
import { PLAN_FINAL } from "./states";
import { invoicePaymentIntent, syncPlanSubscription, withPlanLock } from "./stripe-sync";
import { buyerHoldsPiece, moveSubscription, pieceUrl, studioSubscription } from "./subscriptions";

export const HELD_RESOLUTIONS = ["accept", "refund_difference", "refund_and_end"] as const;
export type HeldResolution = (typeof HELD_RESOLUTIONS)[number];

/** What staff confirmed: the decision, and the plan version, held amount and refund they were shown. */
export const heldAskSchema = z.object({
  invoiceId: z.string({ error: "Reload the page: the held payment is missing." }).min(1).max(64),
  resolution: z.enum(HELD_RESOLUTIONS, { error: "Choose what to do with the held payment." }),
  version: z.number({ error: "Reload the page: the plan's version is missing." }).int().min(0),
  amountMinor: z.number({ error: "Reload the page: the held amount is missing." }).int().min(0),
  refundMinor: z.number({ error: "Reload the page: the refund shown is missing." }).int().min(0),
});
export type HeldAsk = z.infer<typeof heldAskSchema>;

const STORED: Record<HeldResolution, NonNullable<PlanInvoice["heldResolution"]>> = { accept: "accepted", refund_difference: "difference_refunded", refund_and_end: "refunded_and_ended" };

/** The plan's payment waiting for staff (paid, not counted, not yet decided), newest first; undefined when none. */
export function heldPaymentOf(subscriptionId: string): PlanInvoice | undefined {
  return getDb()
    .select()
    .from(planInvoices)
    .where(and(eq(planInvoices.subscriptionId, subscriptionId), eq(planInvoices.status, "paid"), eq(planInvoices.counts, false), isNull(planInvoices.heldResolution)))
    .orderBy(desc(planInvoices.at))
    .get();
}

/** Of these plans, the ones with a payment waiting for staff. */
export function plansWithHeldPayment(subscriptionIds: readonly string[]): Set<string> {
  if (subscriptionIds.length === 0) return new Set();
  const rows = getDb()
    .selectDistinct({ id: planInvoices.subscriptionId })
    .from(planInvoices)
    .where(and(inArray(planInvoices.subscriptionId, [...subscriptionIds]), eq(planInvoices.status, "paid"), eq(planInvoices.counts, false), isNull(planInvoices.heldResolution)))
    .all();
  return new Set(rows.map((r) => r.id));
}

/** A held first payment of a checkout opened before its buyer handed the piece on: the plan never started; it can only be paid back. */
const paidAfterHandOn = (sub: PlanSubscription) => sub.state === "awaiting_payment" && !buyerHoldsPiece(sub);

/** What each decision would pay back (null: not possible for this payment). */
function refundFor(sub: PlanSubscription, held: PlanInvoice, resolution: HeldResolution): number | null {
  if (resolution === "accept") return 0;
  if (resolution === "refund_and_end") return held.amountMinor;
  const sameCurrency = held.currency.toUpperCase() === sub.currency.toUpperCase();
  return sameCurrency && held.amountMinor > sub.amountMinor ? held.amountMinor - sub.amountMinor : null;
}

export type HeldOption = { resolution: HeldResolution; refundMinor: number; label: string; words: string };
export type HeldView = { invoiceId: string; amountMinor: number; version: number; words: string; options: HeldOption[] };

function wordsParts(sub: PlanSubscription, held: PlanInvoice, timeZone: string) {
  const country = getDb().select({ country: studios.country }).from(studios).where(eq(studios.id, sub.studioId)).get()!.country;
  return {
    money: (minor: number, currency = sub.currency) => formatMoney(minor, currency, country),
    on: `${formatInstant(held.at, timeZone)} (${formatZone(timeZone)})`,
  };
}

/** Staff's view of the held payment: what happened and what happens next, and the decisions open to them. */
export function heldForStaff(sub: PlanSubscription, timeZone: string): HeldView | null {
  const held = heldPaymentOf(sub.id);
  if (!held || PLAN_FINAL.includes(sub.state)) return null;
  const { money, on } = wordsParts(sub, held, timeZone);
  const charged = money(held.amountMinor, held.currency);
  const handedOn = paidAfterHandOn(sub);
  const words = handedOn
    ? `The first payment, ${charged} on ${on}, came after the person who bought this plan had handed the piece on. The payment is held and the plan hasn't started. Pay it back to end the plan.`
    : `The renewal on ${on} charged ${charged}, but this plan costs ${money(sub.amountMinor)}. The payment is held: the plan's new period hasn't started, and it keeps covering as before until you decide. Nothing more is charged meanwhile.`;
  const options: HeldOption[] = [];
  for (const resolution of handedOn ? (["refund_and_end"] as const) : HELD_RESOLUTIONS) {
    const refundMinor = refundFor(sub, held, resolution);
    if (refundMinor === null) continue;
    if (resolution === "accept") options.push({ resolution, refundMinor, label: `Keep ${charged} as this period's payment`, words: `The new period starts, paid at ${charged}. No money moves.` });
    if (resolution === "refund_difference") options.push({ resolution, refundMinor, label: `Pay back the ${money(refundMinor)} difference`, words: `${money(refundMinor)} goes back to the owner's card and the new period starts, paid at the plan's ${money(sub.amountMinor)}.` });
    if (resolution === "refund_and_end") options.push({ resolution, refundMinor, label: "Pay it all back and end the plan", words: `${charged} goes back to the owner's card, the plan isn't renewed, and it ends now.` });
  }
  return { invoiceId: held.id, amountMinor: held.amountMinor, version: sub.version, words, options };
}

/** Staff's words for the plan's last settled held payment (when, and what was decided); null when none was settled. */
export function heldSettledForStaff(sub: PlanSubscription, timeZone: string): string | null {
  const last = getDb()
    .select()
    .from(planInvoices)
    .where(and(eq(planInvoices.subscriptionId, sub.id), isNotNull(planInvoices.heldResolvedAt)))
    .orderBy(desc(planInvoices.heldResolvedAt))
    .get();
  if (!last?.heldResolution || !last.heldResolvedAt) return null;
  const { money } = wordsParts(sub, last, timeZone);
  const on = `${formatInstant(last.heldResolvedAt, timeZone)} (${formatZone(timeZone)})`;
  const charged = money(last.amountMinor, last.currency);
  if (last.heldResolution === "accepted") return `Settled on ${on}: the ${charged} charged was kept as the period's payment.`;
  if (last.heldResolution === "refunded_not_owed") return `Paid back on ${on}: ${charged}, the first payment of this plan, went back to the card it came from, since the piece was already under another plan; this plan didn't start. Nobody needed to decide.`;
  if (last.heldResolution === "refunded_after_end") return `Paid back on ${on}: ${charged} charged for a renewal after the plan's end went back to the card it came from. Nobody needed to decide.`;
  if (last.heldResolution === "difference_refunded") return `Settled on ${on}: ${money(last.heldRefundedMinor)} paid back to the owner's card; ${money(last.amountMinor - last.heldRefundedMinor)} of the ${charged} charged was kept as the period's payment.`;
  return `Settled on ${on}: all ${charged} paid back to the owner's card, and the plan ended.`;
}

/** The owner's words for their plan's held renewal; null when nothing is held. */
export function heldForOwner(sub: PlanSubscription, timeZone: string): string | null {
  const held = heldPaymentOf(sub.id);
  if (!held || PLAN_FINAL.includes(sub.state)) return null;
  const { money, on } = wordsParts(sub, held, timeZone);
  return `Your renewal on ${on} was charged ${money(held.amountMinor, held.currency)}, not the plan's ${money(sub.amountMinor)}. The studio is checking it and will either keep it as this period's payment or pay back what isn't owed. Your plan keeps covering your piece meanwhile, and nothing more is charged.`;
}

const reread = (id: string) => getDb().select().from(planSubscriptions).where(eq(planSubscriptions.id, id)).get()!;

/** Staff decide what happens to a held renewal payment, confirming what they were shown. */
export async function resolveHeldPayment(ctx: StudioActor, subscriptionId: string, ask: HeldAsk): Promise<PlanSubscription> {
  const first = studioSubscription(ctx.studio.id, subscriptionId);
  const by = { actorId: ctx.user.id, source: "staff" } as const;
  return withPlanLock(first.stripeSubscriptionId ?? first.id, async () => {
    // 1. Check what was confirmed and claim the decision: one transaction.
    const { sub, held, refundMinor, handedOn } = getDb().transaction((tx) => {
      const fresh = tx.select().from(planSubscriptions).where(eq(planSubscriptions.id, first.id)).get()!;
      const held = tx.select().from(planInvoices).where(and(eq(planInvoices.id, ask.invoiceId), eq(planInvoices.subscriptionId, fresh.id))).get();
      if (held?.heldResolution) throw conflict("This payment has already been settled. Reload to see it as it is now.", { code: "held_settled" });
      if (!held || held.status !== "paid" || held.counts) throw notFound("This plan has no such held payment.");
      if (fresh.version !== ask.version) throw conflict("The plan changed since this page was opened. Reload to see it as it is now.", { code: "plan_changed" });
      if (PLAN_FINAL.includes(fresh.state)) throw conflict("This plan has already ended; settle the payment with the owner by other means.");
      if (held.amountMinor !== ask.amountMinor) throw conflict("The held payment isn't the amount shown. Reload and confirm again.", { code: "held_changed" });
      const handedOn = paidAfterHandOn(fresh);
      if (ask.resolution !== "refund_and_end" && handedOn) throw conflict("This plan's buyer handed the piece on before paying, so the plan can't start: pay it all back and end the plan.");
      const refundMinor = refundFor(fresh, held, ask.resolution);
      if (refundMinor === null) throw conflict("Only a payment above the plan's price has a difference to pay back. Keep it, or pay it all back and end the plan.");
      if (refundMinor !== ask.refundMinor) throw conflict("The amount to pay back isn't what was shown. Reload and confirm again.", { code: "refund_changed" });
      const claimed = tx
        .update(planInvoices)
        .set({ heldResolution: STORED[ask.resolution], heldRefundedMinor: refundMinor, heldResolvedAt: new Date(), heldResolvedById: ctx.user.id })
        .where(and(eq(planInvoices.id, held.id), isNull(planInvoices.heldResolution)))
        .returning()
        .get();
      if (!claimed) throw conflict("This payment has already been settled. Reload to see it as it is now.", { code: "held_settled" });
      // The version moves on with the claim, so a second decision made on the same page is refused.
      const sub = moveSubscription(tx, fresh, fresh.state, { updatedAt: new Date() }, by);
      return { sub, held: claimed, refundMinor, handedOn };
    });
    // 2. Stripe: stop the subscription (refund and end) and pay back; if it refuses, undo the claim.
    const key = (what: string) => ({ idempotencyKey: `plan-held-${what}-${held.id}` });
    try {
      if (ask.resolution === "refund_and_end" && sub.paidBy === "card" && sub.stripeSubscriptionId) {
        await callStripe("end the plan", (s) => s.subscriptions.cancel(sub.stripeSubscriptionId!, {}, key("end")), sub);
      }
      if (refundMinor > 0) {
        const paymentIntent = await invoicePaymentIntent(sub, held.stripeInvoiceId!);
        await callStripe("pay back the held payment", (s) => s.refunds.create({ payment_intent: paymentIntent, amount: refundMinor, metadata: { planSubscriptionId: sub.id, planInvoiceId: held.id } }, key("refund")), sub);
      }
    } catch (e) {
      getDb().update(planInvoices).set({ heldResolution: null, heldRefundedMinor: 0, heldResolvedAt: null, heldResolvedById: null }).where(eq(planInvoices.id, held.id)).run();
      throw e;
    }
    // 3. Write the outcome: the payment counts and the new period starts, or the plan ends.
    getDb().transaction((tx) => {
      const cur = tx.select().from(planSubscriptions).where(eq(planSubscriptions.id, sub.id)).get()!;
      if (ask.resolution === "refund_and_end") {
        if (!PLAN_FINAL.includes(cur.state)) moveSubscription(tx, cur, "ended", { endedAt: new Date(), endsAt: new Date() }, by);
      } else {
        tx.update(planInvoices).set({ counts: true }).where(eq(planInvoices.id, held.id)).run();
        if (held.periodEnd && (!cur.periodEnd || held.periodEnd > cur.periodEnd)) moveSubscription(tx, cur, cur.state, { periodStart: held.periodStart, periodEnd: held.periodEnd }, by);
      }
      recordAudit(tx, {
        studioId: sub.studioId,
        actorId: ctx.user.id,
        action: "plan.held_payment_settled",
        subjectType: "plan_subscription",
        subjectId: sub.id,
        data: { invoiceId: held.id, stripeInvoiceId: held.stripeInvoiceId, amountMinor: held.amountMinor, refundMinor, resolution: STORED[ask.resolution], version: ask.version },
      });
    });
    return { settled: reread(sub.id), held, refundMinor, handedOn };
  }).then(async ({ settled, held, refundMinor, handedOn }) => {
    const sub = settled.stripeSubscriptionId ? ((await syncPlanSubscription(settled.stripeSubscriptionId, undefined, settled)) ?? settled) : settled;
    // The settled mail's words are a renewal's; a payment made after the hand-over is not one and has its own.
    if (handedOn) await mailPaidAfterHandOn(sub, held, "paid_back");
    else await mailHeldSettled(sub, held, ask.resolution, refundMinor);
    return sub;
  });
}

/** Tells the owner, after the decision is committed, what was charged, what the studio decided, what comes back and the plan's next date. */
async function mailHeldSettled(sub: PlanSubscription, held: PlanInvoice, decision: HeldResolution, refundMinor: number): Promise<void> {
  await mailAfterCommit("held payment settled", async () => {
    const context = planMailContext(sub);
    if (!context) return;
    const { owner, studio, piece, zone } = context;
    const next = decision === "refund_and_end" ? (sub.endedAt ?? new Date()) : sub.periodEnd;
    const props = {
      ...context.names,
      charged: formatMoney(held.amountMinor, held.currency, studio.country),
      price: formatMoney(sub.amountMinor, sub.currency, studio.country),
      decision,
      refund: refundMinor > 0 ? formatMoney(refundMinor, held.currency, studio.country) : null,
      nextOn: next ? `${formatInstant(next, zone)} (${formatZone(zone)})` : "the day shown on your piece's page",
      url: pieceUrl(piece.id),
    };
    await sendMail({ studioId: sub.studioId, to: owner.email, subject: planHeldSettledSubject(props), email: PlanHeldSettledEmail(props), replyTo: studio.email || undefined });
  });
}
