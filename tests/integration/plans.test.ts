// Care plans through the real stripe SDK against the local Stripe fake over HTTP (tests/support/plans-stripe.ts
// starts the fake and a receiver that hands its signed webhooks to the webhook route's handlers).
import { and, eq } from "drizzle-orm";
import { describe, expect, it } from "vitest";
import { getDb } from "@/db/client";
import { careLogEntries, reminderSends, planInvoices, planVisits, repairJobs, stripeEvents, users as usersTable, type Piece, type Studio } from "@/db/schema";
import { addDays, localDate } from "@/lib/care/dates";
import { claimCoverage } from "@/lib/claims/coverage";
import { env } from "@/lib/env";
import { cancelPlanAtPeriodEnd } from "@/lib/plans/cancel";
import { canMovePlan, PLAN_STATES } from "@/lib/plans/states";
import { handlePlanWebhook } from "@/lib/plans/stripe-sync";
import { plansForMyPiece } from "@/lib/plans/offers";
import { listStudioPlans, planOverview } from "@/lib/plans/overview";
import { livePlanOfPiece, startPlanByOtherMeans, startPlanCheckout } from "@/lib/plans/subscriptions";
import { planPrice } from "@/lib/plans/price";
import { createTemplate, templatesFitting, updateTemplate } from "@/lib/plans/templates";
import { planTemplateSchema } from "@/lib/plans/validation";
import { PLAN_VISIT_LEAD_DAYS, runPlanVisits, visitDueDates } from "@/lib/plans/visits";
import { runReminderPass } from "@/lib/reminders/pass";
import { createJob, getOwnerJob } from "@/lib/repairs/jobs";
import { sendQuote, updateJobQuote } from "@/lib/repairs/payment";
import { auditsOf, createAcceptedClaim, createPiece, createStudio, createUser, memberContext, unique } from "../support/fixtures";
import { getMail, waitForMail } from "../support/mail";
import { buyPlan, knob as stripeKnob, plansStripeForFile, subRow, until } from "../support/plans-stripe";

const stripe = plansStripeForFile();
const DAY = 86_400_000;

const knob = (subId: string, action: string, body = "") => stripeKnob(stripe.fake, subId, action, body);

const template = (over: Partial<Record<string, unknown>> = {}) =>
  planTemplateSchema.parse({
    name: "Yearly finish keeping (test)",
    included: { tasks: ["reoil"], visitsPerYear: 1, visitSharePct: 0, extendedLines: [{ category: "crack_gap", extraMonths: 36 }], repairDiscountPct: 10 },
    fits: { finishClasses: ["hardwax_oil"], pieceKinds: ["dining_table"], minTopAreaM2: 0.5, maxTopAreaM2: 4 },
    priceMinor: 12_000,
    interval: "year",
    ...over,
  });

/** A studio with 8.25 % tax on top, a plan, and an owner's piece delivered three years before today (so the base crack line of 24 months has run out). */
async function setup(studioOver: Partial<Studio> = {}) {
  const studio = createStudio({ email: `${unique("studio")}@test.example`, taxMode: "single", taxRateBp: 825, taxInclusive: false, labourRateMinor: 8500, travelFeeMinor: 4500, ...studioOver });
  const admin = await memberContext(studio, "admin");
  const owner = await createUser();
  const deliveredOn = addDays(localDate(new Date(), "UTC"), -3 * 365);
  const { piece } = createPiece(studio, { ownerId: owner.id, deliveredOn });
  const plan = createTemplate(admin, template());
  return { studio, admin, owner, piece, plan };
}

const buy = (owner: Awaited<ReturnType<typeof createUser>>, piece: Piece, templateId: string) => buyPlan(stripe.fake, owner, piece.id, templateId);

function coverageOn(piece: Piece, ownerId: string, at: Date) {
  return claimCoverage({
    claim: { category: "crack_gap", answers: {}, createdAt: at, ownerId },
    piece,
    layers: [],
    careLog: [],
    products: [],
    policyRow: null,
    ownerships: [],
    timeZone: "UTC",
  });
}

