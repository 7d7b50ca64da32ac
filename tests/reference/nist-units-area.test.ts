import { describe, expect, it } from "vitest";
import { ft2ToM2, inchesToMm, m2ToFt2, mlToUsFlOz, mmToInches, topArea, usFlOzToMl } from "@/lib/care";

// Source: NIST Handbook 44, Appendix C "General Tables of Units of Measurement", and NIST SP 811 (2008),
// Appendix B: 1 in = 25.4 mm; 1 ft = 0.3048 m; 1 ft² = 0.09290304 m²;
// 1 US gallon = 231 in³ = 3.785411784 L; 1 US fl oz = 1/128 gallon = 29.5735295625 mL (exact; 16 CFR
// 500.19 prints a rounded figure for labels, so the exact one is cited to NIST).
describe("unit conversions against NIST HB 44 App. C / NIST SP 811 App. B", () => {
  it("1 in = 25.4 mm; 1 ft = 12 in = 304.8 mm", () => {
    expect(inchesToMm(1)).toBe(25.4);
    expect(mmToInches(304.8)).toBeCloseTo(12, 12);
  });
  it("1 ft² = 0.09290304 m², both ways", () => {
    expect(ft2ToM2(1)).toBe(0.09290304);
    expect(m2ToFt2(0.09290304)).toBe(1);
  });
  it("1 US gallon = 128 US fl oz = 3.785411784 L = 3785.411784 mL", () => {
    expect(usFlOzToMl(128)).toBeCloseTo(3785.411784, 9);
    expect(mlToUsFlOz(3785.411784)).toBeCloseTo(128, 10);
  });
  it("1 US fl oz = 29.5735295625 mL exactly", () => {
    expect(usFlOzToMl(1)).toBe(29.5735295625);
    expect(mlToUsFlOz(29.5735295625)).toBe(1);
  });
  it("1 US gallon = 231 in³: 231 in³ converted to mL through the inch is 3785.411784 mL", () => {
    // By hand: 231 × 25.4³ mm³ = 231 × 16 387.064 = 3 785 411.784 mm³ = 3785.411784 mL.
    expect((231 * inchesToMm(1) ** 3) / 1000).toBeCloseTo(3785.411784, 9);
    expect(usFlOzToMl(128)).toBeCloseTo((231 * inchesToMm(1) ** 3) / 1000, 9);
  });
});

// Areas against closed forms worked by hand.
describe("top areas against closed forms", () => {
  it("rectangle 2400 × 1000 mm = 2.4 m² = 2.4 / 0.09290304 = 25.833385 ft²", () => {
    const a = topArea({ kind: "rectangle", lengthMm: 2400, widthMm: 1000 });
    expect(a.m2).toBeCloseTo(2.4, 12);
    expect(a.ft2).toBeCloseTo(25.833385, 6);
  });
  it("8 ft × 3 ft rectangle (2438.4 × 914.4 mm) = 24 ft² exactly", () => {
    expect(topArea({ kind: "rectangle", lengthMm: 2438.4, widthMm: 914.4 }).ft2).toBeCloseTo(24, 10);
  });
  it("round Ø 1200 mm = π × 0.6² = 1.130973 m²", () => {
    expect(topArea({ kind: "round", diameterMm: 1200 }).m2).toBeCloseTo(1.130973, 6);
  });
  it("round Ø 48 in = π × 2² = 12.566371 ft²", () => {
    expect(topArea({ kind: "round", diameterMm: 48 * 25.4 }).ft2).toBeCloseTo(12.566371, 6);
  });
  it("oval 2000 × 1000 mm = π × 1 × 0.5 = 1.570796 m² (ellipse)", () => {
    expect(topArea({ kind: "oval", lengthMm: 2000, widthMm: 1000 }).m2).toBeCloseTo(1.570796, 6);
  });
});

// Coverage per coat as a US label prints it (lib/format formatCoverage), from the same exact definitions:
// 1 m²/L = (1 / 0.09290304) ft² per (1 / 3.785411784) US gal = 40.745853… ft²/US gal, worked by hand.
describe("coverage per coat in ft² per US gallon (NIST HB 44 App. C / NIST SP 811 App. B)", () => {
  it("186 m²/L = 7,578.73 ft²/US gal → '7,579 ft²/US gal (186 m²/L)'; metric studios read m²/L alone", async () => {
    const { formatCoverage } = await import("@/lib/format");
    expect(formatCoverage(186, "imperial")).toBe("7,579 ft²/US gal (186 m²/L)");
    expect(formatCoverage(9.8, "imperial")).toBe("399 ft²/US gal (9.8 m²/L)"); // 9.8 × 40.745853 = 399.31
    expect(formatCoverage(150, "metric")).toBe("150 m²/L");
  });
});
