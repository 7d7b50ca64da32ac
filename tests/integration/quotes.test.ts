// Repair quotes with repair lines, typed lines, rounding and tax, through to the checkout (the real
// stripe SDK against the Stripe fake over HTTP) and the receipt (the real SMTP sink, the PDF).
// Amounts are worked by hand beside each check. Rounding is half up (halves away from zero) once per
// line — common practice, no published source. Currency minor units: ISO 4217 (USD 2, JPY 0).
import { eq } from "drizzle-orm";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { getDb } from "@/db/client";
import { claims, repairJobs, studios } from "@/db/schema";
import { env } from "@/lib/env";
import { startStripeFake, SUCCESS_CARD, type StripeFake } from "@/lib/fakes/stripe-fake";
import { formatMoney } from "@/lib/format";
import { getStripe } from "@/lib/payments/stripe";
import { checkoutLineItems, jobApiMoney } from "@/lib/repairs/figures";
import { createJob, getOwnerJob, getStudioJob } from "@/lib/repairs/jobs";
import { lineAmount, priceLines, roundingStep, type LineDraft, type StudioTax } from "@/lib/repairs/lines";
import { approveJob, sendQuote, syncReturnedCheckout, updateJobQuote } from "@/lib/repairs/payment";
import { receiptPdf } from "@/lib/repairs/receipt";
import { updateRepairSettings } from "@/lib/repairs/settings";
import { pricedPiece } from "@/lib/repairs/pricing";
import { jobDurationMin } from "@/lib/visits/availability";
import { jobQuoteSchema, type QuoteLineInput } from "@/lib/validation/jobs";
import { createAcceptedClaim, createPiece, createProduct, createStudio, createUser, memberContext, unique } from "../support/fixtures";
import { waitForMail } from "../support/mail";
import { ownerActor } from "@/lib/auth/actor";

let fake: StripeFake;

beforeAll(async () => {
  // A fake of this file's own (port 0), so it never meets payments.test.ts's; the SDK is pointed at it
  // before its first call. The owner's return from the payment page settles the job (no webhooks here).
  fake = await startStripeFake({ port: 0, secretKey: env.STRIPE_SECRET_KEY, webhookSecret: env.STRIPE_WEBHOOK_SECRET });
  env.STRIPE_API_PORT = fake.port;
});

afterAll(async () => {
  await fake.close();
});

const SETTINGS_BASE = {
  roundingRule: "cent" as const,
  taxMode: "single" as const,
  taxInclusive: false,
  taxRates: { labour: "0", materials: "0", travel: "0", other: "0" },
  taxNumber: "TX-000-123 (invented)",
  priceList: [
    { key: "crack_fill", label: "Crack or check fill", kind: "labour" as const, unit: "h" as const, price: "" },
    { key: "butterfly_key", label: "Butterfly (bow-tie) key, fitted", kind: "other" as const, unit: "each" as const, price: "35.00" },
    { key: "resin_fill", label: "Resin fill of a void", kind: "materials" as const, unit: "mL" as const, price: "0.12" },
  ],
};

/** A studio at $85.00/h, $45.00 travel, 8.25 % tax; a crack claim accepted as 40 % covered; its job. */
async function crackJob() {
  const studio = createStudio({ email: `${unique("studio")}@test.example`, address: "1 Invented Yard, Portland OR", currency: "USD", labourRateMinor: 8500, travelFeeMinor: 4500, taxRateBp: 825 });
  const admin = await memberContext(studio, "admin");
  updateRepairSettings(admin, SETTINGS_BASE);
  const staff = await memberContext(getDb().select().from(studios).where(eq(studios.id, studio.id)).get()!, "staff");
  const owner = await createUser();
  const { piece } = createPiece(studio, { ownerId: owner.id });
  const claim = createAcceptedClaim(studio, piece.id, owner.id, "partly_covered", 40);
  getDb().update(claims).set({ category: "crack_gap" }).where(eq(claims.id, claim.id)).run();
  const job = createJob(staff, "claim", claim.id);
  return { studio, admin, staff, owner, piece, claim, job };
}

