import { requireFinite, requirePositive } from "./errors";

// Shrinkage and swelling across the grain from green-to-oven-dry shrinkage, USDA FPL *Wood Handbook*,
// FPL-GTR-190 (2010), ch. 13. One model everywhere: Eq. 13-3 with a species' shrinkage S (Table 4-3).
// Table 13-5's dimensional-change coefficients (Eq. 13-2, 6–14 % MC) are the slope of Eq. 13-3 at
// 10 % MC, C = S / (3000 − 20·S): that reproduces the printed coefficient of every species whose
// Table 4-3 and Table 13-5 rows describe the same wood (tests/reference/movement-wood-handbook.test.ts).
// Using the shrinkage form throughout keeps movement continuous and monotonic: switching to Eq. 13-2
// inside 6–14 % would add a step wherever a species' two printed rows disagree.

/**
 * Fibre saturation point assumed by Eq. 13-3, % MC (f_M = 30: the handbook's usual figure —
 * from memory). Above it wood does not shrink or swell.
 */
export const FIBRE_SATURATION_PCT = 30;

/** Moisture content at which Table 13-5's coefficients equal the slope of Eq. 13-3 (the middle of 6–14 %). */
export const COEFFICIENT_REFERENCE_MC_PCT = 10;

/**
 * Wood Handbook FPL-GTR-190 (2010) Eq. 13-3 (its exact form from memory; it reproduces Table 13-5
 * from Table 4-3, see above):
 *   ΔD = D_I (M_F − M_I) / (f_M · 100 / S − f_M + M_I)
 * with S the green-to-oven-dry shrinkage (%) for the direction and f_M = 30. MC above f_M is capped at
 * f_M, below 0 at 0. Positive = swelling. Continuous, increasing in M_F and decreasing in M_I.
 */
export function widthChangeFromShrinkageMm(input: { widthMm: number; shrinkagePct: number; fromMcPct: number; toMcPct: number }): number {
  requirePositive(input.widthMm, "widthMm");
  requirePositive(input.shrinkagePct, "shrinkagePct");
  const fm = FIBRE_SATURATION_PCT;
  const mi = clampMc(requireFinite(input.fromMcPct, "fromMcPct"));
  const mf = clampMc(requireFinite(input.toMcPct, "toMcPct"));
  return (input.widthMm * (mf - mi)) / ((fm * 100) / input.shrinkagePct - fm + mi);
}

const clampMc = (mc: number) => Math.min(Math.max(mc, 0), FIBRE_SATURATION_PCT);

/**
 * Dimensional-change coefficient per 1 % MC implied by a shrinkage S: the slope of Eq. 13-3 at
 * 10 % MC, 1 / (3000/S − 20) = S / (3000 − 20·S). Black walnut tangential, S = 7.8 (Table 4-3):
 * 7.8 / 2844 = 0.002743, printed 0.00274 in Table 13-5.
 */
export function coefficientFromShrinkage(shrinkagePct: number): number {
  requirePositive(shrinkagePct, "shrinkagePct");
  const fm = FIBRE_SATURATION_PCT;
  return 1 / ((fm * 100) / shrinkagePct - fm + COEFFICIENT_REFERENCE_MC_PCT);
}

/** The inverse: the shrinkage S whose Eq. 13-3 slope at 10 % MC is C, S = 3000·C / (1 + 20·C). */
export function shrinkageFromCoefficient(coefficient: number): number {
  requirePositive(coefficient, "coefficient");
  const fm = FIBRE_SATURATION_PCT;
  return (fm * 100 * coefficient) / (1 + (fm - COEFFICIENT_REFERENCE_MC_PCT) * coefficient);
}
