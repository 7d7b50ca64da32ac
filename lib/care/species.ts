// Furniture woods with their published shrinkage and dimensional-change figures.
// Shrinkage: USDA FPL *Wood Handbook*, FPL-GTR-190 (2010), Table 4-3, green to oven-dry, % of green
// dimension (radial, tangential, volumetric).
// Coefficients: FPL-GTR-190 (2010), Table 13-5 "Coefficients for dimensional change due to shrinking or
// swelling within moisture content limits of 6% to 14%", per 1 % MC change (radial C_R, tangential C_T).
// The engine moves wood with ONE figure per direction, the shrinkage S (Eq. 13-3, lib/care/shrinkage.ts);
// the coefficient it reports is the slope of Eq. 13-3 at 10 % MC, which is how Table 13-5 follows from
// Table 4-3. Per row:
//   - Table 4-3 as printed: S is that row; the printed Table 13-5 row is kept
//     beside it as a cross-check (tests/reference/movement-wood-handbook.test.ts).
//   - only Table 13-5 printed: S is derived from the printed coefficients, S = 3000·C / (1 + 20·C).
//   - a value not among the printed sources in lib/care/SOURCES.md is marked "from memory" here, in SOURCES.md and in the test.
// Where the two printed rows describe different woods (the oaks), the larger-moving one is used.
import { coefficientFromShrinkage, shrinkageFromCoefficient } from "./shrinkage";

export interface Species {
  id: string;
  commonName: string;
  botanicalName: string;
  /** Other names a studio uses for exactly this wood, e.g. "hard maple". Ambiguous trade names are in TRADE_NAMES. */
  aliases: readonly string[];
  /** Green to oven-dry shrinkage, %: what the engine moves the wood with (Eq. 13-3). */
  shrinkageRadialPct: number;
  shrinkageTangentialPct: number;
  /** Volumetric shrinkage, % (Table 4-3), or null where it was not printed for this row. */
  shrinkageVolumetricPct: number | null;
  shrinkageSource: string;
  /** Per 1 % MC: the slope of Eq. 13-3 at 10 % MC from the shrinkage above (equals Table 13-5 where the rows agree). */
  radialCoefficient: number;
  tangentialCoefficient: number;
  /** Table 13-5 as printed (or recalled), kept for the cross-check; null where the table has no row used here. */
  table13_5: { radial: number; tangential: number; source: string } | null;
  note?: string;
}

const T135 = "Wood Handbook FPL-GTR-190 (2010), Table 13-5";
const T43 = "Wood Handbook FPL-GTR-190 (2010), Table 4-3";
const FROM_MEMORY = " — from memory, not re-read";

type Opts = { aliases?: string[]; note?: string; table13_5FromMemory?: boolean };

function build(
  id: string,
  commonName: string,
  botanicalName: string,
  [sr, st, sv]: [number, number, number | null],
  shrinkageSource: string,
  printed: [number, number] | null,
  opts: Opts,
): Species {
  return {
    id,
    commonName,
    botanicalName,
    aliases: opts.aliases ?? [],
    shrinkageRadialPct: sr,
    shrinkageTangentialPct: st,
    shrinkageVolumetricPct: sv,
    shrinkageSource,
    radialCoefficient: coefficientFromShrinkage(sr),
    tangentialCoefficient: coefficientFromShrinkage(st),
    table13_5: printed ? { radial: printed[0], tangential: printed[1], source: T135 + (opts.table13_5FromMemory ? FROM_MEMORY : "") } : null,
    ...(opts.note ? { note: opts.note } : {}),
  };
}

/** A row whose shrinkage is Table 4-3 (printed, or from memory when `fromMemory`). */
function fromTable43(
  id: string,
  commonName: string,
  botanicalName: string,
  shrinkage: [number, number, number],
  printed: [number, number] | null,
  opts: Opts & { fromMemory?: boolean } = {},
): Species {
  return build(id, commonName, botanicalName, shrinkage, T43 + (opts.fromMemory ? FROM_MEMORY : ""), printed, opts);
}

/** A row with only Table 13-5 printed: S from the coefficients (slope of Eq. 13-3 at 10 % MC). */
function fromTable135(id: string, commonName: string, botanicalName: string, [cr, ct]: [number, number], opts: Opts = {}): Species {
  const source = `derived from ${T135} (${cr} / ${ct}) as S = 3000·C / (1 + 20·C)` + (opts.table13_5FromMemory ? FROM_MEMORY : "");
  return build(id, commonName, botanicalName, [shrinkageFromCoefficient(cr), shrinkageFromCoefficient(ct), null], source, [cr, ct], opts);
}

