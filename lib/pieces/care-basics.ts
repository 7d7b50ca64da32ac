// The care basics printed on a drawer card and shown on the studio's piece page, chosen by the finish
// classes in the piece's stack and by where it stands (indoors or outdoors). Plain words, no numbers
// the care engine computes (its schedule gives dates). Cautions come from the one catalogue
// (lib/care/cautions). Pure: no server-only import, so owner pages and e-mails may use it too.
import { cautionsFor } from "@/lib/care/cautions";
import { OIL_FINISH_CLASSES, TASK_KIND_BY_FINISH_CLASS, type FinishClass, type ResinKind, type Use } from "@/lib/care/vocabulary";
import { INDOOR_PLACEMENT, OUTDOOR_PLACEMENT } from "@/lib/owner/care-guide";

export const CLASS_BASICS: Record<FinishClass, string> = {
  hardwax_oil: "Oiled surface: wipe with a damp cloth and a little mild soap, then dry. Lift spills at once. Re-oil when water stops beading.",
  ceramic_topcoat: "Topcoat over oil: clean with a damp cloth; no scouring pads or strong solvents. Refresh the topcoat when the sheen wears dull.",
  paste_wax: "Waxed surface: dust with a soft dry cloth and wipe spills straight away. Re-wax when the surface looks dry.",
  film_finish: "Film finish: damp cloth and mild soap; no silicone polishes. Look for worn spots once a year.",
  epoxy_surface: "Resin surface: soft cloth and mild soap; no abrasive cleaners. Fine scratches polish out.",
  charred_oiled: "Charred and oiled surface: brush off dust, rinse with plain water. Re-oil when the char looks grey and dry.",
};

export type CareBasics = { basics: string[]; cautions: string[]; hasOil: boolean };

/** The basics and cautions for a stack's finish classes, the piece's resin and where it stands. */
export function careBasics(classes: readonly FinishClass[], resin: ResinKind = "none", use?: Use): CareBasics {
  const unique = [...new Set(classes)];
  const hasOil = unique.some((c) => OIL_FINISH_CLASSES.includes(c));
  const hasResin = resin !== "none" || unique.includes("epoxy_surface");
  const placement = use === "outdoor_covered" ? OUTDOOR_PLACEMENT : INDOOR_PLACEMENT;
  const basics = [...unique.map((c) => CLASS_BASICS[c]), ...placement];
  const tasks = [...unique.map((c) => TASK_KIND_BY_FINISH_CLASS[c]), "annual_check" as const];
  const cautions = cautionsFor({ tasks, hasResin, audience: "owner" }).map((c) => c.short);
  return { basics, cautions, hasOil };
}
