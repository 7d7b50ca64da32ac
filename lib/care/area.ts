import { CareInputError, requirePositive } from "./errors";
import { m2ToFt2 } from "./units";

export type TopShape =
  | { kind: "rectangle"; lengthMm: number; widthMm: number }
  | { kind: "round"; diameterMm: number }
  /** An ellipse whose full axes are lengthMm and widthMm. */
  | { kind: "oval"; lengthMm: number; widthMm: number }
  /** Irregular (live-edge) tops: the area the studio measured. */
  | { kind: "measured"; areaM2: number };

export interface TopArea {
  m2: number;
  ft2: number;
}

const MM2_PER_M2 = 1_000_000;

/** Area of one face of a top. Closed forms: rectangle L·W; circle π·d²/4; ellipse π·a·b with semi-axes a = L/2, b = W/2. */
export function topArea(shape: TopShape): TopArea {
  let m2: number;
  switch (shape?.kind) {
    case "rectangle":
      m2 = (requirePositive(shape.lengthMm, "shape.lengthMm") * requirePositive(shape.widthMm, "shape.widthMm")) / MM2_PER_M2;
      break;
    case "round": {
      const d = requirePositive(shape.diameterMm, "shape.diameterMm");
      m2 = (Math.PI * d * d) / 4 / MM2_PER_M2;
      break;
    }
    case "oval":
      m2 = (Math.PI * requirePositive(shape.lengthMm, "shape.lengthMm") * requirePositive(shape.widthMm, "shape.widthMm")) / 4 / MM2_PER_M2;
      break;
    case "measured":
      m2 = requirePositive(shape.areaM2, "shape.areaM2");
      break;
    default:
      throw new CareInputError(`unknown shape kind ${JSON.stringify((shape as { kind?: unknown } | undefined)?.kind)}; expected rectangle, round, oval or measured`, "shape.kind");
  }
  return { m2, ft2: m2ToFt2(m2) };
}

/** The across-the-grain width of a top, used for movement: rectangle/oval width, round diameter; undefined for measured. */
export function topWidthMm(shape: TopShape): number | undefined {
  switch (shape.kind) {
    case "rectangle":
    case "oval":
      return shape.widthMm;
    case "round":
      return shape.diameterMm;
    case "measured":
      return undefined;
  }
}