describe("a crack claim's repair quote, checkout and receipt", () => {
  it("proposes the crack fill, keeps the proposal beside the edited lines, charges the quote's total line by line, and the receipt carries lines and tax", async () => {
    const { staff, owner, claim, job, piece } = await crackJob();
    // The claim's job: a crack fill at the labour rate (1 h proposed) and travel, linked to its claim.
    expect(job.claimId).toBe(claim.id);
    expect(job.lines.map((l) => [l.description, l.quantity, l.unit, l.unitPriceMinor, l.source])).toEqual([
      ["Crack or check fill", 1, "h", 8500, "labour_rate"],
      ["Travel", 1, "trip", 4500, "price_list"],
    ]);

    // Staff raise the hours to 1.5, add two butterfly keys from the price list and a typed line.
    const [crack, travel] = job.lines;
    const lines: QuoteLineInput[] = [
      { kind: crack!.kind, source: crack!.source, ref: crack!.ref, description: crack!.description, quantity: 1.5, unit: "h", unitPriceMinor: 8500 },
      { kind: "other", source: "price_list", ref: "list:butterfly_key", description: "Butterfly (bow-tie) key, fitted", quantity: 2, unit: "each", unitPriceMinor: 3500 },
      { kind: "other", source: "typed", description: "Colour-match the fill (invented)", quantity: 1, unit: "each", unitPriceMinor: 1250 },
      { kind: travel!.kind, source: travel!.source, ref: travel!.ref, description: "Travel", quantity: 1, unit: "trip", unitPriceMinor: 4500 },
    ];
    const input = jobQuoteSchema.parse({ title: "Crack repair", tasks: [], repairs: ["crack_fill"], productIds: [], coats: 1, travel: true, coveredPct: 40, notes: "", lines });
    const edited = await updateJobQuote(staff, job.id, input);
    // By hand, 40 % covered, 8.25 % on the owner's part of each line, each rounded half up:
    //   crack fill 1.5 h × 85.00 = 127.50; covered 51.00; part 76.50; tax 6.31125 → 6.31; line 82.81
    //   keys 2 × 35.00 = 70.00; covered 28.00; part 42.00; tax 3.465 → 3.47; line 45.47
    //   typed 1 × 12.50 = 12.50; covered 5.00; part 7.50; tax 0.61875 → 0.62; line 8.12
    //   travel 1 × 45.00 = 45.00; covered 18.00; part 27.00; tax 2.2275 → 2.23; line 29.23
    //   subtotal 255.00, covered 102.00, net 153.00, tax 12.63, total 165.63
    expect(edited.lines.map((l) => l.totalMinor)).toEqual([8281, 4547, 812, 2923]);
    expect(edited.lines.map((l) => l.taxMinor)).toEqual([631, 347, 62, 223]);
    expect(edited).toMatchObject({ subtotalMinor: 25500, coveredMinor: 10200, netMinor: 15300, taxMinor: 1263, totalMinor: 16563 });
    // The quote keeps what was proposed beside what was sent: 1 h proposed, 1.5 h sent.
    expect(edited.lines[0]!.proposed).toEqual({ quantity: 1, unitPriceMinor: 8500 });
    expect(edited.lines[2]!.proposed).toBeNull();
    expect(edited.proposedLines.find((l) => l.ref === "list:crack_fill")).toMatchObject({ quantity: 1, amountMinor: 8500 });
    // The visit is booked for the hours quoted (1.5 h of crack fill = 90 minutes), not a maintenance default.
    expect(jobDurationMin(edited, pricedPiece(getDb(), piece))).toBe(90);

    await sendQuote(staff, job.id);
    const quoteMail = await waitForMail({ to: owner.email, subject: /quote/i });
    for (const words of ["Crack or check fill", "Colour-match the fill (invented)", "Covered by the warranty (40 %)", "Tax (8.25 %)", "$12.63", "To pay: $165.63", "TX-000-123 (invented)"]) expect(quoteMail.text).toContain(words);

    // Checkout: the session's amount is the quote's total and its line items are the quote's lines.
    const { checkoutUrl } = await approveJob(owner, job.id);
    const session = fake.sessions().find((s) => s.url === checkoutUrl)!;
    expect(session.amount_total).toBe(16563);
    const items = await getStripe().checkout.sessions.listLineItems(session.id);
    expect(items.data.map((i) => i.amount_total)).toEqual([8281, 4547, 812, 2923]);
    expect(items.data[0]!.description).toContain("Crack or check fill — 1.5 h");
    // The API answers the same figures the checkout charged.
    const api = jobApiMoney(getStudioJob(staff, job.id).job);
    expect(api.lines.map((l) => l.lineTotalMinor)).toEqual(items.data.map((i) => i.amount_total));
    expect(api.lines[0]).toMatchObject({ description: "Crack or check fill", quantity: 1.5, unit: "h", unitPriceMinor: 8500, taxMinor: 631, lineTotalMinor: 8281 });
    expect(api.totals).toEqual({ subtotalMinor: 25500, coveredMinor: 10200, netMinor: 15300, taxMinor: 1263, totalMinor: session.amount_total });

    // Paid on the fake's page; the owner's return settles it and the receipt goes out.
    const paid = await fetch(checkoutUrl!, { method: "POST", body: new URLSearchParams({ card: SUCCESS_CARD }), redirect: "manual" });
    expect(paid.status).toBe(303);
    await syncReturnedCheckout(owner, job.id, session.id);
    expect(getDb().select().from(repairJobs).where(eq(repairJobs.id, job.id)).get()!.state).toBe("paid");
    const receipt = await waitForMail({ to: owner.email, subject: /receipt/i });
    expect(receipt.subject).toContain("$165.63");
    for (const words of ["Crack or check fill", "1.5 h × $85.00", "$127.50", "−$102.00", "Colour-match the fill (invented)", "Tax (8.25 %)", "$12.63", "Paid", "$165.63", "TX-000-123 (invented)", "1 Invented Yard, Portland OR", "pi_test_"]) {
      expect(receipt.text).toContain(words);
    }

    // The PDF, for the owner and for staff: the same lines, tax and total, and the payment reference.
    const forOwner = await receiptPdf(ownerActor(owner), job.id);
    expect(forOwner.buffer.subarray(0, 5).toString()).toBe("%PDF-");
    expect(forOwner.data.figures.text).toMatchObject({ tax: "$12.63", total: "$165.63", covered: "−$102.00" });
    expect(forOwner.data.reference).toMatch(/^pi_test_/);
    expect(forOwner.data.figures.taxNumber).toBe("TX-000-123 (invented)");
    const forStaff = await receiptPdf(staff, job.id);
    expect(forStaff.data.figures.lines.map((l) => l.amount)).toEqual(["$127.50", "$70.00", "$12.50", "$45.00"]);
  });

  it("a quote change after approval closes the open checkout and the new one charges the new total", async () => {
    const { staff, owner, job } = await crackJob();
    await sendQuote(staff, job.id);
    const first = await approveJob(owner, job.id);
    const firstSession = fake.sessions().find((s) => s.url === first.checkoutUrl)!;
    expect(firstSession.status).toBe("open");
    const base = jobQuoteSchema.parse({ title: "Crack repair", tasks: [], repairs: ["crack_fill"], productIds: [], coats: 1, travel: false, coveredPct: 0, notes: "" });
    const changed = await updateJobQuote(staff, job.id, base);
    expect(fake.sessions().find((s) => s.id === firstSession.id)!.status).toBe("expired");
    await sendQuote(staff, job.id);
    const second = await approveJob(owner, job.id);
    expect(second.checkoutUrl).not.toBe(first.checkoutUrl);
    // 1 h × 85.00 = 85.00; tax 8.25 % = 7.0125 → 7.01; total 92.01.
    expect(changed.totalMinor).toBe(9201);
    expect(fake.sessions().find((s) => s.url === second.checkoutUrl)!.amount_total).toBe(9201);
  });

  it("keeps the receipt and job to the people they belong to", async () => {
    const { staff, owner, job } = await crackJob();
    const stranger = await createUser();
    const elsewhere = await memberContext(createStudio({ email: `${unique("other")}@test.example` }), "staff");
    // Quoted, not paid yet: no receipt, even for its owner.
    await sendQuote(staff, job.id);
    await expect(receiptPdf(ownerActor(owner), job.id)).rejects.toMatchObject({ status: 409 });
    await expect(receiptPdf(staff, job.id)).rejects.toMatchObject({ status: 409 });
    // Someone else's: a 404, not a 403.
    await expect(receiptPdf(ownerActor(stranger), job.id)).rejects.toMatchObject({ status: 404 });
    await expect(receiptPdf(elsewhere, job.id)).rejects.toMatchObject({ status: 404 });
    expect(() => getOwnerJob(stranger, job.id)).toThrow();
    // Only admins change the price list, rounding and tax.
    expect(() => updateRepairSettings(staff, SETTINGS_BASE)).toThrow(expect.objectContaining({ status: 403 }));
  });

  it("refuses a price list price with more decimals than the currency has, and keeps the saved list", async () => {
    const { admin, studio } = await crackJob();
    const bad = { ...SETTINGS_BASE, priceList: [{ key: "", label: "Leg re-glue (invented)", kind: "labour" as const, unit: "each" as const, price: "12.505" }] };
    expect(() => updateRepairSettings(admin, bad)).toThrow(expect.objectContaining({ status: 400, message: "Leg re-glue (invented): USD has 2 decimals at most." }));
    const kept = getDb().select().from(studios).where(eq(studios.id, studio.id)).get()!;
    expect(kept.repairPriceList.map((e) => e.key)).toEqual(["crack_fill", "butterfly_key", "resin_fill"]);
    // A new task gets a key from its name; an hourly task without a price follows the labour rate.
    const saved = updateRepairSettings(admin, { ...SETTINGS_BASE, priceList: [...SETTINGS_BASE.priceList, { key: "", label: "Leg re-glue (invented)", kind: "labour", unit: "h", price: "" }] });
    expect(saved.repairPriceList.at(-1)).toEqual({ key: "leg_re_glue_invented", label: "Leg re-glue (invented)", kind: "labour", unit: "h", unitPriceMinor: null });
  });

  it("refuses a line it can't price, with the field named and the saved quote unchanged", async () => {
    const { staff, job } = await crackJob();
    const before = getStudioJob(staff, job.id).job;
    const bad = jobQuoteSchema.safeParse({ title: "x", tasks: [], productIds: [], coats: 1, travel: false, coveredPct: 0, lines: [{ kind: "other", source: "typed", description: "Glue", quantity: 1.0005, unit: "each", unitPriceMinor: 100 }] });
    expect(bad.success).toBe(false);
    expect(bad.error!.issues[0]!.path).toEqual(["lines", 0, "quantity"]);
    const negative = jobQuoteSchema.safeParse({ title: "x", tasks: [], productIds: [], coats: 1, travel: false, coveredPct: 0, lines: [{ kind: "other", source: "typed", description: "Glue", quantity: 1, unit: "each", unitPriceMinor: -5 }] });
    expect(negative.success).toBe(false);
    const empty = jobQuoteSchema.safeParse({ title: "x", tasks: [], productIds: [], coats: 1, travel: false, coveredPct: 0, lines: [] });
    expect(empty.success).toBe(false);
    expect(getStudioJob(staff, job.id).job.totalMinor).toBe(before.totalMinor);
  });

  it("proposes product in whole containers from area × coats ÷ coverage", async () => {
    const { staff, studio, job } = await crackJob();
    const product = createProduct(studio, { containers: [{ ml: 125, priceMinor: 1900 }] });
    // Top 2000 × 900 mm = 1.8 m²; 2 coats ÷ 24 m²/L = 0.15 L = 150 mL → two 125 mL containers (lib/care/quantity.ts).
    const input = jobQuoteSchema.parse({ title: "Re-oil", tasks: ["reoil"], productIds: [product.id], coats: 2, travel: false, coveredPct: 0, notes: "" });
    const updated = await updateJobQuote(staff, job.id, input);
    const materials = updated.lines.find((l) => l.kind === "materials")!;
    expect(materials).toMatchObject({ source: "catalog", quantity: 2, unit: "container", unitPriceMinor: 1900, amountMinor: 3800 });
    expect(materials.description).toBe("Test hardwax oil (invented), 125 mL");
    // A studio that works in inches writes the container in US fl oz first: 125 mL ÷ 29.5735295625 mL/fl oz
    // (NIST Handbook 44, Appendix C) = 4.227 fl oz, shown to 0.1 rounded up.
    getDb().update(studios).set({ unitSystem: "imperial" }).where(eq(studios.id, studio.id)).run();
    const imperial = await updateJobQuote({ ...staff, studio: { ...staff.studio, unitSystem: "imperial" } }, job.id, input);
    expect(imperial.lines.find((l) => l.kind === "materials")!.description).toBe("Test hardwax oil (invented), 4.3 US fl oz (125 mL)");
    // Labour: re-oil 0.5 h + 0.5 h/m² × 1.8 m² = 1.4 h → 1.5 h at 85.00 = 127.50 (lib/care/quote DEFAULT_LABOUR, common practice).
    expect(updated.lines.find((l) => l.kind === "labour")).toMatchObject({ quantity: 1.5, amountMinor: 12750, source: "labour_rate" });
  });
});

