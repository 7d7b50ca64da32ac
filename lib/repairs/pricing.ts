// Pricing of a repair job by the care engine's quote(): the one place a job's money is computed.
// No server-only import: the demo seed prices its jobs with it too.
import type { finishProducts, pieces, Studio } from "@/db/schema";
import { topArea } from "@/lib/care/area";
import { quote, quoteProductFromCatalog, type Quote } from "@/lib/care/quote";
import { TASK_KIND_BY_FINISH_CLASS } from "@/lib/care/vocabulary";
import { topShape, toCatalog } from "@/lib/pieces/care-inputs";
import type { JobQuoteInput } from "@/lib/validation/jobs";

/** Prices a job's quote input with the care engine, from the piece's top and the studio's rates. */
export function priceJob(studio: Studio, piece: typeof pieces.$inferSelect, input: JobQuoteInput, products: (typeof finishProducts.$inferSelect)[]): Quote {
  const shape = topShape(piece);
  const areaM2 = shape ? topArea(shape).m2 : 0;
  const chosen = toCatalog(products.filter((p) => input.productIds.includes(p.id)));
  return quote({
    tasks: input.tasks,
    areaM2,
    rates: { labourPerHourMinor: studio.labourRateMinor },
    products: chosen.map((entry) => ({
      ...quoteProductFromCatalog(entry, TASK_KIND_BY_FINISH_CLASS[entry.finishClass]),
      coats: input.coats,
    })),
    travel: input.travel ? { flatMinor: studio.travelFeeMinor } : undefined,
    taxRatePct: studio.taxRateBp / 100,
    coveredPct: input.coveredPct,
    currency: studio.currency,
  });
}

export function totals(q: Quote) {
  return { lines: q.lines, subtotalMinor: q.subtotalMinor, coveredMinor: q.coveredMinor, taxMinor: q.taxMinor, totalMinor: q.totalMinor };
}

