// Who pays a repair job's covered part, as every reader of the job is told (coverWords in
// lib/repairs/states.ts): the warranty for a claim's or the studio's job, the owner's care plan for an
// included visit of a plan (origin "plan", lib/plans/visits.ts). The money is the same either way; only
// the words differ. All amounts invented.
import { describe, expect, it } from "vitest";
import type { RepairJob } from "@/db/schema";
import { checkoutLineItems, jobFigures } from "@/lib/repairs/figures";
import { coverWords, jobAmountText, jobStateLabel, quoteMailWords } from "@/lib/repairs/states";

const US = { country: "US", taxNumber: "" };

/** A job of 200.00 USD with 60 % covered and no tax: 120.00 off, 80.00 to pay. */
function job(origin: RepairJob["origin"], over: Partial<RepairJob> = {}) {
  const line = { kind: "labour", source: "proposed", description: "Care visit", quantity: 2, unit: "h", unitPriceMinor: 10_000, proposed: null, amountMinor: 20_000, coveredMinor: 12_000, netMinor: 8_000, taxRateBp: 0, taxMinor: 0, totalMinor: 8_000 };
  return { origin, title: "Care plan visit: Walnut table (invented)", state: "quoted" as RepairJob["state"], currency: "USD", coveredPct: 60, subtotalMinor: 20_000, coveredMinor: 12_000, netMinor: 8_000, taxMinor: 0, totalMinor: 8_000, lines: [line], pricingRules: {}, ...over };
}

describe("who pays the covered part", () => {
  it("a claim's job and the studio's own job: the warranty", () => {
    for (const origin of ["claim", "studio", "refresh_offer"] as const) {
      expect(jobFigures(job(origin), US).coveredLabel).toBe("Covered by the warranty (60 %)");
      expect(jobAmountText(job(origin, { totalMinor: 0, coveredPct: 100 }), "US")).toBe("Covered by the warranty");
      expect(jobStateLabel(job(origin, { state: "covered", totalMinor: 0, coveredPct: 100 }))).toBe("Covered by the warranty");
      expect(coverWords(job(origin)).field).toBe("Warranty share (%)");
      expect(coverWords(job(origin)).mailHeading).toBe("Your repair is covered");
    }
  });

  it("a care plan's included visit: the plan, never the warranty", () => {
    const plan = job("plan");
    expect(jobFigures(plan, US).coveredLabel).toBe("Paid by the care plan (60 %)");
    expect(jobAmountText(job("plan", { totalMinor: 0, coveredPct: 100 }), "US")).toBe("Included in the care plan");
    expect(jobStateLabel(job("plan", { state: "covered", totalMinor: 0, coveredPct: 100 }))).toBe("Included in the care plan");
    // Beside that badge in a list, the amount does not say it a second time.
    expect(jobAmountText(job("plan", { state: "covered", totalMinor: 0, coveredPct: 100 }), "US")).toBe("Nothing to pay");
    expect(jobAmountText(job("claim", { state: "covered", totalMinor: 0, coveredPct: 100 }), "US")).toBe("Nothing to pay");
    expect(jobAmountText(job("plan", { state: "scheduled", totalMinor: 0, coveredPct: 100 }), "US")).toBe("Included in the care plan");
    expect(coverWords(plan).yours).toBe("Included in your care plan");
    expect(coverWords(plan, "Slab keeping (invented)").yours).toBe("Included in your care plan “Slab keeping (invented)”");
    expect(coverWords(job("claim"), "Slab keeping (invented)").yours).toBe("Covered by your warranty");
    expect(coverWords(plan).field).toBe("Care plan share (%)");
    expect(coverWords(plan).mailHeading).toBe("Your care plan visit is included");
    // A share left to pay: the quote mail names the visit and the owner's share, not a repair quote.
    expect(quoteMailWords(plan, "Larchmere (invented)", "Walnut table (invented)")).toEqual({ subject: "Your care plan visit: your share — Walnut table (invented)", heading: "Your care plan visit: your share" });
    for (const origin of ["claim", "studio", "refresh_offer"] as const) {
      expect(quoteMailWords(job(origin), "Larchmere (invented)", "Walnut table (invented)")).toEqual({ subject: "Your repair quote from Larchmere (invented)", heading: "Your repair quote" });
    }
    expect(checkoutLineItems(plan)[0]!.price_data.product_data.name).toBe("Care visit — 2 h, after the care plan's share");
    const everything = [...Object.values(coverWords(plan)), jobFigures(plan, US).coveredLabel, ...checkoutLineItems(plan).map((i) => i.price_data.product_data.name)];
    expect(everything.filter((w) => /warranty/i.test(w))).toEqual([]);
  });

  it("the same money whoever pays: only the words change", () => {
    const [w, p] = [jobFigures(job("claim"), US), jobFigures(job("plan"), US)];
    expect({ ...p, coveredLabel: null }).toEqual({ ...w, coveredLabel: null });
    expect(p.text).toMatchObject({ covered: "−$120.00", total: "$80.00" });
  });

  it("a job still to pay shows its total, and states other than covered keep their words", () => {
    expect(jobAmountText(job("plan"), "US")).toBe("$80.00");
    expect(jobStateLabel(job("plan", { state: "quoted" }))).toBe("Quote sent");
    expect(jobStateLabel(job("claim", { state: "paid" }))).toBe("Paid");
  });
});
