import { describe, expect, it } from "vitest";
import { CERAMIC_TOPCOAT_COVERAGE_M2_PER_L, ft2ToM2, productNeeded } from "@/lib/care";

// Common practice, no published source: a ceramic-type topcoat covers about 2 ft² per mL, so 100 mL
// does about 200 ft² (../shared/REFERENCES.md, "Rules of the trade without a published source").
describe("ceramic-type topcoat coverage — common practice, no published source", () => {
  it("200 ft², one coat, at 2 ft²/mL needs 100 mL", () => {
    const need = productNeeded({ areaM2: ft2ToM2(200), coats: 1, coverageM2PerL: CERAMIC_TOPCOAT_COVERAGE_M2_PER_L });
    expect(need.ml).toBe(100);
    expect(need.flOz).toBeCloseTo(3.39, 2); // 100 / 29.5735295625 = 3.3814 → 3.39 rounded up
  });
  it("the rule in m²/L is 2 × 0.09290304 × 1000 = 185.80608", () => {
    expect(CERAMIC_TOPCOAT_COVERAGE_M2_PER_L).toBeCloseTo(185.80608, 10);
  });
  it("a 2.4 m² dining top, one coat, fits one 50 mL container", () => {
    const need = productNeeded({ areaM2: 2.4, coats: 1, coverageM2PerL: CERAMIC_TOPCOAT_COVERAGE_M2_PER_L, containerSizesMl: [50, 100] });
    expect(need.ml).toBe(13);
    expect(need.containers).toEqual([{ sizeMl: 50, count: 1 }]);
  });
});