export const SPECIES: readonly Species[] = [
  fromTable43("black_walnut", "Black walnut", "Juglans nigra", [5.5, 7.8, 12.8], [0.0019, 0.00274], { aliases: ["walnut", "American walnut"] }),
  fromTable43("white_oak", "White oak", "Quercus alba", [5.6, 10.5, 16.3], [0.0018, 0.00365], {
    aliases: ["American white oak"],
    note: "Table 13-5's commercial white oak (0.00180 / 0.00365) implies less shrinkage (5.2 / 10.2 %) than Table 4-3's white oak; the larger-moving Table 4-3 row is used",
  }),
  fromTable135("red_oak", "Red oak (commercial)", "Quercus spp. (red oak group)", [0.00158, 0.00369], {
    aliases: ["American red oak"],
    // Northern red oak alone: Table 4-3 4.0 / 8.6 % (from memory). Notes reach the claim page's reasons, so
    // source labels stay here in code.
    note: "commercial red oak of Table 13-5; northern red oak alone shrinks less, so the larger-moving group figure is used",
  }),
  fromTable135("sugar_maple", "Sugar maple", "Acer saccharum", [0.00165, 0.00353], { aliases: ["hard maple", "rock maple"] }),
  fromTable135("red_maple", "Red maple", "Acer rubrum", [0.00137, 0.00289], {
    aliases: ["soft maple", "spalted maple"],
    note: "used for spalted maple: spalting is a fungal colouring of (usually soft) maple; the handbook gives sound-wood figures only",
  }),
  fromTable43("black_cherry", "Black cherry", "Prunus serotina", [3.7, 7.1, 11.5], [0.00126, 0.00248], { aliases: ["cherry", "American cherry"] }),
  fromTable43("white_ash", "White ash", "Fraxinus americana", [4.9, 7.8, 13.3], [0.00169, 0.00274], { aliases: ["ash"] }),
  fromTable135("black_ash", "Black ash", "Fraxinus nigra", [0.00172, 0.00274]),
  fromTable43("american_beech", "American beech", "Fagus grandifolia", [5.5, 11.9, 17.2], [0.0019, 0.00431], { aliases: ["beech"] }),
  fromTable43("yellow_birch", "Yellow birch", "Betula alleghaniensis", [7.3, 9.5, 16.8], [0.00256, 0.00338], { aliases: ["birch"] }),
  fromTable43("american_basswood", "American basswood", "Tilia americana", [6.6, 9.3, 15.8], [0.0023, 0.0033], { aliases: ["basswood", "linden"] }),
  fromTable43("butternut", "Butternut", "Juglans cinerea", [3.4, 6.4, 10.6], [0.00116, 0.00223], { aliases: ["white walnut"] }),
  fromTable43("american_elm", "American elm", "Ulmus americana", [4.2, 9.5, 14.6], [0.00144, 0.00338], { aliases: ["elm"] }),
  fromTable43("sweetgum", "Sweetgum", "Liquidambar styraciflua", [5.3, 10.2, 15.8], [0.00183, 0.00365], { aliases: ["red gum"] }),
  fromTable43("american_sycamore", "American sycamore", "Platanus occidentalis", [5.0, 8.4, 14.1], [0.00172, 0.00296], { aliases: ["sycamore"] }),
  fromTable43("red_alder", "Red alder", "Alnus rubra", [4.4, 7.3, 12.6], [0.00151, 0.00256], { aliases: ["alder"] }),
  fromTable43("pecan_hickory", "Pecan hickory", "Carya illinoinensis", [4.9, 8.9, 13.6], [0.00169, 0.00315], { aliases: ["pecan"] }),
  fromTable135("true_hickory", "Hickory (true hickories)", "Carya spp. (shagbark, shellbark, mockernut, pignut)", [0.00259, 0.00411], {
    aliases: ["shagbark hickory", "shellbark hickory", "mockernut hickory", "pignut hickory"],
    table13_5FromMemory: true,
    note: "true hickories move about 30 % more across the grain than pecan hickory",
  }),
  fromTable43("yellow_poplar", "Yellow-poplar", "Liriodendron tulipifera", [4.6, 8.2, 12.7], [0.00158, 0.00289], {
    aliases: ["tulip poplar", "tulip tree", "American tulipwood"],
    table13_5FromMemory: true,
  }),
  fromTable43("yellow_buckeye", "Yellow buckeye", "Aesculus flava (A. octandra)", [3.6, 8.1, 12.5], [0.00123, 0.00285], {
    aliases: ["burl of buckeye", "buckeye"],
    note: "used for burl tops of buckeye, whose grain is irregular, so the flat-sawn (tangential) figure is an upper estimate",
  }),
  fromTable43("western_redcedar", "Western redcedar", "Thuja plicata", [2.4, 5.0, 6.8], null, {
    aliases: ["western red cedar"],
    fromMemory: true, // for outdoor benches; not among the sources listed in lib/care/SOURCES.md, so this row is from memory
  }),
  fromTable43("eastern_redcedar", "Eastern redcedar", "Juniperus virginiana", [3.1, 4.7, 7.8], null, {
    aliases: ["eastern red cedar", "aromatic cedar"],
    fromMemory: true, // not among the sources listed in lib/care/SOURCES.md, so this row is from memory
  }),
];

