// The care guide an owner reads for one piece: written for the classes in its finish stack, with the
// product quantity for this top from the care engine (productNeeded) and the cautions that apply.
// Pure: no database, no server-only import (the certificate PDF and tests use it too).
import { topArea, type TopShape } from "@/lib/care/area";
import { CARE_GUIDE_CLIMATE } from "@/lib/care/coverage";
import { CareInputError } from "@/lib/care/errors";
import { productNeeded } from "@/lib/care/quantity";
import type { CatalogEntry } from "@/lib/care/schedule";
import { CARE_TASK_LABELS, FINISH_CLASS_LABELS, OIL_FINISH_CLASSES, TASK_KIND_BY_FINISH_CLASS, type FinishClass, type ResinKind, type Surface } from "@/lib/care/vocabulary";
import { formatArea, formatVolume, type UnitSystem } from "./format";

type ClassGuide = {
  everyday: string[];
  steps: string[];
  use: string[];
  avoid: string[];
  /** Whether an owner applies a product at home for this class (ventilation and label cautions apply). */
  appliedAtHome: boolean;
};

// Written by us for Grainward; each step defers to the product's own label where it gives times.
const GUIDES: Record<FinishClass, ClassGuide> = {
  hardwax_oil: {
    everyday: [
      "Wipe spills soon with a damp, well-wrung cloth, then dry the spot.",
      "For grease, use a little mild, pH-neutral soap in water; rinse the cloth and wipe again.",
    ],
    steps: [
      "Clean the surface (mild soap, then clear water) and let it dry completely — overnight is best.",
      "If the label asks for it, scuff dull or rough spots lightly with a fine non-woven pad, with the grain.",
      "Put a small amount of oil on a lint-free cloth and work a thin coat into the wood, with the grain.",
      "After the time the label gives, wipe off every bit of oil the wood has not taken up: no wet sheen should stay.",
      "Let it cure as long as the label says before mats, cloths or water go back on it.",
    ],
    use: ["The same hardwax oil as the layer below (named in the finish stack)", "Lint-free cotton cloths", "A fine non-woven pad"],
    avoid: ["Silicone or wax furniture sprays", "Cleaners with ammonia, bleach or solvents", "Thick coats (they stay tacky)", "Water left standing on the top"],
    appliedAtHome: true,
  },
  ceramic_topcoat: {
    everyday: ["Wipe with a damp cloth; for grease use a pH-neutral cleaner.", "Dry the surface after cleaning."],
    steps: [
      "Clean and degrease the top as the topcoat's label says, and let it dry fully.",
      "Apply a thin, even coat with the applicator the label names, in small sections.",
      "Buff or level it within the time the label gives.",
      "Keep water and objects off it for the cure time on the label.",
    ],
    use: ["The same ceramic-type topcoat as the layer in the finish stack", "Its applicator and clean, lint-free cloths"],
    avoid: ["Scouring pads and abrasive creams", "Oil soaps, waxes and silicone polishes (the topcoat will not bond over them)", "Hot pans and dishes straight on the top"],
    appliedAtHome: true,
  },
  paste_wax: {
    everyday: ["Dust with a soft, dry cloth.", "Wipe marks with a barely damp cloth and dry straight away."],
    steps: [
      "Dust and clean the surface; let it dry.",
      "Rub a thin layer of wax on with a soft cloth, one small area at a time.",
      "Let it haze over (the label gives the time), then buff with a clean cloth until it no longer smears.",
      "Two thin coats wear better than one thick one.",
    ],
    use: ["Clear paste wax (as in the finish stack)", "Two soft cotton cloths: one to apply, one to buff"],
    avoid: ["Alcohol and hand sanitiser (they dissolve wax)", "Hot mugs and dishes without a mat (white rings)", "Silicone sprays", "Standing water"],
    appliedAtHome: true,
  },
  film_finish: {
    everyday: ["Wipe with a damp cloth and a little mild soap; dry afterwards.", "Use boards for cutting and mats under hot things."],
    steps: [
      "In good light, look along the surface from a low angle for dull wear paths, scratches through to bare wood, white marks and cracks.",
      "Check the edges, corners and any cut-outs (around a sink or hob) where water can get under the film.",
      "A film finish is not recoated at home: if you find bare wood, lifting or cracks, log what you saw and tell the studio.",
    ],
    use: ["A soft cloth and mild soap", "A torch or a low lamp to look across the surface"],
    avoid: ["Abrasive cleaners and scouring pads", "Ammonia-based glass cleaners", "Cutting straight on the surface", "Water left at seams and cut-outs"],
    appliedAtHome: false,
  },
  epoxy_surface: {
    everyday: ["Wipe with a soft, damp cloth; mild soap for grease.", "Dry it so water spots do not form."],
    steps: [
      "Clean the resin and let it dry.",
      "Put a small amount of the polishing compound on a soft pad and polish in small circles, a section at a time.",
      "Wipe the residue off with a clean cloth.",
      "Look for clouding, yellowing, deep scratches and any gap where resin meets wood; log what you see and tell the studio about gaps.",
    ],
    use: ["The resin polishing compound named in the finish stack", "Soft foam or microfibre pads"],
    avoid: ["Hot pots, pans and dishes on the resin (use trivets)", "Solvents such as acetone", "Abrasive pads", "Long hours of direct sun on the resin"],
    appliedAtHome: true,
  },
  charred_oiled: {
    everyday: ["Brush off dust and leaves with a soft brush.", "Rinse with plain water only if it needs it; do not scrub the char."],
    steps: [
      "Choose a dry spell: the wood should have been dry for a couple of days.",
      "Brush off loose char gently, with the grain, with a soft brush.",
      "Apply a thin coat of the exterior oil with a brush or cloth.",
      "Wipe off what has not soaked in after the time on the label, and let it cure under cover.",
    ],
    use: ["The exterior oil named in the finish stack", "A soft brush", "Lint-free cloths"],
    avoid: ["Pressure washers and wire brushes (they strip the char)", "Standing it on grass or in puddles", "Stiff scrubbing"],
    appliedAtHome: true,
  },
};