const EXCLUSIVE: StudioTax = { mode: "single", inclusive: false, rateBp: 825, ratesBp: {}, number: "" };
const line = (quantity: number, unitPriceMinor: number, kind: LineDraft["kind"] = "labour"): LineDraft => ({ kind, source: "typed", description: "x", quantity, unit: "h", unitPriceMinor });

describe("rounding rules (integer minor units)", () => {
  it("rounds half up once, exactly, where floating point would not", () => {
    // 1.005 h × 1.00/h = 1.005 → 1.01 half up. In floating point Math.round(1.005 × 100) = 100 (1.00):
    // 1.005 is stored as 1.00499999999999989… — the kind of drift that made totals like $161.67 wobble.
    expect(Math.round(1.005 * 100)).toBe(100);
    expect(lineAmount(1.005, 100, 1)).toBe(101);
    // 0.1 + 0.2 of an hour at 100.00: 0.3 × 10000 = 3000 exactly.
    expect(lineAmount(0.3, 10_000, 1)).toBe(3000);
  });

  it("applies the studio's rule to each line: cent, whole, 5, 10 (USD) and whole yen", () => {
    expect([roundingStep("cent", "USD"), roundingStep("whole", "USD"), roundingStep("five", "USD"), roundingStep("ten", "USD")]).toEqual([1, 100, 500, 1000]);
    expect([roundingStep("cent", "JPY"), roundingStep("whole", "JPY"), roundingStep("five", "JPY")]).toEqual([1, 1, 5]);
    // 1.5 h × 85.33 = 127.995
    expect(lineAmount(1.5, 8533, 1)).toBe(12800); // to the cent: 127.995 → 128.00 (half up)
    expect(lineAmount(1.5, 8533, 100)).toBe(12800); // whole: 127.995 → 128
    expect(lineAmount(1.5, 8533, 500)).toBe(13000); // to 5: 127.995 / 5 = 25.599 → 26 × 5 = 130
    expect(lineAmount(1.5, 8533, 1000)).toBe(13000); // to 10: 12.7995 → 13 × 10 = 130
    expect(lineAmount(1, 12_499, 1000)).toBe(12_000); // 124.99 to 10: 12.499 → 12 → 120
    expect(lineAmount(1, 1250, 500)).toBe(1500); // 12.50 to 5: 2.5 → 3 (half up) → 15
    // JPY: 1.5 × ¥1,235 = ¥1,852.5 → ¥1,853 whole; → ¥1,855 to 5 (370.5 → 371 × 5).
    expect(lineAmount(1.5, 1235, 1)).toBe(1853);
    expect(lineAmount(1.5, 1235, 5)).toBe(1855);
  });

  it("shows one rule on the quote and prices the whole quote by it", () => {
    const priced = priceLines([line(1.5, 8533), line(1, 1250, "other")], { currency: "USD", rounding: "five", tax: { ...EXCLUSIVE, mode: "none" }, coveredPct: 0 });
    // 130.00 + 15.00 = 145.00, no tax.
    expect(priced).toMatchObject({ subtotalMinor: 14_500, taxMinor: 0, totalMinor: 14_500 });
  });
});

