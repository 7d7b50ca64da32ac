// The care guide an owner reads for one piece: written for the classes in its finish stack and for
// where the piece stands (indoors or outdoors), with the product quantity for this top from the care
// engine (productNeeded), the cautions that fit its care (lib/care/cautions) and, while a fresh layer
// cures, until when to go gently (lib/care/cure).
// Pure: no database, no server-only import (the certificate PDF and tests use it too).
import { topArea, type TopShape } from "@/lib/care/area";
import { CARE_GUIDE_CLIMATE } from "@/lib/care/coverage";
import { CareInputError } from "@/lib/care/errors";
import { productNeeded } from "@/lib/care/quantity";
import type { CatalogEntry } from "@/lib/care/schedule";
import { cautionsFor, type Caution } from "@/lib/care/cautions";
import { curingLayers, type CureProduct, type CureWindow } from "@/lib/care/cure";
import { CARE_TASK_LABELS, FINISH_CLASS_LABELS, TASK_KIND_BY_FINISH_CLASS, type FinishClass, type ResinKind, type Surface, type Use } from "@/lib/care/vocabulary";
import { formatArea, formatDate, formatVolume, type UnitSystem } from "@/lib/format";

type ClassGuide = {
  everyday: string[];
  steps: string[];
  use: string[];
  avoid: string[];
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

export type { Caution } from "@/lib/care/cautions";

export type CareGuide = {
  sections: GuideSection[];
  /** Outdoor pieces get outdoor care; indoor pieces the room-climate advice. */
  outdoor: boolean;
  /** Everyday care for the whole piece where it stands (indoors: room climate; outdoors: rain, ground, winter). */
  placement: string[];
  annualCheck: string[];
  cautions: Caution[];
  /** Layers still curing today, in owner words; null when nothing is curing. */
  curing: CureAdvice | null;
};

export type GuideLayer = { surface: Surface; finishClass: FinishClass; productId: string | null; productLabel: string; appliedOn: string };

/** Indoor pieces: where the piece stands (the care guide's climate range). */
export const INDOOR_PLACEMENT = [
  `Keep the room between about ${CARE_GUIDE_CLIMATE.rhMinPct} and ${CARE_GUIDE_CLIMATE.rhMaxPct} % relative humidity, away from radiators, heater vents and fireplaces.`,
  "Use coasters and trivets; lift objects rather than sliding them.",
];

/** Outdoor pieces (covered): rain, ground, winter. Common practice, no published source. */
export const OUTDOOR_PLACEMENT = [
  "Keep it under its cover or roof, with its feet off wet grass and out of puddles; pads or blocks under the feet let the ends dry.",
  "After rain or a hosing, wipe off standing water and let it dry in the air.",
  "In winter, don't let snow or ice sit on it; a breathable cover is better than plastic sheeting.",
];

/** Lines of the class guides that only make sense indoors, with their outdoor replacement (or none). */
const OUTDOOR_SWAPS: Record<string, string | null> = {
  "Use boards for cutting and mats under hot things.": "Use boards for cutting and a mat under hot dishes from the grill.",
  "Hot mugs and dishes without a mat (white rings)": "Hot dishes without a mat (white rings)",
  "Ammonia-based glass cleaners": null,
};

function forPlace(lines: readonly string[], outdoor: boolean): string[] {
  if (!outdoor) return [...lines];
  return lines.flatMap((l) => (l in OUTDOOR_SWAPS ? (OUTDOOR_SWAPS[l] === null ? [] : [OUTDOOR_SWAPS[l]!]) : [l]));
}

/** The care guide of one piece from its finish stack (newest layer per surface group and class). */
export function buildCareGuide(input: {
  layers: readonly GuideLayer[];
  shape: TopShape | undefined;
  resin: ResinKind;
  use: Use;
  catalog: readonly CatalogEntry[];
  /** The studio's products with their label cure times (catalog rows). */
  cureProducts?: readonly CureProduct[];
  /** The owner's today, YYYY-MM-DD: layers applied within their cure time are still curing. */
  today: string;
  units: UnitSystem;
}): CareGuide {
  const { layers, shape, resin, catalog, units } = input;
  const outdoor = input.use === "outdoor_covered";
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
      everyday: forPlace(g.everyday, outdoor),
      steps: g.steps,
      use: g.use.map((u) => (shown[0]?.productLabel && u.includes("named in the finish stack") ? `${u}: ${shown[0].productLabel}` : u)),
      avoid: forPlace(g.avoid, outdoor),
      quantity: quantityFor(finishClass, onTop[0], shape, catalog, units),
    });
  }
  const order = ["hardwax_oil", "ceramic_topcoat", "paste_wax", "film_finish", "epoxy_surface", "charred_oiled"];
  sections.sort((a, b) => order.indexOf(a.finishClass) - order.indexOf(b.finishClass));

  const hasResin = resin !== "none" || classes.has("epoxy_surface");
  const annualCheck = [
    "Clean the whole piece, then look over the top, edges and base in good light.",
    "Check that the base and its fixings are tight and the piece stands without rocking.",
    hasResin
      ? "Look for new cracks, open gaps along the grain, and any gap where resin meets wood."
      : "Look for new cracks and open gaps along the grain.",
    outdoor
      ? "Look under the top and at the feet for grey, soft or dark wood where water has sat, and for loose fixings after the winter."
      : `Check the room's humidity if you can: wood is happiest at ${CARE_GUIDE_CLIMATE.rhMinPct}–${CARE_GUIDE_CLIMATE.rhMaxPct} % relative humidity, changing no more than about ${CARE_GUIDE_CLIMATE.maxDailyRhChangePct} % in a day.`,
    "Log the check here — it restarts the yearly clock — and tell the studio about anything that worries you.",
  ];

  const tasks = [...[...classes.keys()].map((c) => TASK_KIND_BY_FINISH_CLASS[c]), "annual_check" as const];
  const cautions = cautionsFor({ tasks, hasResin, audience: "owner" });
  const curing = cureAdvice(curingLayers(layers, input.cureProducts ?? [], input.today), input.today);
  return { sections, outdoor, placement: outdoor ? OUTDOOR_PLACEMENT : INDOOR_PLACEMENT, annualCheck, cautions, curing };
}