export type GuideSection = {
  finishClass: FinishClass;
  title: string;
  surfaces: Surface[];
  task: string;
  everyday: string[];
  steps: string[];
  use: string[];
  avoid: string[];
  /** How much product one refresh coat of this top needs, from productNeeded; null with the reason when it cannot be said. */
  quantity: { text: string; reasons: string[] } | { text: null; why: string };
};

export type Caution = { key: "oily_rags" | "ventilation" | "safety_data_sheet" | "hot_cookware" | "manufacturer"; title: string; text: string };

export type CareGuide = { sections: GuideSection[]; annualCheck: string[]; cautions: Caution[] };

export type GuideLayer = { surface: Surface; finishClass: FinishClass; productId: string | null; productLabel: string; appliedOn: string };

export const CAUTION_TEXT: Record<Caution["key"], Omit<Caution, "key">> = {
  oily_rags: {
    title: "Oily rags can catch fire by themselves",
    text:
      "Cloths and pads soaked with oil heat up as the oil dries and can ignite on their own within hours. Never pile them up or drop them in a bin. " +
      "Dry them spread out flat outdoors, away from the house, or keep them in a closed metal can filled with water — then ask your local waste service how to get rid of them. " +
      "(NFPA tip sheet “Safety with oily rags”.)",
  },
  ventilation: {
    title: "Ventilate while you work",
    text: "Open windows and keep air moving while you apply a finish and while it cures. Keep flames, heaters and sparks away from the products and the rags.",
  },
  safety_data_sheet: {
    title: "Read the label and safety data sheet first",
    text: "Follow the product's label and its safety data sheet, including the gloves and eye protection they call for. Keep products away from children and pets.",
  },
  hot_cookware: {
    title: "Keep hot cookware off the resin",
    text: "Resin can soften, mark or cloud with heat. Put hot pots, pans and dishes on trivets or mats, never straight on the top.",
  },
  manufacturer: {
    title: "The manufacturer's instructions come first",
    text: "Where this guide and a product's own instructions differ, follow the manufacturer. If you are unsure, ask the studio before you start.",
  },
};

