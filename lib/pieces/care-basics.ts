// The care basics printed on a drawer card and shown on the piece page, chosen by the finish classes
// in the piece's stack. Plain words, no numbers the care engine computes (its schedule gives dates).
// Pure: no server-only import, so owner pages and e-mails may use it too.
import { OIL_FINISH_CLASSES, type FinishClass, type ResinKind } from "@/lib/care/vocabulary";

export const CLASS_BASICS: Record<FinishClass, string> = {
  hardwax_oil: "Oiled surface: wipe with a damp cloth and a little mild soap, then dry. Lift spills at once. Re-oil when water stops beading.",
  ceramic_topcoat: "Topcoat over oil: clean with a damp cloth; no scouring pads or strong solvents. Refresh the topcoat when the sheen wears dull.",
  paste_wax: "Waxed surface: dust with a soft dry cloth and wipe spills straight away. Re-wax when the surface looks dry.",
  film_finish: "Film finish: damp cloth and mild soap; no silicone polishes. Use coasters and trivets. Look for worn spots once a year.",
  epoxy_surface: "Resin surface: soft cloth and mild soap; no abrasive cleaners. Fine scratches polish out.",
  charred_oiled: "Charred and oiled surface: brush off dust, rinse with plain water. Re-oil when the char looks grey and dry.",
};

export const GENERAL_BASICS = [
  "Keep the room between about 40 and 60 % relative humidity, away from radiators and heater vents.",
  "Use coasters and trivets; lift objects rather than sliding them.",
];

export const OILY_RAG_CAUTION =
  "Oily rags can heat up and catch fire by themselves. Never pile them up: dry them spread flat outdoors, or keep them in a closed metal can filled with water, then ask your local waste service how to dispose of them (NFPA tip sheet \"Safety with oily rags\").";

export const PRODUCT_CAUTION = "When you apply any finish, ventilate the room and follow the product's safety data sheet.";

export const HOT_COOKWARE_CAUTION = "Keep hot cookware off the resin: heat can soften, cloud or mark it.";

export type CareBasics = { basics: string[]; cautions: string[]; hasOil: boolean };

/** The basics and cautions for a stack's finish classes (and the piece's resin). */
export function careBasics(classes: readonly FinishClass[], resin: ResinKind = "none"): CareBasics {
  const unique = [...new Set(classes)];
  const hasOil = unique.some((c) => OIL_FINISH_CLASSES.includes(c));
  const hasResin = resin !== "none" || unique.includes("epoxy_surface");
  const basics = [...unique.map((c) => CLASS_BASICS[c]), ...GENERAL_BASICS];
  const cautions = [...(hasOil ? [OILY_RAG_CAUTION] : []), ...(hasResin ? [HOT_COOKWARE_CAUTION] : []), PRODUCT_CAUTION];
  return { basics, cautions, hasOil };
}
