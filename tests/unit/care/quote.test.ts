import { describe, expect, it } from "vitest";
import { CareInputError, formatMinorUnits, quote, quoteProductFromCatalog, taskDurationMinutes, taskHours, type QuoteInput } from "@/lib/care";

// Invented demo rates and product.
const oil = {
  id: "prod_oil",
  name: "Demo hardwax oil (invented)",
  finishClass: "hardwax_oil" as const,
  coverageM2PerL: 30,
  containerSizesMl: [125, 250, 1000],
  containerPricesMinor: { 125: 1800, 250: 2900, 1000: 8900 },
};
const base: QuoteInput = {
  tasks: ["reoil"],
  areaM2: 2.4,
  rates: { labourPerHourMinor: 8500 },
  products: [quoteProductFromCatalog(oil, "reoil")],
  travel: { flatMinor: 2500 },
  taxRatePct: 8.875,
  coveredPct: 0,
  currency: "USD",
};

describe("quote", () => {
  it("labour by area, materials by container, travel, tax half up on the total", () => {
    const q = quote(base);
    // labour: 0.5 + 0.5 × 2.4 = 1.7 h → 1.75 h × 85.00 = 148.75
    expect(q.lines[0]).toMatchObject({ kind: "labour", quantity: 1.75, amountMinor: 14875 });
    // 2.4 m² × 1 coat ÷ 30 m²/L = 80 mL → one 125 mL container
    expect(q.lines[1]).toMatchObject({ kind: "materials", quantity: 1, unitPriceMinor: 1800, amountMinor: 1800 });
    expect(q.lines[2]).toMatchObject({ kind: "travel", amountMinor: 2500 });
    expect(q.subtotalMinor).toBe(19175);
    // 19175 × 8.875 % = 1701.78125 → 1702
    expect(q.taxMinor).toBe(1702);
    expect(q.totalMinor).toBe(20877);
    expect(q.display).toEqual({ subtotal: "191.75", covered: "0.00", tax: "17.02", total: "208.77" });
  });

  it("the covered share comes off before tax; 100 % covered → total 0", () => {
    const half = quote({ ...base, coveredPct: 50 });
    expect(half.coveredMinor).toBe(9588); // 9587.5 rounds half up
    expect(half.taxableMinor).toBe(9587);
    expect(quote({ ...base, coveredPct: 100 }).totalMinor).toBe(0);
  });

  it("JPY has exponent 0: amounts are whole yen", () => {
    const q = quote({ ...base, currency: "JPY", rates: { labourPerHourMinor: 9000 }, products: [], travel: { distanceKm: 12.5, perKmMinor: 45 }, taxRatePct: 10 });
    expect(q.exponent).toBe(0);
    expect(q.lines.map((l) => l.amountMinor)).toEqual([15750, 563]); // 1.75 h × 9000; 12.5 km × 45 = 562.5 → 563
    expect(q.taxMinor).toBe(1631); // 16313 × 10 % = 1631.3
    expect(q.display.total).toBe("17944");
  });

  it("accepts care tasks from careSchedule as well as kinds", () => {
    expect(quote({ ...base, tasks: [{ kind: "reoil" }] }).totalMinor).toBe(quote(base).totalMinor);
  });

  it("formats minor units in the currency's exponent", () => {
    expect(formatMinorUnits(5, "EUR")).toBe("0.05");
    expect(formatMinorUnits(-12345, "GBP")).toBe("-123.45");
    expect(formatMinorUnits(1200, "JPY")).toBe("1200");
  });

  it("durations for booking: quarter hours per task, summed", () => {
    expect(taskHours("resin_polish", 2.4)).toBe(2.5); // 0.5 + 0.75 × 2.4 = 2.3 → 2.5
    expect(taskDurationMinutes(["reoil", "resin_polish"], 2.4)).toBe(255);
    expect(taskDurationMinutes(["annual_check"], 0)).toBe(30);
  });

  it("bad input throws CareInputError with a clear message", () => {
    expect(() => quote({ ...base, currency: "XYZ" })).toThrow(/unsupported currency "XYZ"/);
    expect(() => quote({ ...base, coveredPct: 120 })).toThrow(/coveredPct must be 0–100/);
    expect(() => quote({ ...base, tasks: [] })).toThrow(/at least one task/);
    expect(() => quote({ ...base, rates: { labourPerHourMinor: 85.5 } })).toThrow(/whole, non-negative amount/);
    expect(() => quote({ ...base, taxRatePct: 8.12345 })).toThrow(/at most 4 decimals/);
    expect(() => quote({ ...base, tasks: ["sand_and_refinish" as never] })).toThrow(CareInputError);
    expect(() => quote({ ...base, products: [{ ...base.products[0]!, containerPricesMinor: { 125: 1800 }, containerSizesMl: [250] }] })).toThrow(/no price for its 250 mL/);
  });
});
