import { CareInputError, requireFinite } from "./errors";

/**
 * Temperature range of the Wood Handbook's EMC table (FPL-GTR-282, 2021, Table 4-2: 30–270 °F — the
 * range is from memory), the range the regression was fitted over, converted exactly:
 * (30 − 32) × 5/9 = −10/9 = −1.111… °C and (270 − 32) × 5/9 = 1190/9 = 132.222… °C. A reading a
 * hair outside from a °F conversion done another way (float noise, ≤ 1e-9 °C) counts as the bound.
 */
export const EMC_MIN_TEMP_C = ((30 - 32) * 5) / 9;
export const EMC_MAX_TEMP_C = ((270 - 32) * 5) / 9;
const BOUND_TOLERANCE_C = 1e-9;

/** Whether Eq. 4-5 may be used at this temperature (inside Table 4-2's rows, both ends included). */
export function emcTemperatureInRange(tempC: number): boolean {
  return tempC >= EMC_MIN_TEMP_C - BOUND_TOLERANCE_C && tempC <= EMC_MAX_TEMP_C + BOUND_TOLERANCE_C;
}

/** The nearest temperature Eq. 4-5 may be used at (callers that must answer anyway say they clamped). */
export function clampToEmcRange(tempC: number): number {
  return Math.min(Math.max(tempC, EMC_MIN_TEMP_C), EMC_MAX_TEMP_C);
}

/**
 * Equilibrium moisture content of wood, % of oven-dry mass, at a temperature (°C) and relative
 * humidity (%). USDA FPL *Wood Handbook*, FPL-GTR-282 (2021), ch. 4, Eq. 4-5 (Simpson 1973,
 * *Wood and Fiber* 5(1):41–49), °C form, h = RH/100:
 *   EMC = 1800/W · [ Kh/(1 − Kh) + (K1·Kh + 2·K1·K2·K²h²) / (1 + K1·Kh + K1·K2·K²h²) ]
 */
export function equilibriumMoistureContent(tempC: number, relativeHumidityPct: number): number {
  requireFinite(tempC, "tempC");
  requireFinite(relativeHumidityPct, "relativeHumidityPct");
  if (relativeHumidityPct < 0 || relativeHumidityPct > 100) {
    throw new CareInputError(`relative humidity must be between 0 and 100 %, got ${relativeHumidityPct}`, "relativeHumidityPct");
  }
  if (!emcTemperatureInRange(tempC)) {
    throw new CareInputError(
      `temperature ${tempC} °C is outside the range of the Wood Handbook EMC equation (30 to 270 °F, ${EMC_MIN_TEMP_C.toFixed(2)} to ${EMC_MAX_TEMP_C.toFixed(2)} °C)`,
      "tempC",
    );
  }
  const T = clampToEmcRange(tempC);
  const h = relativeHumidityPct / 100;
  const W = 349 + 1.29 * T + 0.0135 * T * T;
  const K = 0.805 + 0.000736 * T - 0.00000273 * T * T;
  const K1 = 6.27 - 0.00938 * T - 0.000303 * T * T;
  const K2 = 1.91 + 0.0407 * T - 0.000293 * T * T;
  const Kh = K * h;
  return (1800 / W) * (Kh / (1 - Kh) + (K1 * Kh + 2 * K1 * K2 * Kh * Kh) / (1 + K1 * Kh + K1 * K2 * Kh * Kh));
}