describe("tax: none, one rate, per line kind; exclusive and inclusive", () => {
  it("exclusive adds the tax on top; inclusive finds it inside the price", () => {
    // Exclusive 20 %: 100.00 + 20 % = 120.00 (tax 20.00, net 100.00).
    const ex = priceLines([line(1, 10_000)], { currency: "USD", rounding: "cent", tax: { ...EXCLUSIVE, rateBp: 2000 }, coveredPct: 0 });
    expect(ex).toMatchObject({ netMinor: 10_000, taxMinor: 2000, totalMinor: 12_000 });
    // Inclusive 20 %: the tax in a tax-inclusive price is price × rate / (100 + rate) — the "VAT fraction"
    // (HM Revenue & Customs, VAT Notice 700 "The VAT guide", from memory): 120.00 × 20/120 = 20.00, net 100.00.
    const inc = priceLines([line(1, 12_000)], { currency: "USD", rounding: "cent", tax: { ...EXCLUSIVE, rateBp: 2000, inclusive: true }, coveredPct: 0 });
    expect(inc).toMatchObject({ netMinor: 10_000, taxMinor: 2000, totalMinor: 12_000 });
    // Inclusive 8.25 % on 100.00: 100.00 × 8.25 / 108.25 = 7.62124… → 7.62; net 92.38; total stays 100.00.
    const inc825 = priceLines([line(1, 10_000)], { currency: "USD", rounding: "cent", tax: { ...EXCLUSIVE, inclusive: true }, coveredPct: 0 });
    expect(inc825).toMatchObject({ netMinor: 9238, taxMinor: 762, totalMinor: 10_000 });
    // Inclusive with 40 % covered: part 60.00 holds 60.00 × 8.25/108.25 = 4.5727… → 4.57; net 55.43.
    const incCovered = priceLines([line(1, 10_000)], { currency: "USD", rounding: "cent", tax: { ...EXCLUSIVE, inclusive: true }, coveredPct: 40 });
    expect(incCovered).toMatchObject({ coveredMinor: 4000, netMinor: 5543, taxMinor: 457, totalMinor: 6000 });
  });

  it("per line kind: labour untaxed, materials at 8.25 %", () => {
    const tax: StudioTax = { mode: "per_kind", inclusive: false, rateBp: 999, ratesBp: { labour: 0, materials: 825 }, number: "" };
    // Labour 1 h × 85.00: no tax. Materials 2 × 19.00 = 38.00 × 8.25 % = 3.135 → 3.14 (half up).
    const priced = priceLines([line(1, 8500, "labour"), { ...line(2, 1900, "materials"), unit: "container" }], { currency: "USD", rounding: "cent", tax, coveredPct: 0 });
    expect(priced.lines.map((l) => [l.taxRateBp, l.taxMinor])).toEqual([
      [0, 0],
      [825, 314],
    ]);
    expect(priced).toMatchObject({ netMinor: 12_300, taxMinor: 314, totalMinor: 12_614 });
  });

  it("none charges no tax whatever the single rate says", () => {
    const priced = priceLines([line(1, 8500)], { currency: "USD", rounding: "cent", tax: { ...EXCLUSIVE, mode: "none" }, coveredPct: 0 });
    expect(priced).toMatchObject({ taxMinor: 0, totalMinor: 8500 });
  });

  it("the checkout's items add up to the total, and money reads one way per locale", () => {
    const priced = priceLines([line(1.5, 8500), line(1, 1250, "other")], { currency: "USD", rounding: "cent", tax: EXCLUSIVE, coveredPct: 40 });
    const items = checkoutLineItems({ ...priced, origin: "claim", currency: "USD", coveredPct: 40, title: "t", pricingRules: {} });
    expect(items.reduce((s, i) => s + i.price_data.unit_amount, 0)).toBe(priced.totalMinor);
    expect(items[0]!.price_data.product_data.name).toBe("x — 1.5 h, after the warranty share, tax included");
    // A care plan's included visit: the plan, not the warranty, took its share off (lib/plans/visits.ts).
    const planItems = checkoutLineItems({ ...priced, origin: "plan", currency: "USD", coveredPct: 40, title: "t", pricingRules: {} });
    expect(planItems.map((i) => i.price_data.unit_amount)).toEqual(items.map((i) => i.price_data.unit_amount));
    expect(planItems.map((i) => i.price_data.product_data.name).join("; ")).not.toMatch(/warranty/);
    expect(planItems[0]!.price_data.product_data.name).toBe("x — 1.5 h, after the care plan's share, tax included");
    // Intl (ECMA-402) for the studio's country: en-US "$85.00", de-DE "85,00 €", ja-JP "￥1,235".
    expect(formatMoney(8500, "USD", "US")).toBe("$85.00");
    expect(formatMoney(8500, "EUR", "DE")).toBe("85,00\u00a0€");
    expect(formatMoney(1235, "JPY", "JP")).toBe("￥1,235");
    expect(formatMoney(-10_200, "USD", "US")).toBe("-$102.00");
  });
});
