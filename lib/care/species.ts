// Furniture woods with their published dimensional-change and shrinkage figures.
// Coefficients: USDA FPL *Wood Handbook*, FPL-GTR-190 (2010), Table 13-5 "Coefficients for dimensional
// change due to shrinking or swelling within moisture content limits of 6% to 14%" — change in
// dimension per 1 % change in moisture content, radial C_R and tangential C_T.
// Shrinkage: FPL-GTR-190 (2010), Table 4-3, green to oven-dry, % of green dimension.
// Values were read from ../shared/REFERENCES.md; the ones marked "from memory" were not.

export interface Species {
  id: string;
  commonName: string;
  botanicalName: string;
  /** Other names a studio uses, e.g. "hard maple". */
  aliases: readonly string[];
  /** Per 1 % MC change, valid 6–14 % MC (Table 13-5). */
  radialCoefficient: number;
  tangentialCoefficient: number;
  coefficientSource: string;
  /** Green to oven-dry shrinkage, % (Table 4-3). */
  shrinkageRadialPct: number;
  shrinkageTangentialPct: number;
  shrinkageVolumetricPct: number;
  shrinkageSource: string;
  note?: string;
}

const T135 = "Wood Handbook FPL-GTR-190 (2010), Table 13-5";
const T43 = "Wood Handbook FPL-GTR-190 (2010), Table 4-3";
const FROM_MEMORY = " — from memory, not re-read";

function row(
  id: string,
  commonName: string,
  botanicalName: string,
  [cr, ct]: [number, number],
  [sr, st, sv]: [number, number, number],
  opts: { aliases?: string[]; coefficientFromMemory?: boolean; shrinkageFromMemory?: boolean; note?: string } = {},
): Species {
  return {
    id,
    commonName,
    botanicalName,
    aliases: opts.aliases ?? [],
    radialCoefficient: cr,
    tangentialCoefficient: ct,
    coefficientSource: T135 + (opts.coefficientFromMemory ? FROM_MEMORY : ""),
    shrinkageRadialPct: sr,
    shrinkageTangentialPct: st,
    shrinkageVolumetricPct: sv,
    shrinkageSource: T43 + (opts.shrinkageFromMemory ? FROM_MEMORY : ""),
    ...(opts.note ? { note: opts.note } : {}),
  };
}

export const SPECIES: readonly Species[] = [
  row("black_walnut", "Black walnut", "Juglans nigra", [0.0019, 0.00274], [5.5, 7.8, 12.8], { aliases: ["walnut", "American walnut"] }),
  row("white_oak", "White oak (commercial)", "Quercus spp. (white oak group)", [0.0018, 0.00365], [5.6, 10.5, 16.3], { aliases: ["white oak"] }),
  row("red_oak", "Red oak (commercial)", "Quercus spp. (red oak group)", [0.00158, 0.00369], [4.0, 8.6, 13.7], {
    aliases: ["red oak", "northern red oak"],
    shrinkageFromMemory: true,
    note: "shrinkage row is northern red oak (Quercus rubra)",
  }),
  row("sugar_maple", "Sugar maple", "Acer saccharum", [0.00165, 0.00353], [4.8, 9.9, 14.7], { aliases: ["hard maple", "rock maple"], shrinkageFromMemory: true }),
  row("red_maple", "Red maple", "Acer rubrum", [0.00137, 0.00289], [4.0, 8.2, 12.6], {
    aliases: ["soft maple", "spalted maple"],
    shrinkageFromMemory: true,
    note: "used for spalted maple: spalting is a fungal colouring of (usually soft) maple; the handbook gives sound-wood figures only",
  }),
  row("black_cherry", "Black cherry", "Prunus serotina", [0.00126, 0.00248], [3.7, 7.1, 11.5], { aliases: ["cherry", "American cherry"] }),
  row("white_ash", "White ash", "Fraxinus americana", [0.00169, 0.00274], [4.9, 7.8, 13.3], { aliases: ["ash"] }),
  row("black_ash", "Black ash", "Fraxinus nigra", [0.00172, 0.00274], [5.0, 7.8, 15.2], { shrinkageFromMemory: true }),
  row("american_beech", "American beech", "Fagus grandifolia", [0.0019, 0.00431], [5.5, 11.9, 17.2], { aliases: ["beech"] }),
  row("yellow_birch", "Yellow birch", "Betula alleghaniensis", [0.00256, 0.00338], [7.3, 9.5, 16.8], { aliases: ["birch"] }),
  row("american_basswood", "American basswood", "Tilia americana", [0.0023, 0.0033], [6.6, 9.3, 15.8], { aliases: ["basswood", "linden"] }),
  row("butternut", "Butternut", "Juglans cinerea", [0.00116, 0.00223], [3.4, 6.4, 10.6], { aliases: ["white walnut"] }),
  row("american_elm", "American elm", "Ulmus americana", [0.00144, 0.00338], [4.2, 9.5, 14.6], { aliases: ["elm"] }),
  row("sweetgum", "Sweetgum", "Liquidambar styraciflua", [0.00183, 0.00365], [5.3, 10.2, 15.8], { aliases: ["red gum"] }),
  row("american_sycamore", "American sycamore", "Platanus occidentalis", [0.00172, 0.00296], [5.0, 8.4, 14.1], { aliases: ["sycamore"] }),
  row("red_alder", "Red alder", "Alnus rubra", [0.00151, 0.00256], [4.4, 7.3, 12.6], { aliases: ["alder"] }),
  row("pecan_hickory", "Pecan hickory", "Carya illinoinensis", [0.00169, 0.00315], [4.9, 8.9, 13.6], { aliases: ["pecan", "hickory"] }),
  row("yellow_poplar", "Yellow-poplar", "Liriodendron tulipifera", [0.00158, 0.00289], [4.6, 8.2, 12.7], {
    aliases: ["tulipwood", "poplar"],
    coefficientFromMemory: true,
  }),
  row("yellow_buckeye", "Yellow buckeye", "Aesculus flava (A. octandra)", [0.00123, 0.00285], [3.6, 8.1, 12.5], {
    aliases: ["burl of buckeye", "buckeye"],
    note: "used for burl tops of buckeye, whose grain is irregular, so the flat-sawn (tangential) figure is an upper estimate",
  }),
  row("western_redcedar", "Western redcedar", "Thuja plicata", [0.00111, 0.00234], [2.4, 5.0, 6.8], {
    aliases: ["cedar", "red cedar"],
    coefficientFromMemory: true,
    shrinkageFromMemory: true,
    note: "for outdoor benches; not in REFERENCES.md — every figure of this row is from memory",
  }),
];

const BY_ID = new Map(SPECIES.map((s) => [s.id, s]));

export function getSpecies(id: string): Species | undefined {
  return BY_ID.get(id);
}

/** Finds a species by id, common name or alias, ignoring case, spaces, hyphens and underscores. */
export function findSpecies(nameOrId: string): Species | undefined {
  const key = (s: string) => s.toLowerCase().replace(/[\s_-]+/g, "");
  const k = key(nameOrId);
  return SPECIES.find((s) => key(s.id) === k || key(s.commonName) === k || s.aliases.some((a) => key(a) === k));
}
