import fc from "fast-check";
import { describe, expect, it } from "vitest";
import { CareInputError, productNeeded, topArea } from "@/lib/care";

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

  it("2 coats on 2.4 m² at 30 m²/L = 160 mL, 5.42 US fl oz (1 fl oz = 29.5735295625 mL)", () => {
    const r = productNeeded({ areaM2: 2.4, coats: 2, coverageM2PerL: 30 });
    expect(r.ml).toBe(160);
    expect(r.flOz).toBe(5.42);
    expect(r.containers).toEqual([]);
  });

  it("rejects fractional coats, zero coverage and bad container sizes", () => {
    expect(() => productNeeded({ areaM2: 1, coats: 1.5, coverageM2PerL: 10 })).toThrow(/coats must be a whole number/);
    expect(() => productNeeded({ areaM2: 1, coats: 1, coverageM2PerL: 0 })).toThrow(CareInputError);
    expect(() => productNeeded({ areaM2: 1, coats: 1, coverageM2PerL: 10, containerSizesMl: [0] })).toThrow(/containerSizesMl\[0\]/);
  });
});
