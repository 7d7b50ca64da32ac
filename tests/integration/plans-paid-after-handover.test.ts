// A care plan's checkout opened before the owner handed the piece on and paid after: the money is not
// taken as the plan's payment (the plan doesn't start for a piece its buyer no longer holds); it is held
// for staff, who can only pay it back and end the plan. Real stripe SDK against the local Stripe fake
// over HTTP. Invented studio and owner.
import { and, eq } from "drizzle-orm";
import { describe, expect, it } from "vitest";
import { getDb } from "@/db/client";
import { planInvoices } from "@/db/schema";
import { addDays, localDate } from "@/lib/care/dates";
import { releasePiece } from "@/lib/owner/transfer";
import { studioPlanDetail } from "@/lib/plans/cancel";
import { resolveHeldPayment } from "@/lib/plans/held";
import { livePlanOfPiece, startPlanCheckout } from "@/lib/plans/subscriptions";
import { studioPlanRow } from "@/lib/plans/overview";
import { auditsOf, createPiece, createStudio, createUser, memberContext, unique } from "../support/fixtures";
import { listMail, waitForMail } from "../support/mail";
import { plansStripeForFile, subRow, until, yearlyPlan } from "../support/plans-stripe";

const stripe = plansStripeForFile();

describe("a care plan paid after its buyer handed the piece on", () => {
  it("does not start: the payment is held, staff are told why and can only pay it all back, which ends it", async () => {
    const studio = createStudio({ email: `${unique("handed")}@test.example`, taxRateBp: 0 });
    const admin = await memberContext(studio, "admin");
    const owner = await createUser();
    const { piece } = createPiece(studio, { ownerId: owner.id, deliveredOn: addDays(localDate(new Date(), "UTC"), -60) });
    const plan = yearlyPlan(admin, { refundRule: "none", transfers: false });

    const since = new Date();
    const { checkoutUrl, subscriptionId } = await startPlanCheckout(owner, piece.id, plan.id);
    await releasePiece({ ...owner }, piece.id, { confirm: true });
    // The payment page was still open: the card is charged after the hand-over.
    const paid = await fetch(checkoutUrl, { method: "POST", body: new URLSearchParams({ card: "4242424242424242" }), redirect: "manual" });
    expect(paid.status).toBe(303);
    await until(() => getDb().select().from(planInvoices).where(and(eq(planInvoices.subscriptionId, subscriptionId), eq(planInvoices.status, "paid"))).all().length === 1);
    await until(() => stripe.fake.deliveries().length >= stripe.fake.events().length && stripe.fake.deliveries().every((d) => d.status === 200));

    // Not running, not covering the piece; the payment is held and audited once.
    expect(subRow(subscriptionId).state).toBe("awaiting_payment");
    expect(livePlanOfPiece(piece.id)).toBeNull();
    const invoice = getDb().select().from(planInvoices).where(eq(planInvoices.subscriptionId, subscriptionId)).get()!;
    expect(invoice).toMatchObject({ status: "paid", counts: false, amountMinor: 12_000 });
    expect(auditsOf(subscriptionId, "plan.payment_held")).toHaveLength(1);
    // The person who paid is told, once, that the payment is held and will be paid back (time with its zone).
    const heldMail = await waitForMail({ to: owner.email, subject: /^Your care plan payment is held — /, since });
    expect(heldMail.text).toMatch(/You paid \$120\.00 on \d{1,2} [A-Z][a-z]+ \d{4}(,| at) \d{2}:\d{2} [A-Z]+ for the .* care plan on your .*\. The payment came in after you had handed the piece on/);
    expect(heldMail.text).toContain("will pay it back to the card you paid with");

    const held = studioPlanDetail(admin, subscriptionId).held!;
    expect(held.words).toMatch(/^The first payment, \$120\.00 on .*, came after the person who bought this plan had handed the piece on\. The payment is held and the plan hasn't started\./);
    expect(held.options.map((o) => [o.resolution, o.refundMinor])).toEqual([["refund_and_end", 12_000]]);
    expect(studioPlanRow(admin, subscriptionId)!.stateLabel).toBe("Waiting for the first payment, a payment held for you to check");

    // Keeping it is refused even when asked for directly; paying it back ends the plan here and at Stripe.
    const keep = await resolveHeldPayment(admin, subscriptionId, { invoiceId: held.invoiceId, resolution: "accept", version: held.version, amountMinor: 12_000, refundMinor: 0 }).catch((e: unknown) => e);
    expect((keep as { status?: number }).status).toBe(409);
    const after = await resolveHeldPayment(admin, subscriptionId, { invoiceId: held.invoiceId, resolution: "refund_and_end", version: held.version, amountMinor: 12_000, refundMinor: 12_000 });
    expect(after.state).toBe("ended");
    const sub = subRow(subscriptionId);
    expect(stripe.fake.subscriptions().find((s) => s.id === sub.stripeSubscriptionId)!.status).toBe("canceled");
    const pi = stripe.fake.invoices().find((i) => i.id === invoice.stripeInvoiceId)!.payments.data[0]!.payment.payment_intent;
    expect(stripe.fake.charges().find((c) => c.payment_intent === pi)!.amount_refunded).toBe(12_000);
    // Then that it is paid back; never the renewal's "settled" words, and no second "held" mail (each event replayed changes nothing).
    const back = await waitForMail({ to: owner.email, subject: /^Your care plan payment is on its way back — /, since });
    expect(back.text).toMatch(/has paid back the \$120\.00 you paid on .* The plan never started, since the piece\s+had been handed on/);
    const mails = (await listMail({ to: owner.email })).filter((m) => Date.parse(m.receivedAt) >= since.getTime());
    expect(mails.filter((m) => /payment is held/.test(m.subject))).toHaveLength(1);
    expect(mails.filter((m) => /renewal/i.test(m.subject))).toHaveLength(0);
  });
});
