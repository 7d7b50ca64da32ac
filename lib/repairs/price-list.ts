// The repair work a quote can carry beside maintenance: the built-in tasks (a studio keeps its own list
// and prices in settings) and how the quote builder proposes each one's quantity. Pure: the seed and
// the settings page use it too.
import { LABOUR_INCREMENT_HOURS } from "@/lib/care/quote";
import { M2_PER_FT2 } from "@/lib/care/units";
import type { LineUnit, PriceListEntry } from "./lines";

/**
 * Built-in repair tasks. An hourly task with no price of its own is priced at the studio's labour
 * rate; the others start at 0 until the studio sets its price (prices differ by studio and currency).
 */
export const BUILT_IN_REPAIRS: readonly PriceListEntry[] = [
  { key: "crack_fill", label: "Crack or check fill", kind: "labour", unit: "h", unitPriceMinor: null },
  { key: "butterfly_key", label: "Butterfly (bow-tie) key, fitted", kind: "other", unit: "each", unitPriceMinor: 0 },
  { key: "resin_fill", label: "Resin fill or re-pour of a void or gap", kind: "materials", unit: "mL", unitPriceMinor: 0 },
  { key: "flatten_refinish", label: "Flatten and refinish the top", kind: "labour", unit: "m2", unitPriceMinor: 0 },
  { key: "spot_refinish", label: "Spot refinish", kind: "labour", unit: "h", unitPriceMinor: null },
  { key: "base_fix", label: "Base or hardware fix", kind: "labour", unit: "h", unitPriceMinor: null },
  { key: "delivery", label: "Delivery or pickup", kind: "travel", unit: "trip", unitPriceMinor: 0 },
  { key: "shop_time", label: "Shop time", kind: "labour", unit: "h", unitPriceMinor: null },
];

/**
 * Hours proposed for the built-in hourly repairs: a fixed part plus a part per m² of top, rounded up to
 * the quarter hour as labour is billed (lib/care/quote LABOUR_INCREMENT_HOURS). Invented for the demo —
 * common practice, no published source; staff edit the hours on every quote.
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

/** Quantity proposed for a price-list entry on a top of areaM2 (0 when the piece has no recorded top). */
export function proposedQuantity(entry: Pick<PriceListEntry, "key" | "unit">, areaM2: number): number {
  const hours = REPAIR_HOURS[entry.key];
  const up = (v: number, step: number) => Math.ceil(Math.round((v / step) * 1e6) / 1e6) * step;
  switch (entry.unit as LineUnit) {
    case "h":
      return hours ? up(hours.baseHours + hours.hoursPerM2 * areaM2, LABOUR_INCREMENT_HOURS) : 1;
    case "m2":
      return areaM2 > 0 ? Number(up(areaM2, 0.01).toFixed(2)) : 1;
    case "ft2":
      return areaM2 > 0 ? Number(up(areaM2 / M2_PER_FT2, 0.1).toFixed(1)) : 1;
    case "mL":
      return RESIN_FILL_ML;
    default:
      return 1;
  }
}
