import { describe, expect, it } from "vitest";
import { CERAMIC_TOPCOAT_COVERAGE_M2_PER_L, ft2ToM2, productNeeded } from "@/lib/care";

// Common practice, no published source: a ceramic-type topcoat covers about 2 ft² per mL, so 100 mL
// does about 200 ft² (lib/care/SOURCES.md lists it with the other rules of the trade).
// Fluid ounces: 1 US fl oz = 29.5735295625 mL exactly (NIST HB 44 App. C / NIST SP 811 App. B).
describe("ceramic-type topcoat coverage — common practice, no published source (worked by hand)", () => {
  it("200 ft², one coat, at 2 ft²/mL needs exactly 100 mL = 3.381402 US fl oz (shown as 100 mL, 3.4 fl oz)", () => {
    // By hand: 200 ft² ÷ 2 ft²/mL = 100 mL; 100 ÷ 29.5735295625 = 3.3814023 fl oz.
    const need = productNeeded({ areaM2: ft2ToM2(200), coats: 1, coverageM2PerL: CERAMIC_TOPCOAT_COVERAGE_M2_PER_L });
    expect(need.exactMl).toBeCloseTo(100, 9);
    expect(need.exactFlOz).toBeCloseTo(3.3814023, 7);
    expect(need.ml).toBe(100);
    expect(need.flOz).toBe(3.4);
  });
  it("a 2.4 m² dining top, one coat: 2.4 m² = 25.8334 ft² ÷ 2 = 12.9167 mL, one 50 mL container", () => {
    const need = productNeeded({ areaM2: 2.4, coats: 1, coverageM2PerL: CERAMIC_TOPCOAT_COVERAGE_M2_PER_L, containerSizesMl: [50, 100] });
    expect(need.exactMl).toBeCloseTo(12.91669, 5);
    expect(need.ml).toBe(13);
    expect(need.containers).toEqual([{ sizeMl: 50, count: 1 }]);
  });
});