/** The care guide of one piece from its finish stack (newest layer per surface group and class). */
export function buildCareGuide(input: {
  layers: readonly GuideLayer[];
  shape: TopShape | undefined;
  resin: ResinKind;
  catalog: readonly CatalogEntry[];
  units: UnitSystem;
}): CareGuide {
  const { layers, shape, resin, catalog, units } = input;
  const classes = new Map<FinishClass, GuideLayer[]>();
  for (const l of layers) classes.set(l.finishClass, [...(classes.get(l.finishClass) ?? []), l]);
  // Oil under a ceramic-type topcoat on the same surface is cared for through the topcoat.
  const topcoatSurfaces = new Set((classes.get("ceramic_topcoat") ?? []).map((l) => group(l.surface)));
  const sections: GuideSection[] = [];
  for (const [finishClass, ls] of classes) {
    const shown = finishClass === "hardwax_oil" ? ls.filter((l) => !topcoatSurfaces.has(group(l.surface))) : ls;
    if (shown.length === 0) continue;
    const g = GUIDES[finishClass];
    const surfaces = [...new Set(shown.map((l) => l.surface))];
    const onTop = shown.filter((l) => group(l.surface) === "top").sort((a, b) => (a.appliedOn < b.appliedOn ? 1 : -1));
    sections.push({
      finishClass,
      title: FINISH_CLASS_LABELS[finishClass],
      surfaces,
      task: CARE_TASK_LABELS[TASK_KIND_BY_FINISH_CLASS[finishClass]],
      everyday: g.everyday,
      steps: g.steps,
      use: g.use.map((u) => (shown[0]?.productLabel && u.includes("named in the finish stack") ? `${u}: ${shown[0].productLabel}` : u)),
      avoid: g.avoid,
      quantity: quantityFor(finishClass, onTop[0], shape, catalog, units),
    });
  }
  const order = ["hardwax_oil", "ceramic_topcoat", "paste_wax", "film_finish", "epoxy_surface", "charred_oiled"];
  sections.sort((a, b) => order.indexOf(a.finishClass) - order.indexOf(b.finishClass));

  const annualCheck = [
    "Clean the whole piece, then look over the top, edges and base in good light.",
    "Check that the base and its fixings are tight and the piece stands without rocking.",
    "Look for new cracks, open gaps along the grain, and — on resin pieces — any gap where resin meets wood.",
    `Check the room's humidity if you can: wood is happiest at ${CARE_GUIDE_CLIMATE.rhMinPct}–${CARE_GUIDE_CLIMATE.rhMaxPct} % relative humidity, changing no more than about ${CARE_GUIDE_CLIMATE.maxDailyRhChangePct} % in a day.`,
    "Log the check here — it restarts the yearly clock — and tell the studio about anything that worries you.",
  ];

  const cautions: Caution[] = [];
  const classList = [...classes.keys()];
  if (classList.some((c) => OIL_FINISH_CLASSES.includes(c))) cautions.push({ key: "oily_rags", ...CAUTION_TEXT.oily_rags });
  if (classList.some((c) => GUIDES[c].appliedAtHome)) cautions.push({ key: "ventilation", ...CAUTION_TEXT.ventilation });
  cautions.push({ key: "safety_data_sheet", ...CAUTION_TEXT.safety_data_sheet });
  if (resin !== "none" || classList.includes("epoxy_surface")) cautions.push({ key: "hot_cookware", ...CAUTION_TEXT.hot_cookware });
  cautions.push({ key: "manufacturer", ...CAUTION_TEXT.manufacturer });
  return { sections, annualCheck, cautions };
}

function group(s: Surface): "top" | "base" {
  return s === "base" ? "base" : "top";
}

function quantityFor(
  finishClass: FinishClass,
  layer: GuideLayer | undefined,
  shape: TopShape | undefined,
  catalog: readonly CatalogEntry[],
  units: UnitSystem,
): GuideSection["quantity"] {
  if (finishClass === "film_finish") return { text: null, why: "A film finish is inspected, not recoated at home." };
  if (!layer) return { text: null, why: "This finish is on the base only; its area is not recorded." };
  if (!shape) return { text: null, why: "The top's size is not in the piece record." };
  const product = catalog.find((c) => c.id === layer.productId && c.finishClass === finishClass) ?? catalog.find((c) => c.finishClass === finishClass);
  if (!product) return { text: null, why: "The studio has not recorded this product's coverage." };
  try {
    const area = topArea(shape);
    const coats = product.refreshCoats ?? 1;
    const need = productNeeded({ areaM2: area.m2, coats, coverageM2PerL: product.coverageM2PerL, containerSizesMl: product.containerSizesMl });
    const containers = need.containers.length
      ? `; that is ${need.containers.map((c) => `${c.count} × ${formatVolume(c.sizeMl, units)}`).join(" + ")} container${need.containers.reduce((n, c) => n + c.count, 0) === 1 ? "" : "s"}`
      : "";
    return {
      text: `About ${formatVolume(need.ml, units)} for ${coats} coat${coats === 1 ? "" : "s"} on this ${formatArea(area.m2, units)} top${containers}.`,
      reasons: need.reasons,
    };
  } catch (e) {
    if (e instanceof CareInputError) return { text: null, why: "The top's size in the record can't be used for a quantity." };
    throw e;
  }
}
