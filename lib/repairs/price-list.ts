// The repair work a quote can carry beside maintenance: the built-in tasks (a studio keeps its own list
// and prices in settings) and how the quote builder proposes each one's quantity. Pure: the seed and
// the settings page use it too.
import { LABOUR_INCREMENT_HOURS } from "@/lib/care/quote";
import { M2_PER_FT2 } from "@/lib/care/units";
import type { Surface } from "@/lib/care/vocabulary";
import type { LineUnit, PriceListEntry } from "./lines";

/**
 * Built-in repair tasks. An hourly task with no price of its own is priced at the studio's labour
 * rate; the others start at 0 until the studio sets its price (prices differ by studio and currency).
 * A task whose quantity grows with a surface's size names that surface.
 */
export const BUILT_IN_REPAIRS: readonly PriceListEntry[] = [
  { key: "crack_fill", label: "Crack or check fill", kind: "labour", unit: "h", unitPriceMinor: null },
  { key: "butterfly_key", label: "Butterfly (bow-tie) key, fitted", kind: "other", unit: "each", unitPriceMinor: 0 },
  { key: "resin_fill", label: "Resin fill or re-pour of a void or gap", kind: "materials", unit: "mL", unitPriceMinor: 0 },
  { key: "flatten_refinish", label: "Flatten and refinish the top", kind: "labour", unit: "m2", unitPriceMinor: 0, surface: "top" },
  { key: "spot_refinish", label: "Spot refinish", kind: "labour", unit: "h", unitPriceMinor: null, surface: "top" },
  { key: "base_fix", label: "Base or hardware fix", kind: "labour", unit: "h", unitPriceMinor: null, surface: "base" },
  { key: "delivery", label: "Delivery or pickup", kind: "travel", unit: "trip", unitPriceMinor: 0 },
  { key: "shop_time", label: "Shop time", kind: "labour", unit: "h", unitPriceMinor: null },
];

/**
 * Hours proposed for the built-in hourly repairs: a fixed part plus a part per m² of the task's surface,
 * rounded up to the quarter hour as labour is billed (lib/care/quote LABOUR_INCREMENT_HOURS). Invented
 * for the demo — common practice, no published source; staff edit the hours on every quote.
 */
const REPAIR_HOURS: Record<string, { baseHours: number; hoursPerM2: number }> = {
  crack_fill: { baseHours: 1, hoursPerM2: 0 },
  spot_refinish: { baseHours: 0.75, hoursPerM2: 0.25 },
  base_fix: { baseHours: 1, hoursPerM2: 0 },
  shop_time: { baseHours: 1, hoursPerM2: 0 },
};

/** Resin proposed for a fill before anyone has measured the void: 100 mL (common practice, no published source). */
const RESIN_FILL_ML = 100;

/** The studio's list, or the built-in one while it has none. */
export function priceListOf(studio: { repairPriceList: readonly PriceListEntry[] }): readonly PriceListEntry[] {
  return studio.repairPriceList.length ? studio.repairPriceList : BUILT_IN_REPAIRS;
}

/**
 * The surface an entry's size comes from: the one it names, else the built-in task's of the same key (a
 * list saved before entries named one), else the top, as a quote reads a task whose surface is not said
 * (lib/repairs/pricing.ts workSurface).
 */
export function entrySurface(entry: Pick<PriceListEntry, "key" | "surface">): Surface {
  return entry.surface ?? BUILT_IN_REPAIRS.find((b) => b.key === entry.key)?.surface ?? "top";
}

/** Whether an entry's proposed quantity depends on its surface's size (so a surface without one gives no proposal). */
export function entryNeedsArea(entry: Pick<PriceListEntry, "key" | "unit">): boolean {
  return entry.unit === "m2" || entry.unit === "ft2" || (entry.unit === "h" && (REPAIR_HOURS[entry.key]?.hoursPerM2 ?? 0) > 0);
}

/**
 * Quantity proposed for a price-list entry on a surface of areaM2; null where the quantity needs the
 * surface's size and the record has none (areaM2 null): never another surface's size, never a made-up 1 m².
 */
export function proposedQuantity(entry: Pick<PriceListEntry, "key" | "unit">, areaM2: number | null): number | null {
  if (entryNeedsArea(entry) && !areaM2) return null;
  const area = areaM2 ?? 0;
  const hours = REPAIR_HOURS[entry.key];
  const up = (v: number, step: number) => Math.ceil(Math.round((v / step) * 1e6) / 1e6) * step;
  switch (entry.unit as LineUnit) {
    case "h":
      return hours ? up(hours.baseHours + hours.hoursPerM2 * area, LABOUR_INCREMENT_HOURS) : 1;
    case "m2":
      return Number(up(area, 0.01).toFixed(2));
    case "ft2":
      return Number(up(area / M2_PER_FT2, 0.1).toFixed(1));
    case "mL":
      return RESIN_FILL_ML;
    default:
      return 1;
  }
}
