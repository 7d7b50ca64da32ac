import { CareInputError, requirePositive } from "./errors";
import { clampToEmcRange, emcTemperatureInRange, equilibriumMoistureContent, EMC_MAX_TEMP_C, EMC_MIN_TEMP_C } from "./moisture";
import { widthChangeFromShrinkageMm } from "./shrinkage";
import { getSpecies } from "./species";
import { mmToInches } from "./units";

/** Table 13-5's coefficients are printed for 6–14 % MC (Wood Handbook FPL-GTR-190, 2010, Table 13-5 title). */
export const LINEAR_MC_MIN_PCT = 6;
export const LINEAR_MC_MAX_PCT = 14;

export interface Climate {
  tempC: number;
  rhPct: number;
}

export interface SlabMovementInput {
  speciesId: string;
  widthMm: number;
  /** flat: width is tangential (live-edge slabs are usually flat-sawn); quarter: width is radial. */
  grain: "flat" | "quarter";
  from: Climate;
  to: Climate;
  /**
   * Temperatures outside the EMC equation's range (30–270 °F): "throw" (default) refuses them;
   * "clamp" works at the nearest bound and says so in the reasons.
   */
  outOfRangeTemperature?: "throw" | "clamp";
}

export interface SlabMovement {
  speciesId: string;
  fromMcPct: number;
  toMcPct: number;
  /** Width change from `from` to `to`, mm (positive = the slab swells). */
  changeMm: number;
  changeIn: number;
  /** Green-to-oven-dry shrinkage used for the direction, % (Eq. 13-3). */
  shrinkagePct: number;
  /** The same as a coefficient per 1 % MC (slope of Eq. 13-3 at 10 % MC; Table 13-5's form). */
  coefficient: number;
  /** Both moisture contents inside 6–14 %, where Table 13-5's linear form would also hold. */
  withinLinearRange: boolean;
  /** A temperature was outside the EMC equation's range and the nearest bound was used. */
  temperatureClamped: boolean;
  reasons: string[];
}

const r1 = (n: number) => n.toFixed(1);
const r2 = (n: number) => n.toFixed(2);

/**
 * EMC at both climates (Eq. 4-5), then the width change by Eq. 13-3 with the species' shrinkage — one
 * model at every moisture content, so the result is continuous and monotonic in the moisture change.
 */
export function slabMovement(input: SlabMovementInput): SlabMovement {
  const species = getSpecies(input.speciesId);
  if (!species) throw new CareInputError(`unknown species ${JSON.stringify(input.speciesId)}`, "speciesId");
  if (input.grain !== "flat" && input.grain !== "quarter") {
    throw new CareInputError(`grain must be "flat" or "quarter", got ${JSON.stringify(input.grain)}`, "grain");
  }
  requirePositive(input.widthMm, "widthMm");
  const reasons: string[] = [];
  let temperatureClamped = false;
  const tempFor = (c: Climate): number => {
    if (input.outOfRangeTemperature !== "clamp" || !Number.isFinite(c.tempC) || emcTemperatureInRange(c.tempC)) return c.tempC;
    temperatureClamped = true;
    const used = clampToEmcRange(c.tempC);
    reasons.push(
      `${c.tempC} °C is outside the range of the moisture equation (${r1(EMC_MIN_TEMP_C)} to ${r1(EMC_MAX_TEMP_C)} °C); worked at ${r1(used)} °C instead, so this figure is approximate`,
    );
    return used;
  };
  const fromMc = equilibriumMoistureContent(tempFor(input.from), input.from.rhPct);
  const toMc = equilibriumMoistureContent(tempFor(input.to), input.to.rhPct);
  const flat = input.grain === "flat";
  const coefficient = flat ? species.tangentialCoefficient : species.radialCoefficient;
  const shrinkage = flat ? species.shrinkageTangentialPct : species.shrinkageRadialPct;
  const inRange = (mc: number) => mc >= LINEAR_MC_MIN_PCT && mc <= LINEAR_MC_MAX_PCT;
  const changeMm = widthChangeFromShrinkageMm({ widthMm: input.widthMm, shrinkagePct: shrinkage, fromMcPct: fromMc, toMcPct: toMc });
  reasons.unshift(
    `${input.from.rhPct} % RH at ${input.from.tempC} °C → ${r1(fromMc)} % moisture content; ` +
      `${input.to.rhPct} % RH at ${input.to.tempC} °C → ${r1(toMc)} % (Wood Handbook Eq. 4-5)`,
  );
  reasons.push(
    `${species.commonName}, ${flat ? "flat-sawn (tangential" : "quarter-sawn (radial"} shrinkage ${r1(shrinkage)} %, about ${coefficient.toFixed(5)} per 1 % moisture): ` +
      `${input.widthMm} mm from ${r1(fromMc)} % to ${r1(toMc)} % = ${r2(changeMm)} mm (Wood Handbook Eq. 13-3)`,
  );
  if (flat) reasons.push("flat-sawn figure; boards that are neither flat- nor quarter-sawn move less");
  if (species.note) reasons.push(species.note);
  return {
    speciesId: species.id,
    fromMcPct: fromMc,
    toMcPct: toMc,
    changeMm,
    changeIn: mmToInches(changeMm),
    shrinkagePct: shrinkage,
    coefficient,
    withinLinearRange: inRange(fromMc) && inRange(toMc),
    temperatureClamped,
    reasons,
  };
}
