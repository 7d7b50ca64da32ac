// Starting points a new studio can take in its set-up: warranty terms from a template of our own, and
// one finish-catalog entry per finish class. Both are marked for the studio to review: the template's
// page says "review before use", each catalog entry says its values are starting values to check
// against the maker's data sheet. No server-only import: pure data.
import type { WarrantyPolicy } from "@/lib/care/coverage";
import type { FinishClass } from "@/lib/care/vocabulary";

/** Our own starting terms (not any real studio's warranty); the studio reviews them before saving. */
export const WARRANTY_TEMPLATE: WarrantyPolicy = {
  version: "set-up template",
  lines: {
    crack_gap: {
      label: "Cracks and open joints",
      termMonths: 24,
      exclusions: ["heat", "impact", "outdoor_use_of_indoor_piece"],
      climateCheck: true,
      partlyCoveredPct: 50,
      transfersToNewOwner: true,
    },
    finish_wear: {
      label: "Finish worn through or marked by rings",
      termMonths: 12,
      exclusions: ["heat", "chemicals", "impact"],
      careLog: { graceDays: 90, onMissed: "partly_covered" },
      partlyCoveredPct: 50,
      transfersToNewOwner: false,
    },
    finish_peeling: {
      label: "Finish lifting or peeling",
      termMonths: 24,
      exclusions: ["heat", "chemicals", "outdoor_use_of_indoor_piece"],
      partlyCoveredPct: 50,
      transfersToNewOwner: true,
    },
    structural: {
      label: "Loose joints, legs or bases",
      termMonths: 60,
      exclusions: ["impact", "outdoor_use_of_indoor_piece"],
      partlyCoveredPct: 50,
      transfersToNewOwner: true,
    },
  },
};

/** What staff read on each starter entry (the first line of its notes). */
export const STARTER_NOTE = "Starting values — check against the maker's data sheet.";

type Starter = { name: string; finishClass: FinishClass; coverageM2PerL: number; safetyNotes: string };

// One entry per finish class. Coverage per coat: common practice, no published source (typical label
// figures, from memory); wear intervals and cure times stay empty so the care engine's class defaults
// apply (lib/care/intervals.ts, lib/care/cure.ts).
export const CATALOG_STARTERS: Starter[] = [
  {
    name: "Hardwax oil (starting values)",
    finishClass: "hardwax_oil",
    coverageM2PerL: 24,
    safetyNotes: "Oily rags can heat up and catch fire on their own: lay them flat outdoors to dry or keep them in a closed metal can of water. Ventilate while applying; follow the maker's instructions.",
  },
  {
    name: "Ceramic-type topcoat (starting values)",
    finishClass: "ceramic_topcoat",
    coverageM2PerL: 150,
    safetyNotes: "Wear gloves and ventilate while applying; follow the maker's instructions and safety data sheet.",
  },
  {
    name: "Paste wax (starting values)",
    finishClass: "paste_wax",
    coverageM2PerL: 20,
    safetyNotes: "Solvent fumes: ventilate, and keep rags away from heat; follow the maker's instructions.",
  },
  {
    name: "Film finish, varnish or lacquer (starting values)",
    finishClass: "film_finish",
    coverageM2PerL: 10,
    safetyNotes: "Fumes and flammable vapour: ventilate, no open flames, wear a respirator suited to the product; follow the maker's instructions and local codes.",
  },
  {
    name: "Epoxy surface polish (starting values)",
    finishClass: "epoxy_surface",
    coverageM2PerL: 30,
    safetyNotes: "Keep epoxy off skin (nitrile gloves) and keep hot pans off resin; follow the maker's instructions.",
  },
  {
    name: "Exterior oil for charred wood (starting values)",
    finishClass: "charred_oiled",
    coverageM2PerL: 12,
    safetyNotes: "Oily rags can heat up and catch fire on their own: dry them flat outdoors or keep them in a closed metal can of water; follow the maker's instructions.",
  },
];
