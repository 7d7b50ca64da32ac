import { CareInputError, requireFinite, requirePositive } from "./errors";
import { equilibriumMoistureContent } from "./moisture";
import { getSpecies } from "./species";
import { mmToInches } from "./units";

/** Table 13-5's coefficients hold between 6 % and 14 % MC (Wood Handbook FPL-GTR-190, 2010, Table 13-5 title). */
export const LINEAR_MC_MIN_PCT = 6;
export const LINEAR_MC_MAX_PCT = 14;
/**
 * Fibre saturation point assumed by Eq. 13-3 (f_M = 30 % — the Wood Handbook's usual figure;
 * from memory). Above it wood does not shrink or swell.
 */
export const FIBRE_SATURATION_PCT = 30;

export interface WidthChangeInput {
  widthMm: number;
  /** Dimensional-change coefficient per 1 % MC (Table 13-5): C_T for flat-sawn width, C_R for quarter-sawn. */
  coefficient: number;
  fromMcPct: number;
  toMcPct: number;
}

/** Wood Handbook FPL-GTR-190 (2010) Eq. 13-2: ΔD = D_I · C · (M_F − M_I). Positive = swelling. */
export function widthChangeMm({ widthMm, coefficient, fromMcPct, toMcPct }: WidthChangeInput): number {
  requirePositive(widthMm, "widthMm");
  requirePositive(coefficient, "coefficient");
  requireFinite(fromMcPct, "fromMcPct");
  requireFinite(toMcPct, "toMcPct");
  return widthMm * coefficient * (toMcPct - fromMcPct);
}

/**
 * Wood Handbook FPL-GTR-190 (2010) Eq. 13-3 (its exact form from memory — verify against the handbook):
 *   ΔD = D_I (M_F − M_I) / (f_M · 100 / S − f_M + M_I), with S the green-to-oven-dry shrinkage (%,
 *   Table 4-3) for the direction and f_M = 30. MC values above f_M are capped at f_M.
 */
export function widthChangeFromShrinkageMm(input: { widthMm: number; shrinkagePct: number; fromMcPct: number; toMcPct: number }): number {
  requirePositive(input.widthMm, "widthMm");
  requirePositive(input.shrinkagePct, "shrinkagePct");
  const mi = Math.min(requireFinite(input.fromMcPct, "fromMcPct"), FIBRE_SATURATION_PCT);
  const mf = Math.min(requireFinite(input.toMcPct, "toMcPct"), FIBRE_SATURATION_PCT);
  const fm = FIBRE_SATURATION_PCT;
  return (input.widthMm * (mf - mi)) / ((fm * 100) / input.shrinkagePct - fm + mi);
}

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
}

export interface SlabMovement {
  speciesId: string;
  fromMcPct: number;
  toMcPct: number;
  /** Width change from `from` to `to`, mm (positive = the slab swells). */
  changeMm: number;
  changeIn: number;
  /** The method used: Eq. 13-2 inside 6–14 % MC, Eq. 13-3 with Table 4-3 shrinkage outside it. */
  method: "eq_13_2_linear" | "eq_13_3_shrinkage";
  withinLinearRange: boolean;
  coefficient: number;
  reasons: string[];
}

const r1 = (n: number) => n.toFixed(1);
const r2 = (n: number) => n.toFixed(2);

/** EMC at both climates (Eq. 4-5), then the width change (Eq. 13-2, or Eq. 13-3 outside 6–14 % MC). */
export function slabMovement(input: SlabMovementInput): SlabMovement {
  const species = getSpecies(input.speciesId);
  if (!species) throw new CareInputError(`unknown species ${JSON.stringify(input.speciesId)}`, "speciesId");
  if (input.grain !== "flat" && input.grain !== "quarter") {
    throw new CareInputError(`grain must be "flat" or "quarter", got ${JSON.stringify(input.grain)}`, "grain");
  }
  requirePositive(input.widthMm, "widthMm");
  const fromMc = equilibriumMoistureContent(input.from.tempC, input.from.rhPct);
  const toMc = equilibriumMoistureContent(input.to.tempC, input.to.rhPct);
  const flat = input.grain === "flat";
  const coefficient = flat ? species.tangentialCoefficient : species.radialCoefficient;
  const shrinkage = flat ? species.shrinkageTangentialPct : species.shrinkageRadialPct;
  const inRange = (mc: number) => mc >= LINEAR_MC_MIN_PCT && mc <= LINEAR_MC_MAX_PCT;
  const withinLinearRange = inRange(fromMc) && inRange(toMc);
  const reasons = [
    `${input.from.rhPct} % RH at ${input.from.tempC} °C → ${r1(fromMc)} % moisture content; ` +
      `${input.to.rhPct} % RH at ${input.to.tempC} °C → ${r1(toMc)} % (Wood Handbook Eq. 4-5)`,
  ];
  let changeMm: number;
  if (withinLinearRange) {
    changeMm = widthChangeMm({ widthMm: input.widthMm, coefficient, fromMcPct: fromMc, toMcPct: toMc });
    reasons.push(
      `${species.commonName}, ${flat ? "flat-sawn (tangential" : "quarter-sawn (radial"} coefficient ${coefficient}): ` +
        `${input.widthMm} mm × ${coefficient} × (${r1(toMc)} − ${r1(fromMc)}) = ${r2(changeMm)} mm (Wood Handbook Eq. 13-2)`,
    );
  } else {
    changeMm = widthChangeFromShrinkageMm({ widthMm: input.widthMm, shrinkagePct: shrinkage, fromMcPct: fromMc, toMcPct: toMc });
    reasons.push(
      `moisture content leaves 6–14 %, where the handbook's linear coefficients hold; used Eq. 13-3 with ` +
        `${flat ? "tangential" : "radial"} shrinkage ${shrinkage} % (Table 4-3): ${r2(changeMm)} mm`,
    );
  }
  if (flat) reasons.push("flat-sawn figure; the handbook notes Eq. 13-2 overestimates boards that are neither flat- nor quarter-sawn");
  return {
    speciesId: species.id,
    fromMcPct: fromMc,
    toMcPct: toMc,
    changeMm,
    changeIn: mmToInches(changeMm),
    method: withinLinearRange ? "eq_13_2_linear" : "eq_13_3_shrinkage",
    withinLinearRange,
    coefficient,
    reasons,
  };
}
