import { describe, expect, it } from "vitest";
import { EMC_MAX_TEMP_C, EMC_MIN_TEMP_C, equilibriumMoistureContent } from "@/lib/care";

const fToC = (f: number) => ((f - 32) * 5) / 9;

// Source: USDA Forest Products Laboratory, Wood Handbook, FPL-GTR-282 (2021), ch. 4, Table 4-2,
// "Moisture content of wood in equilibrium with stated temperature and relative humidity", the 70 °F
// (21.1 °C) column, as printed. The table is computed from Eq. 4-5
// (Simpson 1973) and printed to 0.1 %, so ±0.1 holds.
const TABLE_4_2_AT_70_F: ReadonlyArray<[rhPct: number, mcPct: number]> = [
  [10, 2.5],
  [20, 4.5],
  [30, 6.2],
  [40, 7.7],
  [50, 9.2],
  [60, 11.0],
  [70, 13.1],
  [80, 16.0],
  [90, 20.5],
];

describe("EMC against Wood Handbook FPL-GTR-282 (2021) Table 4-2, 70 °F column (printed)", () => {
  it.each(TABLE_4_2_AT_70_F)("70 °F (exactly 21.111… °C), RH %i → MC %f (±0.1)", (rh, mc) => {
    expect(Math.abs(equilibriumMoistureContent(fToC(70), rh) - mc)).toBeLessThanOrEqual(0.1);
  });
});

// Table 4-2's other temperature rows (30 °F to 270 °F) are not in the printed excerpts we hold (lib/care/SOURCES.md), so these
// cells are Eq. 4-5 worked by hand (FPL-GTR-282, 2021, ch. 4, Eq. 4-5, Simpson 1973), °C form, h = RH/100:
//   W = 349 + 1.29T + 0.0135T², K = 0.805 + 0.000736T − 0.00000273T²,
//   K1 = 6.27 − 0.00938T − 0.000303T², K2 = 1.91 + 0.0407T − 0.000293T²,
//   EMC = 1800/W · [Kh/(1 − Kh) + (K1·Kh + 2·K1·K2·K²h²)/(1 + K1·Kh + K1·K2·K²h²)].
// Intermediate values written out (T from °F exactly, (F − 32) × 5/9), so each cell can be re-checked
// on a calculator:
//   30 °F,  T = −1.1111: W = 347.5833, K = 0.804179, K1 = 6.28005,  K2 = 1.86442
//   130 °F, T = 54.4444: W = 459.2500, K = 0.836979, K1 = 4.86116,  K2 = 3.25738
//   200 °F, T = 93.3333: W = 587.0000, K = 0.849912, K1 = 2.75507,  K2 = 3.15631
//   270 °F, T = 132.222: W = 755.5833, K = 0.854588, K1 = −0.26751, K2 = 2.16901
// e.g. 30 °F, 50 % RH: Kh = 0.402089; Kh/(1 − Kh) = 0.672491; K1·Kh = 2.525141;
//   K1·K2·Kh² = 1.893002; (2.525141 + 2·1.893002)/(1 + 2.525141 + 1.893002) = 1.164817;
//   1800/347.5833 × (0.672491 + 1.164817) = 5.178614 × 1.837308 = 9.5147.
const WORKED_BY_HAND: ReadonlyArray<[tempF: number, rhPct: number, mcPct: number]> = [
  [30, 10, 2.6035],
  [30, 50, 9.5147],
  [30, 90, 21.0231],
  [130, 10, 1.9816],
  [130, 50, 7.9368],
  [130, 90, 18.1796],
  [200, 10, 1.1355],
  [200, 50, 5.8],
  [200, 90, 14.5739],
  [270, 10, 0.1459],
  [270, 50, 0.7809],
  [270, 90, 3.2236],
];

describe("EMC across Table 4-2's temperature rows, both ends included (Eq. 4-5 worked by hand)", () => {
  it.each(WORKED_BY_HAND)("%i °F, RH %i → MC %f (±0.001)", (f, rh, mc) => {
    expect(Math.abs(equilibriumMoistureContent(fToC(f), rh) - mc)).toBeLessThanOrEqual(0.001);
  });

  it("the range is Table 4-2's first and last rows converted exactly: 30 °F = −10/9 °C, 270 °F = 1190/9 °C", () => {
    expect(EMC_MIN_TEMP_C).toBe(-10 / 9);
    expect(EMC_MAX_TEMP_C).toBe(1190 / 9);
    // °F converted another way (÷ 1.8) lands a float ulp away from the bound and is still accepted.
    expect(() => equilibriumMoistureContent((30 - 32) / 1.8, 50)).not.toThrow();
    expect(() => equilibriumMoistureContent((270 - 32) / 1.8, 50)).not.toThrow();
  });
});
