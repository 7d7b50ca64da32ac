// A job's money as every reader gets it — the quote page, the quote and receipt mail, the receipt PDF,
// the JSON API and the checkout's line items — from the same stored lines, so they cannot disagree.
// Pure: components and e-mails take its output.
import type { RepairJob, Studio } from "@/db/schema";
import { formatMoney, formatPercentBp } from "@/lib/format";
import { LINE_UNIT_LABELS, readLines, roundingWords, type JobLine, type PricingRules } from "./lines";
import { coverWords } from "./states";

type JobMoney = Pick<RepairJob, "origin" | "currency" | "coveredPct" | "subtotalMinor" | "coveredMinor" | "netMinor" | "taxMinor" | "totalMinor" | "title"> & { lines: unknown; pricingRules: RepairJob["pricingRules"] };

function rulesOf(job: JobMoney): PricingRules | null {
  const r = job.pricingRules as Partial<PricingRules>;
  return r.rounding ? (r as PricingRules) : null;
}

/** The tax in words for the totals: "Tax (8.25 %)", "Tax included (20 %)", "Tax (by line)". */
function taxLabel(lines: JobLine[], rules: PricingRules | null): string {
  const rates = [...new Set(lines.filter((l) => l.amountMinor > 0).map((l) => l.taxRateBp))];
  const rate = rates.length === 1 ? ` (${formatPercentBp(rates[0]!)})` : rates.length > 1 ? " (rates by line)" : "";
  return rules?.taxInclusive ? `Tax included${rate}` : `Tax${rate}`;
}

export type JobFigures = ReturnType<typeof jobFigures>;

/** "Care plan “Wax keeping”: 10 % off repairs" — the discount row's words, or null without a plan discount. */
function discountLabel(rules: PricingRules | null): string | null {
  const d = rules?.planDiscount;
  return d ? `Care plan “${d.planName}”: ${d.pct} % off repairs` : null;
}

/** Lines and totals, each amount also written out for the studio's country. */
export function jobFigures(job: JobMoney, studio: Pick<Studio, "country" | "taxNumber">) {
  const lines = readLines(job.lines);
  const rules = rulesOf(job);
  const money = (minor: number) => formatMoney(minor, job.currency, studio.country);
  const discountMinor = lines.reduce((s, l) => s + (l.discountMinor ?? 0), 0);
  return {
    currency: job.currency,
    lines: lines.map((l) => ({
      ...l,
      unitLabel: LINE_UNIT_LABELS[l.unit],
      quantityText: `${l.quantity} ${LINE_UNIT_LABELS[l.unit]} × ${money(l.unitPriceMinor)}`,
      amount: money(l.amountMinor),
      proposedText: l.proposed && (l.proposed.quantity !== l.quantity || l.proposed.unitPriceMinor !== l.unitPriceMinor) ? `proposed ${l.proposed.quantity} ${LINE_UNIT_LABELS[l.unit]} × ${money(l.proposed.unitPriceMinor)}` : null,
    })),
    subtotalMinor: job.subtotalMinor,
    coveredMinor: job.coveredMinor,
    coveredPct: job.coveredPct,
    discountMinor,
    netMinor: job.netMinor,
    taxMinor: job.taxMinor,
    totalMinor: job.totalMinor,
    text: { subtotal: money(job.subtotalMinor), covered: job.coveredMinor ? `−${money(job.coveredMinor)}` : null, discount: discountMinor ? `−${money(discountMinor)}` : null, net: money(job.netMinor), tax: money(job.taxMinor), total: money(job.totalMinor) },
    coveredLabel: coverWords(job).share,
    discountLabel: discountLabel(rules) ?? "Care plan discount",
    taxLabel: taxLabel(lines, rules),
    roundingNote: rules ? roundingWords(rules.rounding, job.currency) : null,
    taxNumber: studio.taxNumber || null,
  };
}

/** The lines and totals the JSON API answers: integer minor units only. */
export function jobApiMoney(job: JobMoney) {
  return {
    currency: job.currency,
    lines: readLines(job.lines).map((l) => ({
      description: l.description,
      kind: l.kind,
      source: l.source,
      ...(l.ref ? { ref: l.ref } : {}),
      quantity: l.quantity,
      unit: l.unit,
      unitPriceMinor: l.unitPriceMinor,
      amountMinor: l.amountMinor,
      coveredMinor: l.coveredMinor,
      discountMinor: l.discountMinor ?? 0,
      taxRateBp: l.taxRateBp,
      taxMinor: l.taxMinor,
      lineTotalMinor: l.totalMinor,
      proposed: l.proposed,
    })),
    totals: { subtotalMinor: job.subtotalMinor, coveredMinor: job.coveredMinor, netMinor: job.netMinor, taxMinor: job.taxMinor, totalMinor: job.totalMinor },
  };
}

/**
 * The Checkout Session's line items: one per quote line, each the owner's part of it with its tax, so
 * they add up to the quote's total (Stripe takes no negative line, hence the covered share — the
 * warranty's, or the care plan's for a plan visit — is taken off each line rather than charged as a line
 * of its own).
 */
export function checkoutLineItems(job: JobMoney) {
  const lines = readLines(job.lines);
  const after = coverWords(job).after;
  const items = lines
    .filter((l) => l.totalMinor > 0)
    .map((l) => ({
      quantity: 1,
      price_data: {
        currency: job.currency.toLowerCase(),
        unit_amount: l.totalMinor,
        product_data: { name: `${l.description} — ${l.quantity} ${LINE_UNIT_LABELS[l.unit]}${l.coveredMinor ? `, after ${after}` : ""}${l.discountMinor ? ", after the care plan discount" : ""}${l.taxMinor ? ", tax included" : ""}` },
      },
    }));
  // Lines stored before each line carried its own share (or none at all): one item for the total.
  const sum = items.reduce((s, i) => s + i.price_data.unit_amount, 0);
  if (sum !== job.totalMinor) {
    return [{ quantity: 1, price_data: { currency: job.currency.toLowerCase(), unit_amount: job.totalMinor, product_data: { name: `${job.title} (after ${after}, tax included)` } } }];
  }
  return items;
}
