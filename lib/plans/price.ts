// A plan's price per interval with the studio's tax, priced as one line by lib/repairs (no server-only
// import: the demo seed prices its plans with it too).
import type { PlanTemplate, Studio } from "@/db/schema";
import { priceLines } from "@/lib/repairs/lines";
import { studioTax } from "@/lib/repairs/pricing";

/** What one interval of the plan costs the owner, with the studio's tax (lib/repairs lines: one "other" line). */
export function planPrice(studio: Pick<Studio, "taxMode" | "taxInclusive" | "taxRateBp" | "taxRatesBp" | "taxNumber">, t: Pick<PlanTemplate, "name" | "priceMinor" | "currency">) {
  const priced = priceLines([{ kind: "other", source: "typed", description: t.name, quantity: 1, unit: "each", unitPriceMinor: t.priceMinor }], {
    currency: t.currency,
    rounding: "cent",
    tax: studioTax(studio),
    coveredPct: 0,
  });
  return { totalMinor: priced.totalMinor, taxMinor: priced.taxMinor, netMinor: priced.netMinor };
}
