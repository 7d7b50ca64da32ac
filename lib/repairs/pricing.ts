// Pricing of a repair job: the care engine's quote() and the studio's repair price list propose the
// lines, staff may change them, and lib/repairs/lines prices what is sent. The one place a job's money
// is computed. No server-only import: the demo seed prices its jobs with it too.
import type { finishProducts, pieces, Studio } from "@/db/schema";
import { topArea } from "@/lib/care/area";
import { quote, quoteProductFromCatalog } from "@/lib/care/quote";
import { TASK_KIND_BY_FINISH_CLASS } from "@/lib/care/vocabulary";
import { formatVolume } from "@/lib/format";
import { topShape, toCatalog } from "@/lib/pieces/care-inputs";
import type { JobQuoteInput } from "@/lib/validation/jobs";
import { priceLines, type JobLine, type LineDraft, type PlanDiscount, type PricedLines, type PricingRules, type StudioTax } from "./lines";
import { priceListOf, proposedQuantity } from "./price-list";

type Product = typeof finishProducts.$inferSelect;

export function studioTax(studio: Pick<Studio, "taxMode" | "taxInclusive" | "taxRateBp" | "taxRatesBp" | "taxNumber">): StudioTax {
  return { mode: studio.taxMode, inclusive: studio.taxInclusive, rateBp: studio.taxRateBp, ratesBp: studio.taxRatesBp, number: studio.taxNumber };
}

export function pricingRulesOf(studio: Studio, planDiscount: PlanDiscount | null = null): PricingRules {
  return { rounding: studio.roundingRule, taxMode: studio.taxMode, taxInclusive: studio.taxInclusive, ...(planDiscount ? { planDiscount } : {}) };
}

/**
 * The lines the care engine and the price list propose for the input's tasks: labour from the top's
 * area and the task (at the labour rate), product from area × coats ÷ coverage in whole containers
 * (catalog prices), the travel fee, and each chosen repair from the studio's price list.
 */
export function proposeLines(studio: Studio, piece: typeof pieces.$inferSelect, input: JobQuoteInput, products: Product[]): LineDraft[] {
  const shape = topShape(piece);
  const areaM2 = shape ? topArea(shape).m2 : 0;
  const out: LineDraft[] = [];
  if (input.tasks.length) {
    const chosen = toCatalog(products.filter((p) => input.productIds.includes(p.id)));
    const q = quote({
      tasks: input.tasks,
      areaM2,
      rates: { labourPerHourMinor: studio.labourRateMinor },
      products: chosen.map((entry) => ({ ...quoteProductFromCatalog(entry, TASK_KIND_BY_FINISH_CLASS[entry.finishClass]), label: entry.id, coats: input.coats })),
      taxRatePct: 0,
      coveredPct: 0,
      currency: studio.currency,
    });
    for (const l of q.lines) {
      if (l.kind === "labour") out.push({ kind: "labour", source: "labour_rate", ref: `task:${l.taskKind}`, description: l.description, quantity: l.quantity, unit: "h", unitPriceMinor: l.unitPriceMinor });
      else if (l.kind === "materials") {
        // The engine's line reads "<label>, <size> mL"; the label is the product's id (set above).
        const cut = l.description.lastIndexOf(", ");
        const productId = l.description.slice(0, cut);
        const size = l.description.slice(cut + 2);
        const name = products.find((p) => p.id === productId)?.name ?? productId;
        const sizeMl = Number(size.replace(" mL", ""));
        // The container size in the studio's units (the quote is the studio's document): "4.3 US fl oz (125 mL)".
        out.push({ kind: "materials", source: "catalog", ref: `product:${productId}:${sizeMl}`, description: `${name}, ${formatVolume(sizeMl, studio.unitSystem)}`, quantity: l.quantity, unit: "container", unitPriceMinor: l.unitPriceMinor });
      }
    }
  }
  const list = priceListOf(studio);
  for (const key of input.repairs ?? []) {
    const entry = list.find((e) => e.key === key);
    if (!entry) continue;
    const hourly = entry.unitPriceMinor === null;
    out.push({
      kind: entry.kind,
      source: hourly ? "labour_rate" : "price_list",
      ref: `list:${entry.key}`,
      description: entry.label,
      quantity: proposedQuantity(entry, areaM2),
      unit: entry.unit,
      unitPriceMinor: hourly ? studio.labourRateMinor : entry.unitPriceMinor!,
    });
  }
  if (input.travel && studio.travelFeeMinor > 0) out.push({ kind: "travel", source: "price_list", ref: "travel", description: "Travel", quantity: 1, unit: "trip", unitPriceMinor: studio.travelFeeMinor });
  return out;
}

export interface PricedJob extends PricedLines {
  proposedLines: JobLine[];
  pricingRules: PricingRules;
}

/**
 * Prices a job: the proposal, and the lines as sent — `input.lines` when staff edited them, else the
 * proposal plus the typed lines the job already had (`keepTyped`). Each sent line carries what was
 * proposed for it (matched by ref), so the quote keeps both. A paid repair on a piece under a running
 * care plan with a repair discount (`planDiscount`, lib/plans/repair-discount) takes it off every line
 * after the warranty's share; the pricing rules name the plan so the quote can say so.
 */
export function priceJob(studio: Studio, piece: typeof pieces.$inferSelect, input: JobQuoteInput, products: Product[], keepTyped: readonly LineDraft[] = [], planDiscount: PlanDiscount | null = null): PricedJob {
  const opts = { currency: studio.currency, rounding: studio.roundingRule, tax: studioTax(studio), coveredPct: input.coveredPct, discountPct: planDiscount?.pct ?? 0 };
  const proposal = proposeLines(studio, piece, input, products);
  const proposedLines = priceLines(proposal, opts).lines;
  const sent = input.lines ?? [...proposal, ...keepTyped.filter((l) => l.source === "typed")];
  const withProposed = sent.map((l) => {
    const p = l.ref ? proposal.find((x) => x.ref === l.ref) : undefined;
    const { kind, source, ref, description, quantity, unit, unitPriceMinor } = l;
    return { kind, source, ...(ref ? { ref } : {}), description, quantity, unit, unitPriceMinor, proposed: p ? { quantity: p.quantity, unitPriceMinor: p.unitPriceMinor } : null };
  });
  return { ...priceLines(withProposed, opts), proposedLines, pricingRules: pricingRulesOf(studio, planDiscount) };
}

/** The job's money columns from a priced job. */
export function totals(q: PricedJob) {
  return { lines: q.lines, proposedLines: q.proposedLines, pricingRules: q.pricingRules, subtotalMinor: q.subtotalMinor, coveredMinor: q.coveredMinor, netMinor: q.netMinor, taxMinor: q.taxMinor, totalMinor: q.totalMinor };
}
