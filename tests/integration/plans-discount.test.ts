// A running care plan's discount on paid repairs, through the repair quote to the checkout (the real
// stripe SDK against the Stripe fake over HTTP) and the quote mail (the real SMTP sink): a clearly
// labelled discount row, taken off each line after the warranty's share and before tax, so the
// checkout's line items still add up to the quote's total; a lapsed plan gives none. Amounts are
// worked by hand beside each check; rounding half up once per line — common practice, no published
// source. Invented studios, owners and pieces.
import { eq } from "drizzle-orm";
import { describe, expect, it } from "vitest";
import { getDb } from "@/db/client";
import { claims, planSubscriptions, studios } from "@/db/schema";
import { getStripe } from "@/lib/payments/stripe";
import { startPlanByOtherMeans } from "@/lib/plans/subscriptions";
import { createTemplate } from "@/lib/plans/templates";
import { jobFigures } from "@/lib/repairs/figures";
import { createJob } from "@/lib/repairs/jobs";
import { approveJob, sendQuote } from "@/lib/repairs/payment";
import { updateRepairSettings } from "@/lib/repairs/settings";
import { createAcceptedClaim, createPiece, createStudio, createUser, memberContext, planTemplateInput, unique } from "../support/fixtures";
import { waitForMail } from "../support/mail";
import { plansStripeForFile } from "../support/plans-stripe";

const stripe = plansStripeForFile();

const DAY = 86_400_000;
const PLAN_NAME = "Finish keeping (invented)";

/**
 * A studio at $85.00/h, $45.00 travel, 8.25 % tax on top, selling a plan with 10 % off paid repairs;
 * an owner's piece under that plan (paid by other means), and a crack claim accepted as 40 % covered.
 */
async function pieceUnderPlan() {
  const studio = createStudio({ email: `${unique("studio")}@test.example`, currency: "USD", labourRateMinor: 8500, travelFeeMinor: 4500, taxRateBp: 825 });
  const admin = await memberContext(studio, "admin");
  updateRepairSettings(admin, {
    roundingRule: "cent",
    taxMode: "single",
    taxInclusive: false,
    taxRates: { labour: "0", materials: "0", travel: "0", other: "0" },
    taxNumber: "",
    priceList: [{ key: "crack_fill", label: "Crack or check fill", kind: "labour", unit: "h", price: "" }],
  });
  const staff = await memberContext(getDb().select().from(studios).where(eq(studios.id, studio.id)).get()!, "staff");
  const plan = createTemplate(
    admin,
    planTemplateInput({
      name: PLAN_NAME,
      included: { tasks: [], visitsPerYear: 1, visitSharePct: 0, extendedLines: [], repairDiscountPct: 10 },
      fits: { finishClasses: [], pieceKinds: [], minTopAreaM2: null, maxTopAreaM2: null },
      priceMinor: 12_000,
    }),
  );
  const owner = await createUser();
  const { piece } = createPiece(studio, { ownerId: owner.id });
  const sub = startPlanByOtherMeans(admin, { pieceId: piece.id, templateId: plan.id, paidByNote: "Bank transfer (invented)" }, new Date(Date.now() - 30 * DAY));
  const claim = createAcceptedClaim(studio, piece.id, owner.id, "partly_covered", 40);
  getDb().update(claims).set({ category: "crack_gap" }).where(eq(claims.id, claim.id)).run();
  return { studio, staff, owner, piece, claim, sub };
}

describe("a repair quote on a piece under a care plan", () => {
  it("a running plan: a labelled discount row, each line discounted after the warranty share and before tax, and the checkout charges that total", async () => {
    const { staff, owner, claim } = await pieceUnderPlan();
    const job = createJob(staff, "claim", claim.id);
    // By hand, 40 % covered, then 10 % off the owner's part, then 8.25 % tax, each rounded half up per line:
    //   crack fill 1 h × 85.00 = 85.00; covered 34.00; discount 10 % of 51.00 = 5.10; part 45.90; tax 3.78675 → 3.79; line 49.69
    //   travel 45.00; covered 18.00; discount 10 % of 27.00 = 2.70; part 24.30; tax 2.00475 → 2.00; line 26.30
    //   subtotal 130.00, covered 52.00, discount 7.80, net 70.20, tax 5.79, total 75.99
    expect(job.lines.map((l) => [l.description, l.discountMinor, l.taxMinor, l.totalMinor])).toEqual([
      ["Crack or check fill", 510, 379, 4969],
      ["Travel", 270, 200, 2630],
    ]);
    expect(job).toMatchObject({ subtotalMinor: 13_000, coveredMinor: 5_200, netMinor: 7_020, taxMinor: 579, totalMinor: 7_599 });
    expect(job.pricingRules.planDiscount).toEqual({ pct: 10, planName: PLAN_NAME, planVersion: 1 });

    const figures = jobFigures(job, { country: "US", taxNumber: "" });
    expect(figures.discountLabel).toBe(`Care plan “${PLAN_NAME}”: 10 % off repairs`);
    expect(figures.text.discount).toBe("−$7.80");

    await sendQuote(staff, job.id);
    const quoteMail = await waitForMail({ to: owner.email, subject: /quote/i });
    for (const words of [`Care plan “${PLAN_NAME}”: 10 % off repairs`, "−$7.80", "Covered by the warranty (40 %)", "To pay", "$75.99"]) expect(quoteMail.text).toContain(words);

    const { checkoutUrl } = await approveJob(owner, job.id);
    const session = stripe.fake.sessions().find((s) => s.url === checkoutUrl)!;
    expect(session.amount_total).toBe(7_599);
    const items = await getStripe().checkout.sessions.listLineItems(session.id);
    expect(items.data.map((i) => i.amount_total)).toEqual([4969, 2630]);
    expect(items.data[0]!.description).toContain("after the care plan discount");
  });

  it("a lapsed plan gives no discount: the quote and the checkout are the plain warranty-share figures", async () => {
    const { staff, owner, claim, sub } = await pieceUnderPlan();
    getDb().update(planSubscriptions).set({ state: "lapsed", lapsedAt: new Date(Date.now() - DAY) }).where(eq(planSubscriptions.id, sub.id)).run();
    const job = createJob(staff, "claim", claim.id);
    //   crack fill 85.00; covered 34.00; part 51.00; tax 4.2075 → 4.21; line 55.21
    //   travel 45.00; covered 18.00; part 27.00; tax 2.2275 → 2.23; line 29.23 → total 84.44
    expect(job.lines.map((l) => l.totalMinor)).toEqual([5521, 2923]);
    expect(job.lines.every((l) => !l.discountMinor)).toBe(true);
    expect(job.totalMinor).toBe(8_444);
    expect(job.pricingRules.planDiscount).toBeUndefined();
    expect(jobFigures(job, { country: "US", taxNumber: "" }).text.discount).toBeNull();

    await sendQuote(staff, job.id);
    const quoteMail = await waitForMail({ to: owner.email, subject: /quote/i });
    expect(quoteMail.text).toContain("$84.44");
    expect(quoteMail.text).not.toContain("Care plan");

    const { checkoutUrl } = await approveJob(owner, job.id);
    expect(stripe.fake.sessions().find((s) => s.url === checkoutUrl)!.amount_total).toBe(8_444);
  });
});