export type CureAdvice = {
  title: string;
  /** One line per curing finish, with its dates. */
  lines: string[];
  /** The date everything is fully cured. */
  fullUseOn: string;
  closing: string;
};

/**
 * A fresh layer in owner words: until when water and objects stay off, from when light use is fine,
 * from when the whole family can use it. Answers "it still feels tacky — when can the kids use it?".
 */
export function cureAdvice(windows: readonly CureWindow[], today: string): CureAdvice | null {
  if (windows.length === 0) return null;
  const lines = windows.map((w) => {
    const what = `${FINISH_CLASS_LABELS[w.finishClass]}${w.productName ? ` (${w.productName})` : ""}, put on ${formatDate(w.appliedOn)}`;
    const light =
      w.lightUseOn > today
        ? `keep water, mats, cloths and objects off it until ${formatDate(w.lightUseOn)}; from then light use is fine — set things down gently and wipe with a dry cloth`
        : "light use is fine now — set things down gently and wipe with a dry cloth";
    return `${what}: ${light}. From ${formatDate(w.fullUseOn)} it is fully cured: children, heavy dishes, and wiping with water and mild soap are all fine.`;
  });
  const fullUseOn = windows.map((w) => w.fullUseOn).sort().at(-1)!;
  return {
    title: `The new finish is still curing: full use from ${formatDate(fullUseOn)}`,
    lines,
    fullUseOn,
    closing: `A slightly tacky feel in the first days is normal while the finish hardens. If it still feels tacky after ${formatDate(fullUseOn)}, tell the studio.`,
  };
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
      text: `About ${formatVolume(need.exactMl, units)} for ${coats} coat${coats === 1 ? "" : "s"} on this ${formatArea(area.m2, units)} top${containers}.`,
      reasons: need.reasons,
    };
  } catch (e) {
    if (e instanceof CareInputError) return { text: null, why: "The top's size in the record can't be used for a quantity." };
    throw e;
  }
}
