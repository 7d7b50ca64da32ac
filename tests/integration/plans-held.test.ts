// A renewal Stripe charged at another amount than the plan's price: the plan isn't shown as simply
// running — staff and the owner are told in plain words what happened and what happens next — and staff
// settle it (keep it, pay back the difference, or pay it all back and end the plan). Money moves only
// when the plan version, held amount and refund confirmed are the current ones. Real stripe SDK against
// the local Stripe fake over HTTP (its renew knob bills another amount). Invented studio and owners.
import { eq } from "drizzle-orm";
import { describe, expect, it } from "vitest";
import { getDb } from "@/db/client";
import { planInvoices, type PlanSubscription } from "@/db/schema";
import { addDays, localDate } from "@/lib/care/dates";
import { AppError } from "@/lib/errors";
import { myPlanControl, studioPlanDetail } from "@/lib/plans/cancel";
import { heldSettledForStaff, resolveHeldPayment, type HeldAsk } from "@/lib/plans/held";
import { planOverview, studioPlanRow } from "@/lib/plans/overview";
import { syncPlanSubscription } from "@/lib/plans/stripe-sync";
import { auditsOf, createPiece, createStudio, createUser, memberContext, unique } from "../support/fixtures";
import { listMail, waitForMail } from "../support/mail";
import { buyPlan, knob, plansStripeForFile, subRow, until, yearlyPlan } from "../support/plans-stripe";

const stripe = plansStripeForFile();
const invoiceRow = (id: string) => getDb().select().from(planInvoices).where(eq(planInvoices.id, id)).get()!;
/** What the fake's charge book says was refunded of a Stripe invoice's payment. */
const refundedOf = (stripeInvoiceId: string) => {
  const pi = stripe.fake.invoices().find((i) => i.id === stripeInvoiceId)!.payments.data[0]!.payment.payment_intent;
  return stripe.fake.charges().find((c) => c.payment_intent === pi)!.amount_refunded;
};
const settle = (admin: Awaited<ReturnType<typeof memberContext>>, subId: string, ask: HeldAsk) => resolveHeldPayment(admin, subId, ask).catch((e: unknown) => e);

/** A studio (no tax: the plan costs 120.00 a year, in its Berlin zone), an owner's plan bought and running, and a renewal charged at `amount`. */
async function heldRenewal(amount: number) {
  const studio = createStudio({ email: `${unique("held")}@test.example`, taxRateBp: 0, timeZone: "Europe/Berlin" });
  const admin = await memberContext(studio, "admin");
  const owner = await createUser({ timeZone: "America/Chicago" });
  const { piece } = createPiece(studio, { ownerId: owner.id, deliveredOn: addDays(localDate(new Date(), "UTC"), -60) });
  const plan = yearlyPlan(admin, { refundRule: "none", transfers: false });
  const sub = await buyPlan(stripe.fake, owner, piece.id, plan.id);
  await knob(stripe.fake, sub.stripeSubscriptionId!, "renew", `outcome=pay&amount=${amount}`);
  await until(() => studioPlanDetail(admin, sub.id).held);
  await until(() => stripe.fake.deliveries().length >= stripe.fake.events().length && stripe.fake.deliveries().every((d) => d.status === 200));
  return { admin, owner, piece, plan, sub: subRow(sub.id), before: sub };
}


