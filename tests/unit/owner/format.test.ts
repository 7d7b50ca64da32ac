// The one formatter's imperial lengths read like a woodworker's tape.
// 1 in = 25.4 mm exactly (NIST Handbook 44, Appendix C); each expected value is worked by hand.
import { describe, expect, it } from "vitest";
import { formatDistance, formatInchesTape, formatLength, formatLengthBoth, formatSize, formatTemperature, formatTemperatureChange, formatThickness, formatVolume } from "@/lib/format";

describe("imperial lengths", () => {
  it("round to the nearest 1/16 in and reduce the fraction", () => {
    expect(formatInchesTape(2438.4)).toBe("96 in"); // 96 × 25.4
    expect(formatInchesTape(955.675)).toBe("37 5/8 in"); // 37.625 × 25.4
    expect(formatInchesTape(900)).toBe("35 7/16 in"); // 35.433 in; × 16 = 566.9 → 567/16
    expect(formatInchesTape(7.9375)).toBe("5/16 in"); // 0.3125 × 25.4
    expect(formatInchesTape(2000)).toBe("78 3/4 in"); // 78.740 in; × 16 = 1259.8 → 1260/16
    expect(formatLength(2440, "metric")).toBe("2,440 mm");
  });

  it("give board thickness in quarters where it is a whole number of quarter inches", () => {
    expect(formatThickness(50.8, "imperial")).toBe("2 in (8/4)"); // 2 in = 8/4
    expect(formatThickness(44.45, "imperial")).toBe("1 3/4 in (7/4)");
    expect(formatThickness(44.45, "imperial", { quarters: false })).toBe("1 3/4 in"); // owners: no trade shorthand
    expect(formatThickness(51, "imperial")).toBe("2 in (8/4)"); // 2.008 in: within 1/32 in of 2
    expect(formatThickness(30, "imperial")).toBe("1 3/16 in"); // 1.181 in: 0.069 in from 1 1/4, not a quarter
    expect(formatThickness(12.7, "imperial")).toBe("1/2 in"); // below 4/4: no quarters
    expect(formatThickness(51, "metric")).toBe("51 mm");
  });

  it("sizes and staff records use the same words", () => {
    expect(formatSize({ shapeKind: "rectangle", lengthMm: 2438, widthMm: 956, diameterMm: null, measuredAreaM2: null }, "imperial")).toBe("96 × 37 5/8 in");
    expect(formatLengthBoth(2438, "metric")).toBe("2,438 mm (96 in)");
    expect(formatLengthBoth(null, "metric")).toBe("—");
  });
});

// Volumes: the engine's exact mL goes in; each figure is rounded up once, from the
// exact amount. 1 US fl oz = 29.5735295625 mL exactly (NIST Handbook 44, 2024, Appendix C).
describe("volumes", () => {
  it("round the exact amount up once, for display", () => {
    // 160 mL = 160 / 29.5735295625 = 5.41024 fl oz → 5.5.
    expect(formatVolume(160, "imperial")).toBe("5.5 US fl oz (160 mL)");
    expect(formatVolume(160, "metric")).toBe("160 mL");
    // 1 L = 33.8140 fl oz → 33.9.
    expect(formatVolume(1000, "imperial")).toBe("33.9 US fl oz (1,000 mL)");
    // 12.91669 mL → 13 mL; 0.43676 fl oz → 0.5.
    expect(formatVolume(12.91669, "imperial")).toBe("0.5 US fl oz (13 mL)");
    // Float noise is not an extra millilitre: 100.00000000000001 mL reads 100 mL.
    expect(formatVolume(100.00000000000001, "metric")).toBe("100 mL");
  });

  it("take fl oz from the exact amount, not from the rounded mL", () => {
    // 29.1 mL exact = 0.98399 fl oz → 1 fl oz; the mL figure rounds up to 30 mL. Converting the
    // rounded 30 mL instead (1.01442 fl oz) would round up again, to 1.1 fl oz.
    expect(formatVolume(29.1, "imperial")).toBe("1 US fl oz (30 mL)");
    expect(formatVolume(29.1, "metric")).toBe("30 mL");
  });
});

// Distances (travel on a quote): 1 mile = 1.609344 km exactly (NIST Handbook 44, Appendix C).
describe("distances", () => {
  it("km, or miles to 0.1", () => {
    expect(formatDistance(12, "metric")).toBe("12 km");
    expect(formatDistance(12, "imperial")).toBe("7.5 mi"); // 12 / 1.609344 = 7.4565
    expect(formatDistance(1.609344, "imperial")).toBe("1 mi");
    expect(formatDistance(2500, "metric")).toBe("2,500 km");
  });
});

// Temperatures stored in °C: a reading converts as °C × 9/5 + 32, a change as °C × 9/5 (no offset).
describe("temperatures", () => {
  it("readings and changes in the reader's units, to 0.1", () => {
    expect(formatTemperature(20, "imperial")).toBe("68 °F"); // 20 × 1.8 + 32
    expect(formatTemperature(22.2, "imperial")).toBe("72 °F"); // 71.96
    expect(formatTemperature(-5, "imperial")).toBe("23 °F");
    expect(formatTemperature(21.1, "metric")).toBe("21.1 °C");
    expect(formatTemperatureChange(5, "imperial")).toBe("9 °F"); // a difference: 5 × 1.8
    expect(formatTemperatureChange(3.9, "metric")).toBe("3.9 °C");
  });
});
