// Invented pieces and claim answers shared by the care engine's pure tests (no database).
import type { CarePiece } from "@/lib/care";

/** An invented 2.4 m black-walnut dining table with a deep-pour resin river, delivered 2 March 2025. */
export const walnutTable: CarePiece = {
  id: "pc_walnut",
  kind: "dining_table",
  use: "heavy",
  sun: "indirect",
  deliveredOn: "2025-03-02",
  resin: "deep_pour",
  shape: { kind: "rectangle", lengthMm: 2400, widthMm: 1000 },
  primarySpeciesId: "black_walnut",
};

/** A claim's exclusion questions, every one answered "no". */
export const noExclusionAnswers = { heat: false, chemicals: false, impact: false, usedOutdoors: false, directSun: false };