describe("a renewal held because Stripe charged another amount", () => {
  it("is shown to staff and the owner in plain words, not as simply running", async () => {
    const { admin, owner, piece, sub, before } = await heldRenewal(15_000);
    // The plan's period didn't move on.
    expect(sub.periodEnd).toEqual(before.periodEnd);
    const held = studioPlanDetail(admin, sub.id).held!;
    expect(held.words).toMatch(/^The renewal on \d{1,2} \w+ \d{4} \(.*Berlin.*\) charged €?\$?150\.00, but this plan costs \$?120\.00\. The payment is held/);
    expect(held.words).toMatch(/keeps covering as before until you decide/);
    expect(held.options.map((o) => [o.resolution, o.refundMinor])).toEqual([
      ["accept", 0],
      ["refund_difference", 3_000],
      ["refund_and_end", 15_000],
    ]);
    expect(studioPlanRow(admin, sub.id)!.stateLabel).toBe("Running, renewal payment held for you to check");
    const ownerWords = myPlanControl(owner, piece.id)!.held!;
    expect(ownerWords).toMatch(/^Your renewal on \d{1,2} \w+ \d{4} \(.*Chicago.*\) was charged \$?150\.00, not the plan's \$?120\.00\. The studio is checking it/);
    for (const words of [held.words, ownerWords, ...held.options.flatMap((o) => [o.label, o.words])]) expect(words).not.toMatch(/refund_|_and_|difference_refunded|running|\d{4}-\d{2}-\d{2}/);
  });

  it("mails the owner once when the renewal is held, in plain words with the day and zone; replayed events send nothing more", async () => {
    const { owner, piece, plan, sub } = await heldRenewal(15_000);
    const mail = await waitForMail({ to: owner.email, subject: /renewal payment is being checked/ });
    expect(mail.subject).toBe(`Your care plan renewal payment is being checked — ${plan.name}`);
    const text = mail.text.replace(/\s+/g, " ");
    expect(text).toContain(`Hello ${owner.name}, the renewal of the ${plan.name} care plan on your ${piece.title} charged $150.00 on `);
    expect(text).toMatch(/charged \$150\.00 on \d{1,2} \w+ \d{4},? (at )?\d{2}:\d{2} [A-Z][A-Za-z0-9+\-:]+, while the plan costs \$120\.00\./);
    expect(text).toContain("keep it as this renewal's payment or pay back what isn't owed");
    expect(text).toContain("Your plan keeps covering your piece meanwhile, and nothing more is charged.");
    expect(text).toContain(piece.id);
    expect(text).not.toMatch(/refund_|_and_|held_|\d{4}-\d{2}-\d{2}/);
    for (const e of stripe.fake.events().filter((x) => x.type === "invoice.paid")) await stripe.fake.redeliver(e.id);
    await syncPlanSubscription(sub.stripeSubscriptionId!, undefined, subRow(sub.id));
    await new Promise((r) => setTimeout(r, 300));
    expect((await listMail({ to: owner.email })).filter((m) => /renewal payment is being checked/.test(m.subject))).toHaveLength(1);
  });

  it("pays back the difference only for the version and amounts confirmed; then the new period starts and stays started", async () => {
    const { admin, sub } = await heldRenewal(15_000);
    const held = studioPlanDetail(admin, sub.id).held!;
    const stripeInvoiceId = invoiceRow(held.invoiceId).stripeInvoiceId!;
    const ask: HeldAsk = { invoiceId: held.invoiceId, resolution: "refund_difference", version: held.version, amountMinor: 15_000, refundMinor: 3_000 };

    // Stale version, wrong amount, wrong refund: 409 each, no money moves.
    for (const wrong of [{ ...ask, version: held.version - 1 }, { ...ask, amountMinor: 14_000 }, { ...ask, refundMinor: 2_000 }]) {
      const e = await settle(admin, sub.id, wrong);
      expect(e).toBeInstanceOf(AppError);
      expect((e as AppError).status).toBe(409);
    }
    expect(refundedOf(stripeInvoiceId)).toBe(0);

    const after = (await resolveHeldPayment(admin, sub.id, ask)) as PlanSubscription;
    expect(refundedOf(stripeInvoiceId)).toBe(3_000);
    expect(invoiceRow(held.invoiceId)).toMatchObject({ counts: true, heldResolution: "difference_refunded", heldRefundedMinor: 3_000 });
    expect(after.state).toBe("running");
    expect(after.periodEnd!.getTime()).toBeGreaterThan(sub.periodEnd!.getTime());
    expect(studioPlanDetail(admin, sub.id).held).toBeNull();
    expect(studioPlanRow(admin, sub.id)!.stateLabel).toBe("Running");
    expect(auditsOf(sub.id, "plan.held_payment_settled")).toHaveLength(1);
    // The overview's plan revenue counts what was kept: the first year's 120.00 and the renewal's 150.00 less the 30.00 paid back.
    expect(planOverview(admin).totalMinor).toBe(12_000 + 12_000);

    // The same confirmation again (a double click): refused, nothing paid twice.
    const again = await settle(admin, sub.id, ask);
    expect((again as AppError).status).toBe(409);
    // Stripe's events replayed: the payment stays counted and the period stays.
    await syncPlanSubscription(sub.stripeSubscriptionId!, stripeInvoiceId, subRow(sub.id));
    for (const e of stripe.fake.events().filter((x) => x.type === "invoice.paid")) await stripe.fake.redeliver(e.id);
    expect(invoiceRow(held.invoiceId).counts).toBe(true);
    expect(subRow(sub.id).periodEnd).toEqual(after.periodEnd);
    expect(refundedOf(stripeInvoiceId)).toBe(3_000);
  });

  it("a lower amount can be kept as it is (no money moves) but has no difference to pay back", async () => {
    const { admin, sub } = await heldRenewal(9_900);
    const held = studioPlanDetail(admin, sub.id).held!;
    expect(held.options.map((o) => o.resolution)).toEqual(["accept", "refund_and_end"]);
    const noDiff = await settle(admin, sub.id, { invoiceId: held.invoiceId, resolution: "refund_difference", version: held.version, amountMinor: 9_900, refundMinor: 0 });
    expect((noDiff as AppError).status).toBe(409);
    const charges = stripe.fake.charges().map((c) => c.amount_refunded).reduce((a, b) => a + b, 0);
    const after = (await resolveHeldPayment(admin, sub.id, { invoiceId: held.invoiceId, resolution: "accept", version: held.version, amountMinor: 9_900, refundMinor: 0 })) as PlanSubscription;
    expect(stripe.fake.charges().map((c) => c.amount_refunded).reduce((a, b) => a + b, 0)).toBe(charges);
    expect(after.periodEnd!.getTime()).toBeGreaterThan(sub.periodEnd!.getTime());
    expect(invoiceRow(held.invoiceId)).toMatchObject({ counts: true, heldResolution: "accepted" });
  });

  it("paying it all back ends the plan at Stripe and here", async () => {
    const { admin, owner, piece, sub } = await heldRenewal(15_000);
    const held = studioPlanDetail(admin, sub.id).held!;
    const stripeInvoiceId = invoiceRow(held.invoiceId).stripeInvoiceId!;
    const after = (await resolveHeldPayment(admin, sub.id, { invoiceId: held.invoiceId, resolution: "refund_and_end", version: held.version, amountMinor: 15_000, refundMinor: 15_000 })) as PlanSubscription;
    expect(after.state).toBe("ended");
    expect(refundedOf(stripeInvoiceId)).toBe(15_000);
    expect(stripe.fake.subscriptions().find((s) => s.id === sub.stripeSubscriptionId)!.status).toBe("canceled");
    expect(invoiceRow(held.invoiceId)).toMatchObject({ counts: false, heldResolution: "refunded_and_ended" });
    expect(myPlanControl(owner, piece.id)).toBeNull();
  });

  it("tells the owner once, in plain words, what was charged, what the studio decided, what comes back and the next renewal with its zone", async () => {
    const { admin, owner, piece, plan, sub } = await heldRenewal(15_000);
    const held = studioPlanDetail(admin, sub.id).held!;
    const ask: HeldAsk = { invoiceId: held.invoiceId, resolution: "refund_difference", version: held.version, amountMinor: 15_000, refundMinor: 3_000 };
    const since = new Date();
    await resolveHeldPayment(admin, sub.id, ask);
    const mail = await waitForMail({ to: owner.email, subject: /renewal is settled/, since });
    const text = mail.text.replace(/\s+/g, " ");
    expect(text).toContain(`Hello ${owner.name}, the renewal of the ${plan.name} care plan on your ${piece.title} charged`);
    expect(text).toMatch(/charged \$?150\.00, while the plan costs \$?120\.00/);
    expect(text).toMatch(/kept the plan's \$?120\.00 as the payment for this renewal and is paying back the \$?30\.00 above it/);
    expect(text).toMatch(/\$?30\.00 is on its way back to the card you paid with\. Banks usually take 5 to 10 days/);
    expect(text).toMatch(/next renewal is on \d{1,2} \w+ \d{4} \(.*Chicago.*\)/);
    expect(text).not.toMatch(/\d{4}-\d{2}-\d{2}|refund_|difference_refunded|_and_|running|held_/);
    // It closes with the piece's page (a button and the link spelled out) and the studio's offer of help.
    expect(text).toMatch(new RegExp(`See your piece and plan \\S*${piece.id}.*copy this link into your browser: \\S*${piece.id}`));
    expect(text).toContain(`Reply to this mail if you'd like ${admin.studio.name} to help.`);
    expect(mail.from).toContain(admin.studio.name);
    expect(mail.headers["reply-to"]).toContain(admin.studio.email);
    // Staff's page says it was settled, and how, in words.
    expect(heldSettledForStaff(subRow(sub.id), "Europe/Berlin")).toMatch(/^Settled on \d{1,2} \w+ \d{4} \(.*Berlin.*\): \$?30\.00 paid back to the owner's card; \$?120\.00 of the \$?150\.00 charged was kept as the period's payment\.$/);

    // A second submit of the same confirmation: 409, and no second mail.
    const again = await settle(admin, sub.id, ask);
    expect((again as AppError).status).toBe(409);
    await new Promise((r) => setTimeout(r, 300));
    expect((await listMail({ to: owner.email })).filter((m) => /renewal is settled/.test(m.subject))).toHaveLength(1);
  });

  it("keeping a lower amount as charged mails no refund sentence", async () => {
    const { admin, owner, sub } = await heldRenewal(9_900);
    const held = studioPlanDetail(admin, sub.id).held!;
    const since = new Date();
    await resolveHeldPayment(admin, sub.id, { invoiceId: held.invoiceId, resolution: "accept", version: held.version, amountMinor: 9_900, refundMinor: 0 });
    const text = (await waitForMail({ to: owner.email, subject: /renewal is settled/, since })).text.replace(/\s+/g, " ");
    expect(text).toMatch(/kept the \$?99\.00 as the payment for this renewal/);
    expect(text).not.toMatch(/back to the card|paying back|Banks/);
    expect(text).toMatch(/next renewal is on \d{1,2} \w+ \d{4} \(.*Chicago.*\)/);
  });
});