const BY_ID = new Map(SPECIES.map((s) => [s.id, s]));

export function getSpecies(id: string): Species | undefined {
  return BY_ID.get(id);
}

/**
 * `readAs`: read as that species, saying so in `note`; where a form can ask instead (a CSV row, which
 * cannot show a note), `pick` names the choices and the question. `ask`: the user must pick.
 */
type TradeName = { readAs: string; note: string; pick?: { choices: readonly string[]; question: string } } | { ask: readonly string[]; question: string };

/**
 * Trade names that hide a bigger-moving wood. Either the name is read as the larger-moving species and
 * the result says so (`readAs` + `note`), or the user must pick (`ask`). Words for staff; no sources.
 */
export const TRADE_NAMES: Readonly<Record<string, TradeName>> = {
  hickory: {
    readAs: "true_hickory",
    note: "“Hickory” was read as true hickory, which moves about 30 % more across the grain than pecan hickory. Pick pecan hickory if the wood is pecan.",
    pick: {
      choices: ["true_hickory", "pecan_hickory"],
      question: "“Hickory” can mean a true hickory (shagbark, shellbark, mockernut, pignut) or pecan hickory; true hickories move about 30 % more across the grain. Which one is it?",
    },
  },
  "northern red oak": {
    readAs: "red_oak",
    note: "Northern red oak was read as commercial red oak, whose published figures move a little more; the estimate errs on the side of more movement.",
  },
  "red cedar": {
    ask: ["western_redcedar", "eastern_redcedar"],
    question: "“Red cedar” can mean western redcedar or eastern redcedar, which move differently. Which one is it?",
  },
  redcedar: {
    ask: ["western_redcedar", "eastern_redcedar"],
    question: "“Redcedar” can mean western redcedar or eastern redcedar, which move differently. Which one is it?",
  },
  cedar: {
    ask: ["western_redcedar", "eastern_redcedar"],
    question: "“Cedar” names several woods that move differently. Which one is it? If it is none of these, pick the closest and note it on the piece.",
  },
  poplar: {
    ask: ["yellow_poplar"],
    question:
      "In the US “poplar” means yellow-poplar (tulip tree); elsewhere it usually means a true poplar or aspen, which is not in the list. Pick yellow-poplar only if that is the wood.",
  },
  tulipwood: {
    ask: ["yellow_poplar"],
    question:
      "“Tulipwood” is yellow-poplar in the UK trade, but elsewhere it names a Brazilian rosewood, which is not in the list. Pick yellow-poplar only if that is the wood.",
  },
};

export type SpeciesMatch =
  | { status: "found"; species: Species; note?: string; pick?: { candidates: Species[]; question: string } }
  | { status: "ambiguous"; candidates: Species[]; question: string }
  | { status: "unknown" };

const key = (s: string) => s.toLowerCase().replace(/[\s_-]+/g, "");
const TRADE_BY_KEY = new Map(Object.entries(TRADE_NAMES).map(([name, v]) => [key(name), v]));

/**
 * A species from an id, common name or alias, ignoring case, spaces, hyphens and underscores. An
 * ambiguous trade name gives the larger-moving species with a note to show, or the candidates to pick from.
 */
export function resolveSpecies(nameOrId: string): SpeciesMatch {
  const k = key(nameOrId);
  const direct = SPECIES.find((s) => key(s.id) === k || key(s.commonName) === k || s.aliases.some((a) => key(a) === k));
  if (direct) return { status: "found", species: direct };
  const trade = TRADE_BY_KEY.get(k);
  if (!trade) return { status: "unknown" };
  if ("readAs" in trade) {
    const pick = trade.pick ? { candidates: trade.pick.choices.map((id) => BY_ID.get(id)!), question: trade.pick.question } : undefined;
    return { status: "found", species: BY_ID.get(trade.readAs)!, note: trade.note, ...(pick ? { pick } : {}) };
  }
  return { status: "ambiguous", candidates: trade.ask.map((id) => BY_ID.get(id)!), question: trade.question };
}

/** The species a name clearly means (an ambiguous name gives undefined: ask the user to pick). */
export function findSpecies(nameOrId: string): Species | undefined {
  const m = resolveSpecies(nameOrId);
  return m.status === "found" ? m.species : undefined;
}
