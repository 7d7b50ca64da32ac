import { describe, expect, it } from "vitest";
import { IN3_PER_US_GALLON, L_PER_US_GALLON, M2_PER_FT2, ML_PER_US_FL_OZ, MM_PER_INCH, M_PER_FOOT, topArea } from "@/lib/care";

// Source: NIST Handbook 44, Appendix C "General Tables of Units of Measurement"; NIST SP 811 (2008)
// Appendix B.8; 16 CFR 500.19 (values via ../shared/REFERENCES.md).
describe("unit constants, NIST Handbook 44 App. C / NIST SP 811 App. B", () => {
  it("1 in = 25.4 mm exactly", () => expect(MM_PER_INCH).toBe(25.4));
  it("1 ft = 0.3048 m exactly = 12 in", () => {
    expect(M_PER_FOOT).toBe(0.3048);
    expect((12 * MM_PER_INCH) / 1000).toBeCloseTo(M_PER_FOOT, 15);
  });
  it("1 ft² = 0.09290304 m² exactly = (0.3048 m)²", () => {
    expect(M2_PER_FT2).toBe(0.09290304);
    expect(M_PER_FOOT * M_PER_FOOT).toBeCloseTo(M2_PER_FT2, 15);
  });
  it("1 US gallon = 231 in³ = 3.785411784 L", () => {
    expect(IN3_PER_US_GALLON).toBe(231);
    expect(L_PER_US_GALLON).toBe(3.785411784);
    // 231 in³ × (254 tenths of a mm)³ = 3 785 411 784 × 0.001 mm³ = 3.785411784 L, in integers to stay exact
    expect(231n * 254n ** 3n).toBe(3785411784n);
  });
  it("1 US fl oz = 1/128 gallon = 29.5735295625 mL (16 CFR 500.19)", () => {
    expect(ML_PER_US_FL_OZ).toBe(29.5735295625);
    expect((L_PER_US_GALLON * 1000) / 128).toBeCloseTo(ML_PER_US_FL_OZ, 12);
  });
});

describe("top areas against closed forms", () => {
  it("rectangle 2400 × 1000 mm = 2.4 m² = 2.4 / 0.09290304 ft²", () => {
    const a = topArea({ kind: "rectangle", lengthMm: 2400, widthMm: 1000 });
    expect(a.m2).toBeCloseTo(2.4, 12);
    expect(a.ft2).toBeCloseTo(25.8333850, 6);
  });
  it("8 ft × 3 ft rectangle (2438.4 × 914.4 mm) = 24 ft² exactly", () => {
    expect(topArea({ kind: "rectangle", lengthMm: 2438.4, widthMm: 914.4 }).ft2).toBeCloseTo(24, 10);
  });
  it("round Ø 1200 mm = π·0.6² m²", () => {
    expect(topArea({ kind: "round", diameterMm: 1200 }).m2).toBeCloseTo(Math.PI * 0.36, 12);
  });
  it("round Ø 48 in = π·2² ft²", () => {
    expect(topArea({ kind: "round", diameterMm: 48 * 25.4 }).ft2).toBeCloseTo(Math.PI * 4, 10);
  });
  it("oval 2000 × 1000 mm = π·1·0.5 m² (ellipse, semi-axes 1 m and 0.5 m)", () => {
    expect(topArea({ kind: "oval", lengthMm: 2000, widthMm: 1000 }).m2).toBeCloseTo(Math.PI * 0.5, 12);
  });
  it("an oval with equal axes equals the round top", () => {
    expect(topArea({ kind: "oval", lengthMm: 900, widthMm: 900 }).m2).toBeCloseTo(topArea({ kind: "round", diameterMm: 900 }).m2, 14);
  });
  it("measured area passes through", () => {
    expect(topArea({ kind: "measured", areaM2: 1.37 })).toEqual({ m2: 1.37, ft2: 1.37 / 0.09290304 });
  });
});
