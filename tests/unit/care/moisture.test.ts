import fc from "fast-check";
import { describe, expect, it } from "vitest";
import { CareInputError, clampToEmcRange, emcTemperatureInRange, equilibriumMoistureContent } from "@/lib/care";

describe("equilibriumMoistureContent input range", () => {
  it("accepts 30 °F and 270 °F, the first and last rows of Table 4-2, however they were converted", () => {
    // Before: the bounds were −1.1 and 132.2 °C, so 30 °F (−1.111… °C) and 270 °F (132.222… °C) threw.
    expect(() => equilibriumMoistureContent(((30 - 32) * 5) / 9, 80)).not.toThrow();
    expect(() => equilibriumMoistureContent(((270 - 32) * 5) / 9, 20)).not.toThrow();
    expect(emcTemperatureInRange(-1.11)).toBe(true);
    expect(emcTemperatureInRange(132.22)).toBe(true);
  });

  it("refuses temperatures outside 30–270 °F with a CareInputError naming the range", () => {
    expect(() => equilibriumMoistureContent(-1.12, 50)).toThrow(/outside the range .*30 to 270 °F/);
    expect(() => equilibriumMoistureContent(-20, 50)).toThrow(CareInputError);
    expect(() => equilibriumMoistureContent(132.3, 50)).toThrow(CareInputError);
    expect(clampToEmcRange(-5)).toBe(-10 / 9);
    expect(clampToEmcRange(150)).toBe(1190 / 9);
  });

  it("refuses RH outside 0–100 % and non-numbers", () => {
    expect(() => equilibriumMoistureContent(20, -1)).toThrow(CareInputError);
    expect(() => equilibriumMoistureContent(20, 100.5)).toThrow(/between 0 and 100/);
    expect(() => equilibriumMoistureContent(Number.NaN, 50)).toThrow(/finite/);
  });

  it("is 0 at 0 % RH and rises with RH at every temperature of the range (property)", () => {
    fc.assert(
      fc.property(fc.double({ min: -10 / 9, max: 1190 / 9, noNaN: true }), fc.double({ min: 0, max: 99, noNaN: true }), fc.double({ min: 0.01, max: 1, noNaN: true }), (t, rh, more) => {
        expect(equilibriumMoistureContent(t, 0)).toBe(0);
        expect(equilibriumMoistureContent(t, rh + more)).toBeGreaterThan(equilibriumMoistureContent(t, rh));
      }),
    );
  });
});