describe("plan templates", () => {
  it("a change makes a new version; the running plan keeps the version it was bought under", async () => {
    const { admin, owner, piece, plan } = await setup();
    const sub = await buy(owner, piece, plan.id);
    const v2 = updateTemplate(admin, plan.id, template({ priceMinor: 15_000 }));
    expect(v2).toMatchObject({ lineageId: plan.lineageId, version: 2, priceMinor: 15_000 });
    expect(subRow(sub.id).templateId).toBe(plan.id);
    expect(() => updateTemplate(admin, plan.id, template())).toThrow(/changed meanwhile/);
    // The owner is now offered the new version only.
    expect(templatesFitting(piece).map((t) => t.id)).toEqual([v2.id]);
  });

  it("fits pieces by kind, finish class and top area", async () => {
    const { studio, admin, owner } = await setup();
    const big = createTemplate(admin, template({ name: "Large tops", fits: { finishClasses: [], pieceKinds: [], minTopAreaM2: 3, maxTopAreaM2: null } }));
    const { piece } = createPiece(studio, { ownerId: owner.id, lengthMm: 2000, widthMm: 900 }); // 1.8 m²
    expect(templatesFitting(piece).some((t) => t.id === big.id)).toBe(false);
    const { piece: wide } = createPiece(studio, { ownerId: owner.id, lengthMm: 3000, widthMm: 1100 }); // 3.3 m²
    expect(templatesFitting(wide).some((t) => t.id === big.id)).toBe(true);
    const { piece: bench } = createPiece(studio, { ownerId: owner.id, kind: "bench" });
    expect(templatesFitting(bench)).toEqual([]);
  });

  it("the state machine: final states stay final; every state is reachable from awaiting payment", () => {
    for (const s of PLAN_STATES) {
      expect(canMovePlan("lapsed", s)).toBe(false);
      expect(canMovePlan("ended", s)).toBe(false);
    }
    expect(canMovePlan("awaiting_payment", "running")).toBe(true);
    expect(canMovePlan("running", "awaiting_payment")).toBe(false);
  });
});

