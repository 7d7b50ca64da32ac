import fc from "fast-check";
import { describe, expect, it } from "vitest";
import { CareInputError, displayFlOz, displayMl, productNeeded, topArea } from "@/lib/care";

const mmArb = fc.double({ min: 100, max: 5000, noNaN: true });

describe("topArea", () => {
  it("is monotone in size for every shape (property)", () => {
    fc.assert(
      fc.property(mmArb, mmArb, fc.double({ min: 0, max: 1000, noNaN: true }), (l, w, grow) => {
        const shapes = [
          (d: number) => topArea({ kind: "rectangle", lengthMm: l + d, widthMm: w }),
          (d: number) => topArea({ kind: "oval", lengthMm: l, widthMm: w + d }),
          (d: number) => topArea({ kind: "round", diameterMm: l + d }),
          (d: number) => topArea({ kind: "measured", areaM2: (l + d) / 1000 }),
        ];
        for (const f of shapes) {
          expect(f(grow).m2).toBeGreaterThanOrEqual(f(0).m2);
          expect(f(grow).ft2).toBeGreaterThanOrEqual(f(0).ft2);
        }
      }),
    );
  });

  it("rejects zero, negative, NaN sizes and unknown shapes with a CareInputError naming the field", () => {
    expect(() => topArea({ kind: "rectangle", lengthMm: 0, widthMm: 10 })).toThrow(/shape.lengthMm must be greater than 0/);
    expect(() => topArea({ kind: "round", diameterMm: -5 })).toThrow(CareInputError);
    expect(() => topArea({ kind: "measured", areaM2: Number.NaN })).toThrow(/finite/);
    expect(() => topArea({ kind: "hexagon" } as never)).toThrow(/unknown shape kind/);
  });
});

describe("productNeeded", () => {
  const coverage = fc.double({ min: 5, max: 200, noNaN: true });
  const area = fc.double({ min: 0.05, max: 20, noNaN: true });
  const sizes = fc.uniqueArray(fc.constantFrom(50, 100, 125, 250, 500, 750, 1000, 2500), { minLength: 1, maxLength: 4 });

  it("is monotone in area and in coats, and the containers always hold what is needed (property)", () => {
    fc.assert(
      fc.property(area, fc.double({ min: 0, max: 5, noNaN: true }), fc.integer({ min: 1, max: 4 }), coverage, sizes, (a, more, coats, cov, s) => {
        const base = productNeeded({ areaM2: a, coats, coverageM2PerL: cov, containerSizesMl: s });
        const bigger = productNeeded({ areaM2: a + more, coats, coverageM2PerL: cov, containerSizesMl: s });
        const moreCoats = productNeeded({ areaM2: a, coats: coats + 1, coverageM2PerL: cov, containerSizesMl: s });
        expect(bigger.ml).toBeGreaterThanOrEqual(base.ml);
        expect(moreCoats.ml).toBeGreaterThanOrEqual(base.ml);
        expect(bigger.containersMl).toBeGreaterThanOrEqual(base.containersMl);
        expect(moreCoats.containersMl).toBeGreaterThanOrEqual(base.containersMl);
        expect(base.containersMl).toBeGreaterThanOrEqual(base.ml);
        expect(base.ml).toBeGreaterThanOrEqual((a * coats * 1000) / cov - 1e-6);
        expect(base.containersMl).toBeGreaterThanOrEqual(base.exactMl - 1e-9);
      }),
    );
  });

  it("picks the least total volume: 1100 mL from 250 and 1000 mL containers is 1000 + 250", () => {
    const r = productNeeded({ areaM2: 11, coats: 1, coverageM2PerL: 10, containerSizesMl: [250, 1000] });
    expect(r.ml).toBe(1100);
    expect(r.containers).toEqual([
      { sizeMl: 1000, count: 1 },
      { sizeMl: 250, count: 1 },
    ]);
  });

  it("2 coats on 2.4 m² at 30 m²/L = 160 mL exactly = 5.410244 US fl oz (1 fl oz = 29.5735295625 mL); shown 160 mL, 5.5 fl oz", () => {
    const r = productNeeded({ areaM2: 2.4, coats: 2, coverageM2PerL: 30 });
    expect(r.exactMl).toBeCloseTo(160, 9);
    expect(r.exactFlOz).toBeCloseTo(5.410244, 6);
    expect(r.ml).toBe(160);
    expect(r.flOz).toBe(5.5);
    expect(r.containers).toEqual([]);
  });

  it("keeps quantities exact and rounds once, for display: 29.1 mL is 0.98399 fl oz, shown 1 fl oz (not via 30 mL → 1.02)", () => {
    // 0.97 m² × 1 coat ÷ 33.333… m²/L = 29.1 mL; 29.1 ÷ 29.5735295625 = 0.983988 fl oz.
    const r = productNeeded({ areaM2: 0.97, coats: 1, coverageM2PerL: 100 / 3, containerSizesMl: [30] });
    expect(r.exactMl).toBeCloseTo(29.1, 9);
    expect(r.exactFlOz).toBeCloseTo(0.983988, 6);
    expect(r.ml).toBe(30);
    expect(r.flOz).toBe(1);
    expect(r.containers).toEqual([{ sizeMl: 30, count: 1 }]);
    expect(displayMl(100.00000000000001)).toBe(100);
    expect(displayFlOz(29.5735295625)).toBe(1);
  });

  it("buys whole containers for the exact amount: 50.2 mL needs more than one 50 mL container", () => {
    const r = productNeeded({ areaM2: 0.502, coats: 1, coverageM2PerL: 10, containerSizesMl: [50, 250] });
    expect(r.exactMl).toBeCloseTo(50.2, 9);
    expect(r.containersMl).toBeGreaterThanOrEqual(50.2);
    expect(r.containers).toEqual([{ sizeMl: 50, count: 2 }]);
  });

  it("rejects fractional coats, zero coverage and bad container sizes", () => {
    expect(() => productNeeded({ areaM2: 1, coats: 1.5, coverageM2PerL: 10 })).toThrow(/coats must be a whole number/);
    expect(() => productNeeded({ areaM2: 1, coats: 1, coverageM2PerL: 0 })).toThrow(CareInputError);
    expect(() => productNeeded({ areaM2: 1, coats: 1, coverageM2PerL: 10, containerSizesMl: [0] })).toThrow(/containerSizesMl\[0\]/);
  });
});
