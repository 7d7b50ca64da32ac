import { CareInputError, requirePositive } from "./errors";
import { ML_PER_US_FL_OZ, M2_PER_FT2 } from "./units";

export interface ProductNeededInput {
  areaM2: number;
  coats: number;
  /** Coverage of one coat, m² per litre. */
  coverageM2PerL: number;
  /** The studio's container sizes of this product, mL. */
  containerSizesMl?: readonly number[];
}

export interface ContainerCount {
  sizeMl: number;
  count: number;
}

export interface ProductNeeded {
  /** Product needed, mL, exact (area × coats ÷ coverage): what the engine computes with. */
  exactMl: number;
  /** The same in US fluid ounces, exact (1 US fl oz = 29.5735295625 mL, NIST HB 44 App. C / SP 811 App. B). */
  exactFlOz: number;
  /** For display only: exactMl rounded up once, to a whole mL (displayMl). */
  ml: number;
  /** For display only: exactFlOz rounded up once, to 0.1 US fl oz (displayFlOz) — from the exact amount, not from `ml`. */
  flOz: number;
  /** Containers to open: the combination of sizes with the least total volume that holds `ml` (ties: fewer containers). */
  containers: ContainerCount[];
  containersMl: number;
  reasons: string[];
}

/**
 * A ceramic-type topcoat covers about 2 ft² per mL (100 mL ≈ 200 ft²) — common practice, no published source.
 * In m²/L: 2 × 0.09290304 × 1000 = 185.80608.
 */
export const CERAMIC_TOPCOAT_COVERAGE_M2_PER_L = 2 * M2_PER_FT2 * 1000;

/**
 * Float noise allowed when rounding up: 100.00000000000001 mL is 100 mL, not 101. Far below any real
 * amount (1e-9 mL), so it never hides a genuine excess.
 */
const NOISE = 1e-9;
const ceilTo = (value: number, step: number) => Math.ceil(value / step - NOISE) * step;

/** An exact amount in mL as shown to people: rounded up, once, to a whole mL. */
export function displayMl(exactMl: number): number {
  return ceilTo(exactMl, 1);
}

/** An exact amount in mL as US fl oz for display: converted exactly, then rounded up, once, to 0.1 fl oz. */
export function displayFlOz(exactMl: number): number {
  return Math.round(ceilTo(exactMl / ML_PER_US_FL_OZ, 0.1) * 10) / 10;
}

/**
 * Product for a refresh: area × coats ÷ coverage (lib/care/SOURCES.md), kept exact; the containers to buy
 * are the whole containers that hold the exact amount; `ml` and `flOz` are its display roundings.
 */
export function productNeeded({ areaM2, coats, coverageM2PerL, containerSizesMl }: ProductNeededInput): ProductNeeded {
  requirePositive(areaM2, "areaM2");
  requirePositive(coverageM2PerL, "coverageM2PerL");
  if (!Number.isInteger(coats) || coats < 1) throw new CareInputError(`coats must be a whole number ≥ 1, got ${coats}`, "coats");
  const exactMl = ((areaM2 * coats) / coverageM2PerL) * 1000;
  const exactFlOz = exactMl / ML_PER_US_FL_OZ;
  const ml = displayMl(exactMl);
  const flOz = displayFlOz(exactMl);
  const reasons = [`${areaM2.toFixed(2)} m² × ${coats} coat${coats === 1 ? "" : "s"} ÷ ${coverageM2PerL} m²/L = about ${ml} mL (${flOz} US fl oz)`];
  let containers: ContainerCount[] = [];
  if (containerSizesMl && containerSizesMl.length > 0) {
    containerSizesMl.forEach((s, i) => {
      if (!Number.isInteger(s) || s <= 0) throw new CareInputError(`containerSizesMl[${i}] must be a whole number of mL > 0, got ${s}`, "containerSizesMl");
    });
    containers = cheapestCover(exactMl, [...new Set(containerSizesMl)].sort((a, b) => b - a));
    reasons.push(`containers: ${containers.map((c) => `${c.count} × ${c.sizeMl} mL`).join(" + ")}`);
  }
  return { exactMl, exactFlOz, ml, flOz, containers, containersMl: containers.reduce((t, c) => t + c.count * c.sizeMl, 0), reasons };
}

const gcd = (a: number, b: number): number => (b === 0 ? a : gcd(b, a % b));

/** Least total volume ≥ the exact need from the given sizes (unbounded knapsack over multiples of their gcd). */
function cheapestCover(exactNeedMl: number, sizesDesc: number[]): ContainerCount[] {
  const unit = sizesDesc.reduce(gcd);
  const sizes = sizesDesc.map((s) => s / unit);
  const need = Math.max(1, Math.ceil(exactNeedMl / unit - NOISE));
  const largest = sizes[0] ?? 1;
  const limit = need + largest;
  // best[v] = fewest containers summing to exactly v units, or Infinity.
  const best = new Float64Array(limit + 1).fill(Infinity);
  const pick = new Int32Array(limit + 1).fill(-1);
  best[0] = 0;
  for (let v = 1; v <= limit; v++) {
    for (let i = 0; i < sizes.length; i++) {
      const s = sizes[i]!;
      if (s <= v && best[v - s]! + 1 < best[v]!) {
        best[v] = best[v - s]! + 1;
        pick[v] = i;
      }
    }
  }
  let v = need;
  while (v <= limit && best[v] === Infinity) v++;
  const counts = new Map<number, number>();
  while (v > 0) {
    const i = pick[v]!;
    const s = sizes[i]!;
    counts.set(s * unit, (counts.get(s * unit) ?? 0) + 1);
    v -= s;
  }
  return [...counts.entries()].sort((a, b) => b[0] - a[0]).map(([sizeMl, count]) => ({ sizeMl, count }));
}