describe("buying and running a plan through the Stripe fake", () => {
  it("buy → running at the template's price with the studio's tax → included visit job ahead of its due date at zero → coverage cites the plan", async () => {
    const { studio, owner, piece, plan } = await setup();
    const sub = await buy(owner, piece, plan.id);
    // 120.00 + 8.25 % = 129.90 (tax on top, lib/repairs priceLines).
    expect(planPrice(studio, plan)).toEqual({ totalMinor: 12_990, taxMinor: 990, netMinor: 12_000 });
    expect(sub).toMatchObject({ amountMinor: 12_990, paidBy: "card", templateId: plan.id });
    expect(sub.stripeSubscriptionId).toMatch(/^sub_test_/);
    const invoice = getDb().select().from(planInvoices).where(eq(planInvoices.subscriptionId, sub.id)).get()!;
    expect(invoice).toMatchObject({ status: "paid", amountMinor: 12_990, taxMinor: 990, counts: true });
    expect(livePlanOfPiece(piece.id)?.sub.id).toBe(sub.id);
    const audit = auditsOf(sub.id, "plan.running");
    expect(audit).toHaveLength(1);
    expect(audit[0]!.data).toMatchObject({ from: "awaiting_payment", source: "stripe" });

    // One visit a year, due half a year after the start; nothing is made before the lead time.
    const [due] = visitDueDates(sub.startedAt!, 1, new Date(sub.startedAt!.getTime() + 365 * DAY), studio.timeZone);
    const dueMs = Date.parse(`${due}T12:00:00Z`);
    expect((await runPlanVisits(new Date(dueMs - (PLAN_VISIT_LEAD_DAYS + 2) * DAY))).jobs.filter((j) => jobOf(j).pieceId === piece.id)).toHaveLength(0);
    const ahead = await runPlanVisits(new Date(dueMs - 10 * DAY));
    const mine = ahead.jobs.filter((j) => jobOf(j).pieceId === piece.id);
    expect(mine).toHaveLength(1);
    expect(jobOf(mine[0]!)).toMatchObject({ state: "covered", totalMinor: 0, coveredPct: 100, origin: "plan", ownerId: owner.id });
    // Its title names the work the plan includes, not the piece every page shows beside it.
    expect(jobOf(mine[0]!).title).toBe("Care plan visit: re-oil, annual clean and check");
    expect(jobOf(mine[0]!).title).not.toContain(piece.title);
    // A second pass makes no second job for the same visit.
    expect((await runPlanVisits(new Date(dueMs - 9 * DAY))).jobs.filter((j) => jobOf(j).pieceId === piece.id)).toHaveLength(0);
    expect(getDb().select().from(planVisits).where(eq(planVisits.subscriptionId, sub.id)).all()).toHaveLength(1);
    await waitForMail({ to: owner.email, subject: /care plan visit/i });

    const c = coverageOn(piece, owner.id, new Date());
    expect(c.check!.termEndsOn).toBe(addMonthsIso(piece.deliveredOn, 24 + 36));
    expect(c.check!.reasons[0]).toMatch(/care plan “Yearly finish keeping \(test\)” \(version 1\) is running: .* lengthened by 36 months/);
  });

  it("a plan with an owner's share prices the visit job at that share", async () => {
    const { admin, owner, studio } = await setup();
    const shared = createTemplate(admin, template({ name: "Shared visits", included: { tasks: [], visitsPerYear: 2, visitSharePct: 40, extendedLines: [], repairDiscountPct: 0 } }));
    const { piece } = createPiece(studio, { ownerId: owner.id });
    const sub = await buy(owner, piece, shared.id);
    const [due] = visitDueDates(sub.startedAt!, 2, new Date(sub.startedAt!.getTime() + 365 * DAY), studio.timeZone);
    const jobs = (await runPlanVisits(new Date(Date.parse(`${due}T12:00:00Z`) - 5 * DAY))).jobs.map(jobOf).filter((j) => j.pieceId === piece.id);
    expect(jobs).toHaveLength(1);
    expect(jobs[0]).toMatchObject({ coveredPct: 60, state: "quoted", origin: "plan" });
    expect(jobs[0]!.coveredMinor).toBe(Math.round((jobs[0]!.subtotalMinor * 60) / 100));
  });

  it("a plan visit's quote, changed by staff and sent again, says the plan pays its part, not the warranty (quote mail through the SMTP sink)", async () => {
    const { admin, owner, studio } = await setup();
    const shared = createTemplate(admin, template({ name: "Shared visits (quote words)", included: { tasks: [], visitsPerYear: 2, visitSharePct: 40, extendedLines: [], repairDiscountPct: 0 } }));
    const { piece } = createPiece(studio, { ownerId: owner.id });
    const sub = await buy(owner, piece, shared.id);
    const [due] = visitDueDates(sub.startedAt!, 2, new Date(sub.startedAt!.getTime() + 365 * DAY), studio.timeZone);
    const [job] = (await runPlanVisits(new Date(Date.parse(`${due}T12:00:00Z`) - 5 * DAY))).jobs.map(jobOf).filter((j) => j.pieceId === piece.id);
    expect(job).toMatchObject({ origin: "plan", coveredPct: 60, state: "quoted" });

    // Staff add a coat and send the quote again: the job stays the plan's visit.
    const q = job!.quoteInput;
    await updateJobQuote(admin, job!.id, { title: job!.title, tasks: q.tasks ?? [], repairs: q.repairs ?? [], productIds: q.productIds ?? [], coats: 2, travel: q.travel ?? true, coveredPct: job!.coveredPct, notes: job!.notes });
    const since = new Date();
    await sendQuote(admin, job!.id);
    expect(jobOf(job!.id)).toMatchObject({ origin: "plan", coveredPct: 60, state: "quoted", quoteVersion: 2 });
    // The owner's page names the plan.
    expect(getOwnerJob(owner, job!.id).planName).toBe("Shared visits (quote words)");
    const mail = await getMail((await waitForMail({ to: owner.email, subject: new RegExp(piece.title.replace(/[()]/g, "\\$&")), since })).id);
    // Titled as the visit and the owner's share of it (coverWords, lib/repairs/states.ts), not a repair quote.
    expect(mail.subject).toBe(`Your care plan visit: your share — ${piece.title}`);
    expect(mail.html).toContain("Your care plan visit: your share");
    expect(mail.text).toContain("Paid by the care plan (60 %)");
    expect(mail.html).toContain("Paid by the care plan (60 %)");
    expect(`${mail.subject}\n${mail.text}\n${mail.html}`).not.toMatch(/warranty|repair quote/i);

    // A claim's job the warranty covers in part, and one the owner pays in full, keep "Your repair quote".
    for (const [decision, title] of [["partly_covered", "Elm console (invented)"], ["chargeable", "Beech stool (invented)"]] as const) {
      const { piece: claimed } = createPiece(studio, { ownerId: owner.id, title });
      const claimJob = createJob(admin, "claim", createAcceptedClaim(studio, claimed.id, owner.id, decision, 40).id);
      const sentAt = new Date();
      await sendQuote(admin, claimJob.id);
      expect(jobOf(claimJob.id)).toMatchObject({ origin: "claim", state: "quoted" });
      const kept = await getMail((await waitForMail({ to: owner.email, subject: `Your repair quote from ${studio.name}`, since: sentAt })).id);
      expect(kept.html).toContain(title);
      expect(kept.html).toContain("Your repair quote");
      expect(kept.html).not.toMatch(/care plan/i);
    }
  });

  it("a plan visit re-quoted to leave nothing to pay: its quote mail says the visit is included, not a covered repair; a warranty job keeps its words (SMTP sink)", async () => {
    const { admin, owner, studio } = await setup();
    const shared = createTemplate(admin, template({ name: "Shared visits (included words)", included: { tasks: [], visitsPerYear: 2, visitSharePct: 40, extendedLines: [], repairDiscountPct: 0 } }));
    const { piece } = createPiece(studio, { ownerId: owner.id, title: "Ash sideboard (invented)" });
    const sub = await buy(owner, piece, shared.id);
    const [due] = visitDueDates(sub.startedAt!, 2, new Date(sub.startedAt!.getTime() + 365 * DAY), studio.timeZone);
    const [job] = (await runPlanVisits(new Date(Date.parse(`${due}T12:00:00Z`) - 5 * DAY))).jobs.map(jobOf).filter((j) => j.pieceId === piece.id);
    expect(job).toMatchObject({ origin: "plan", coveredPct: 60, state: "quoted" });

    // The studio waives the owner's share: the plan now pays all of the visit.
    const q = job!.quoteInput;
    await updateJobQuote(admin, job!.id, { title: job!.title, tasks: q.tasks ?? [], repairs: q.repairs ?? [], productIds: q.productIds ?? [], coats: q.coats ?? 1, travel: q.travel ?? true, coveredPct: 100, notes: job!.notes });
    const since = new Date();
    await sendQuote(admin, job!.id);
    expect(jobOf(job!.id)).toMatchObject({ origin: "plan", state: "covered", totalMinor: 0 });
    const mail = await getMail((await waitForMail({ to: owner.email, subject: /Ash sideboard/, since })).id);
    expect(mail.subject).toBe("Your care plan visit is included — Ash sideboard (invented)");
    expect(mail.html).toContain("Your care plan visit is included");
    expect(mail.text).toMatch(/your care plan visit is included/i);
    expect(`${mail.subject}\n${mail.text}\n${mail.html}`).not.toMatch(/repair is covered|warranty/i);

    // A claim's job the warranty covers in full keeps "Your repair is covered".
    const { piece: claimed } = createPiece(studio, { ownerId: owner.id, title: "Oak bench (invented)" });
    const claim = createAcceptedClaim(studio, claimed.id, owner.id, "covered");
    const warranty = createJob(admin, "claim", claim.id);
    await sendQuote(admin, warranty.id);
    expect(jobOf(warranty.id)).toMatchObject({ origin: "claim", state: "covered", totalMinor: 0 });
    const kept = await getMail((await waitForMail({ to: owner.email, subject: /Oak bench/, since })).id);
    expect(kept.subject).toBe("Your repair is covered — Oak bench (invented)");
    expect(kept.html).toContain("Your repair is covered");
    expect(kept.html).not.toMatch(/care plan/i);
  });

  it("renewal paid: a new period and a second counted invoice; the plan keeps running", async () => {
    const { owner, piece, plan } = await setup();
    const sub = await buy(owner, piece, plan.id);
    const firstEnd = sub.periodEnd!.getTime();
    expect((await knob(sub.stripeSubscriptionId!, "renew", "outcome=pay")).status).toBe(200);
    const renewed = await until(() => {
      const s = subRow(sub.id);
      return s.periodStart?.getTime() === firstEnd && getDb().select().from(planInvoices).where(eq(planInvoices.subscriptionId, sub.id)).all().length === 2 && s;
    });
    expect(renewed.state).toBe("running");
    expect(getDb().select().from(planInvoices).where(eq(planInvoices.subscriptionId, sub.id)).all().every((i) => i.counts && i.status === "paid")).toBe(true);
  });

  it("renewal failed → grace with a mail to the owner → lapse → coverage back to the base terms from the lapse date", async () => {
    const { owner, piece, plan } = await setup();
    const sub = await buy(owner, piece, plan.id);
    await knob(sub.stripeSubscriptionId!, "renew", "outcome=fail");
    const grace = await until(() => subRow(sub.id).state === "grace" && subRow(sub.id));
    expect(grace.graceEndsAt!.getTime()).toBeGreaterThan(Date.now() + 13 * DAY);
    const mail = await waitForMail({ to: owner.email, subject: /payment didn't go through/i });
    expect(mail.text).toContain("$129.90");
    expect(mail.text).toContain("Yearly finish keeping (test)");
    const failed = await until(() => getDb().select().from(planInvoices).where(and(eq(planInvoices.subscriptionId, sub.id), eq(planInvoices.status, "failed"))).get());
    expect(failed.counts).toBe(false);
    // Still covered during grace.
    expect(coverageOn(piece, owner.id, new Date()).check!.termEndsOn).toBe(addMonthsIso(piece.deliveredOn, 60));

    await knob(sub.stripeSubscriptionId!, "lapse");
    const lapsed = await until(() => subRow(sub.id).state === "lapsed" && subRow(sub.id));
    const lapsedAt = lapsed.lapsedAt!.getTime();
    // A claim the day after the lapse: base terms (24 months from delivery, run out), the plan named as lapsed.
    const after = coverageOn(piece, owner.id, new Date(lapsedAt + DAY));
    expect(after.check!.termEndsOn).toBe(addMonthsIso(piece.deliveredOn, 24));
    expect(after.check!.suggestion).toBe("not_covered");
    expect(after.check!.reasons[0]).toMatch(/lapsed on .*; the base terms apply from that day/);
    // Included visits stop.
    expect(livePlanOfPiece(piece.id)).toBeNull();
  });

  it("cancel at period end: ending until the period is over, then ended", async () => {
    const { admin, owner, piece, plan } = await setup();
    const sub = await buy(owner, piece, plan.id);
    const ending = await cancelPlanAtPeriodEnd(admin, sub.id, { version: subRow(sub.id).version, refundMinor: 0 });
    expect(ending.state).toBe("ending");
    expect(livePlanOfPiece(piece.id)?.sub.id).toBe(sub.id);
    await knob(sub.stripeSubscriptionId!, "renew", "outcome=pay");
    const ended = await until(() => subRow(sub.id).state === "ended" && subRow(sub.id));
    expect(ended.endedAt!.getTime()).toBe(sub.periodEnd!.getTime());
    // No invoice for a period that never started.
    expect(getDb().select().from(planInvoices).where(eq(planInvoices.subscriptionId, sub.id)).all()).toHaveLength(1);
    // Another studio's staff can't cancel it.
    const other = await memberContext(createStudio({ email: `${unique("s")}@test.example` }), "admin");
    await expect(cancelPlanAtPeriodEnd(other, sub.id, { version: sub.version, refundMinor: 0 })).rejects.toMatchObject({ status: 404 });
  });

  it("replayed and out-of-order events leave one state", async () => {
    const { owner, piece, plan } = await setup();
    const sub = await buy(owner, piece, plan.id);
    await knob(sub.stripeSubscriptionId!, "renew", "outcome=fail");
    await until(() => subRow(sub.id).state === "grace");
    await knob(sub.stripeSubscriptionId!, "settle");
    await until(() => subRow(sub.id).state === "running");
    const settled = subRow(sub.id);
    const events = stripe.fake.events().filter((e) => JSON.stringify(e.data.object).includes(sub.stripeSubscriptionId!));
    expect(events.map((e) => e.type)).toContain("invoice.payment_failed");
    // Every event again, oldest last (out of order), each twice.
    for (const e of [...events].reverse()) {
      expect(await stripe.fake.redeliver(e.id)).toBe(200);
      expect(await stripe.fake.redeliver(e.id)).toBe(200);
    }
    const after = subRow(sub.id);
    expect(after).toMatchObject({ state: "running", version: settled.version, periodEnd: settled.periodEnd });
    // An old event with a new id (as if Stripe had sent it late) re-reads Stripe and changes nothing either.
    const failed = events.find((e) => e.type === "invoice.payment_failed")!;
    const payload = JSON.stringify({ ...failed, id: `evt_late_${sub.id}` });
    const header = (await import("@/lib/payments/stripe")).getStripe().webhooks.generateTestHeaderString({ payload, secret: env.STRIPE_WEBHOOK_SECRET });
    expect(await handlePlanWebhook(payload, header)).toEqual({ received: true });
    expect(subRow(sub.id)).toMatchObject({ state: "running", version: settled.version });
    expect(getDb().select().from(planInvoices).where(eq(planInvoices.subscriptionId, sub.id)).all()).toHaveLength(2);
    expect(getDb().select().from(stripeEvents).where(eq(stripeEvents.id, `evt_late_${sub.id}`)).all()).toHaveLength(1);
    // One grace mail for the one failed renewal.
    const grace = auditsOf(sub.id, "plan.grace");
    expect(grace).toHaveLength(1);
  });

  it("a forged signature is refused with 400 and changes nothing", async () => {
    const payload = JSON.stringify({ id: "evt_forged_plan", object: "event", type: "customer.subscription.deleted", data: { object: { id: "sub_x" } } });
    const forged = (await import("@/lib/payments/stripe")).getStripe().webhooks.generateTestHeaderString({ payload, secret: "whsec_someone_else" });
    await expect(handlePlanWebhook(payload, forged)).rejects.toMatchObject({ status: 400 });
    expect(getDb().select().from(stripeEvents).where(eq(stripeEvents.id, "evt_forged_plan")).all()).toHaveLength(0);
  });

  it("staff start a plan for a client who paid by other means; another owner can't buy a plan for someone else's piece", async () => {
    const { admin, owner, piece, plan } = await setup();
    const stranger = await createUser();
    await expect(startPlanCheckout(stranger, piece.id, plan.id)).rejects.toMatchObject({ status: 404 });
    const sub = startPlanByOtherMeans(admin, { pieceId: piece.id, templateId: plan.id, paidByNote: "Bank transfer" });
    expect(sub).toMatchObject({ state: "running", paidBy: "other", paidByNote: "Bank transfer", ownerId: owner.id });
    expect(getDb().select().from(planInvoices).where(eq(planInvoices.subscriptionId, sub.id)).get()).toMatchObject({ amountMinor: 12_990, stripeInvoiceId: null, counts: true });
    expect(() => startPlanByOtherMeans(admin, { pieceId: piece.id, templateId: plan.id, paidByNote: "Cash" })).toThrow(/already under a care plan/);
    await expect(startPlanCheckout(owner, piece.id, plan.id)).rejects.toMatchObject({ status: 409 });
    // Its period over and not renewed, the scheduler lets it lapse.
    await runPlanVisits(new Date(sub.periodEnd!.getTime() + DAY));
    expect(subRow(sub.id).state).toBe("lapsed");
  });
});

function jobOf(id: string) {
  return getDb().select().from(repairJobs).where(eq(repairJobs.id, id)).get()!;
}

function addMonthsIso(iso: string, months: number): string {
  const [y, m, d] = iso.split("-").map(Number);
  const t = new Date(Date.UTC(y!, m! - 1 + months, 1));
  const last = new Date(Date.UTC(t.getUTCFullYear(), t.getUTCMonth() + 1, 0)).getUTCDate();
  return `${t.getUTCFullYear()}-${String(t.getUTCMonth() + 1).padStart(2, "0")}-${String(Math.min(d!, last)).padStart(2, "0")}`;
}

describe("included tasks are the studio's work", () => {
  it("the reminder pass leaves out the tasks a running plan includes, and reminds as before without a plan", async () => {
    const { studio, owner, piece, plan } = await setup();
    getDb().update(usersTable).set({ emailVerifiedAt: new Date() }).where(eq(usersTable.id, owner.id)).run();
    const { piece: bare } = createPiece(studio, { ownerId: owner.id, deliveredOn: piece.deliveredOn });
    startPlanByOtherMeans((await memberContext(studio, "admin")), { pieceId: piece.id, templateId: plan.id, paidByNote: "Cash at the studio" });
    await runReminderPass({ now: new Date(), deliver: false });
    const keys = (pieceId: string) => getDb().select().from(reminderSends).where(eq(reminderSends.pieceId, pieceId)).all().map((r) => r.taskKey);
    // The oiled top (hard-wax oil, delivered three years ago) is overdue for re-oiling on both pieces.
    expect(keys(bare.id).some((k) => k.includes("reoil"))).toBe(true);
    expect(keys(piece.id).some((k) => k.includes("reoil"))).toBe(false);
  });
});

describe("what the owner is offered", () => {
  it("fitting plans with the price and what the plan would have saved over their last year of care; the plan it is under once bought; another owner's piece is a 404", async () => {
    const { owner, piece, plan } = await setup();
    const today = localDate(new Date(), "UTC");
    for (const [doneOn, taskKind] of [[addDays(today, -100), "reoil"], [addDays(today, -200), "reoil"], [addDays(today, -400), "reoil"], [addDays(today, -50), "annual_check"]] as const) {
      getDb().insert(careLogEntries).values({ studioId: piece.studioId, pieceId: piece.id, userId: owner.id, source: "owner", taskKind, doneOn }).run();
    }
    const { current, offers } = plansForMyPiece(owner, piece.id);
    expect(current).toBeNull();
    const offer = offers.find((o) => o.id === plan.id)!;
    expect(offer).toMatchObject({ priceMinor: 12_990, taxMinor: 990, interval: "year" });
    // Two re-oilings inside the last 365 days count (the one 400 days ago and the inspection, not included, don't).
    expect(offer.lastYear!.entries).toBe(2);
    expect(offer.lastYear!.wouldHaveCostMinor).toBeGreaterThan(0);
    expect(offer.lastYear!.savedMinor).toBe(offer.lastYear!.wouldHaveCostMinor - 12_990);
    const stranger = await createUser();
    expect(() => plansForMyPiece(stranger, piece.id)).toThrow(expect.objectContaining({ status: 404 }));
    await buy(owner, piece, plan.id);
    expect(plansForMyPiece(owner, piece.id)).toMatchObject({ current: { name: plan.name, state: "running", stateLabel: "Running", paidBy: "card" }, offers: [] });
  });
});

describe("the overview's plan figures", () => {
  it("counts plans running, renewals due, lapsed, and revenue by the month paid (counted payments only)", async () => {
    const { studio, admin, owner, piece, plan } = await setup();
    const sub = await buy(owner, piece, plan.id);
    const { piece: second } = createPiece(studio, { ownerId: owner.id });
    startPlanByOtherMeans(admin, { pieceId: second.id, templateId: plan.id, paidByNote: "Bank transfer" });
    const o = planOverview(admin);
    expect(o).toMatchObject({ running: 2, renewalsDue: 0, lapsed: 0, inGrace: 0, totalMinor: 2 * 12_990 });
    expect(o.revenue.at(-1)).toEqual({ month: localDate(new Date(), studio.timeZone).slice(0, 7), amountMinor: 2 * 12_990 });
    // Renewals due in the next 30 days, as of a day 20 days before the period ends.
    expect(planOverview(admin, new Date(sub.periodEnd!.getTime() - 20 * DAY)).renewalsDue).toBe(2);
    expect(listStudioPlans(admin).map((p) => p.pieceTitle)).toHaveLength(2);
    // Another studio sees none of them.
    const other = await memberContext(createStudio({ email: `${unique("s")}@test.example` }), "admin");
    expect(planOverview(other)).toMatchObject({ running: 0, totalMinor: 0 });
  });
});
