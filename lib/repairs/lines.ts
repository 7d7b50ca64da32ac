// A repair job's quote lines and their money: quantity × unit price, the studio's rounding rule, the
// warranty's share and tax, all in integer minor units (never a float amount). Pure, no server-only
// import: the schema types its JSON columns with it, the demo seed and the editor's client use it too.
import { currencyExponent } from "@/lib/care/quote";
import type { Surface } from "@/lib/care/vocabulary";

/** What a line is, for tax "per line kind". */
export const LINE_KINDS = ["labour", "materials", "travel", "other"] as const;
export type LineKind = (typeof LINE_KINDS)[number];
export const LINE_KIND_LABELS: Record<LineKind, string> = { labour: "Labour", materials: "Materials", travel: "Delivery and travel", other: "Other work" };

export const LINE_UNITS = ["h", "each", "mL", "ft2", "m2", "container", "trip", "km"] as const;
export type LineUnit = (typeof LINE_UNITS)[number];
export const LINE_UNIT_LABELS: Record<LineUnit, string> = { h: "h", each: "each", mL: "mL", ft2: "ft²", m2: "m²", container: "container", trip: "trip", km: "km" };

/** Where a line's price comes from. */
export const LINE_SOURCES = ["labour_rate", "catalog", "price_list", "typed"] as const;
export type LineSource = (typeof LINE_SOURCES)[number];
export const LINE_SOURCE_LABELS: Record<LineSource, string> = { labour_rate: "Labour rate", catalog: "Catalog product", price_list: "Studio price list", typed: "Typed" };

export const ROUNDING_RULES = ["cent", "whole", "five", "ten"] as const;
export type RoundingRule = (typeof ROUNDING_RULES)[number];

export const TAX_MODES = ["none", "single", "per_kind"] as const;
export type TaxMode = (typeof TAX_MODES)[number];

/** A studio's tax, as set in its settings. Rates in basis points (8.25 % = 825). */
export interface StudioTax {
  mode: TaxMode;
  inclusive: boolean;
  rateBp: number;
  ratesBp: Partial<Record<LineKind, number>>;
  number: string;
}

/** The rules a job was priced by, kept on the job so the quote says how it was worked out. */
export interface PricingRules {
  rounding: RoundingRule;
  taxMode: TaxMode;
  taxInclusive: boolean;
  /** The care plan whose repair discount the quote applies; absent: none. */
  planDiscount?: PlanDiscount;
}

/** A running care plan's discount on paid repairs, as the quote names it. */
export interface PlanDiscount {
  pct: number;
  planName: string;
  planVersion: number;
}

/** A line as staff send it: what, how much, at what unit price, from where. */
export interface LineDraft {
  kind: LineKind;
  source: LineSource;
  /** Ties a line to what proposed it ("task:reoil", "product:<id>:<mL>", "list:<key>", "travel"); none for typed lines. */
  ref?: string;
  description: string;
  /** Up to three decimals (0.75 h, 1.5 ft², 120 mL). */
  quantity: number;
  unit: LineUnit;
  unitPriceMinor: number;
}

/** A priced line: the draft, what the care engine proposed for it, and its money. */
export interface JobLine extends LineDraft {
  proposed: { quantity: number; unitPriceMinor: number } | null;
  /** quantity × unit price, rounded by the studio's rule. */
  amountMinor: number;
  /** The warranty's share of this line. */
  coveredMinor: number;
  /** The care plan's discount on what the warranty leaves (absent on lines priced before plans). */
  discountMinor?: number;
  taxRateBp: number;
  taxMinor: number;
  /** The owner's part before tax. */
  netMinor: number;
  /** The owner's part with tax: what the checkout charges for this line. */
  totalMinor: number;
}

export interface PricedLines {
  lines: JobLine[];
  subtotalMinor: number;
  coveredMinor: number;
  /** The care plan's discount, summed over the lines. */
  discountMinor: number;
  netMinor: number;
  taxMinor: number;
  totalMinor: number;
}

/** round(n × num / den), halves away from zero, exact for integers (BigInt). */
export function mulDivHalfUp(n: number, num: number | bigint, den: number | bigint): number {
  const p = BigInt(n) * BigInt(num);
  const d = BigInt(den);
  const q = p / d;
  const r = p % d;
  return Number(2n * r >= d ? q + 1n : q);
}

/** A quantity with at most three decimals as thousandths: 0.75 → 750. Refuses more decimals. */
export function quantityMilli(quantity: number): number {
  const milli = Math.round(quantity * 1000);
  if (!Number.isFinite(quantity) || Math.abs(milli - quantity * 1000) > 1e-6) throw new RangeError(`quantity ${quantity} has more than three decimals`);
  return milli;
}

/** The rounding step in minor units: cent → 1; whole → 100 (USD) or 1 (JPY); five → 500; ten → 1000. */
export function roundingStep(rule: RoundingRule, currency: string): number {
  const unit = 10 ** currencyExponent(currency);
  return { cent: 1, whole: unit, five: 5 * unit, ten: 10 * unit }[rule];
}

/** The rule in words for the quote: "Line amounts are rounded to the nearest 5". */
export function roundingWords(rule: RoundingRule, currency: string): string {
  if (rule === "cent") return currencyExponent(currency) === 0 ? "Amounts are exact to the unit." : "Amounts are exact to the cent.";
  const what = { whole: "whole amount", five: "multiple of 5", ten: "multiple of 10" }[rule];
  return `Each line's amount is rounded to the nearest ${what} (halves round up); the covered share and tax are then worked out exactly.`;
}

/** A line's amount: quantity × unit price, rounded half up to the rule's step. */
export function lineAmount(quantity: number, unitPriceMinor: number, step: number): number {
  // quantity × price = milli × price / 1000, then to the step: milli × price / (1000 × step), × step.
  return mulDivHalfUp(quantityMilli(quantity), unitPriceMinor, 1000 * step) * step;
}

export function taxRateFor(tax: StudioTax, kind: LineKind): number {
  if (tax.mode === "none") return 0;
  if (tax.mode === "single") return tax.rateBp;
  return tax.ratesBp[kind] ?? 0;
}

/**
 * Prices the lines. Per line: amount = quantity × unit price rounded by the rule; the warranty's share
 * = amount × covered % (half up); a care plan's discount = (amount − share) × discount % (half up);
 * the owner's part = amount − share − discount; tax on the owner's part at the
 * line kind's rate (exclusive: added on top; inclusive: the part already holds it, tax = part × r/(1+r)).
 * Each is rounded once per line, and the totals are the sums, so the checkout's lines add up to the
 * quote's total to the minor unit.
 */
export function priceLines(
  drafts: readonly (LineDraft & { proposed?: JobLine["proposed"] })[],
  opts: { currency: string; rounding: RoundingRule; tax: StudioTax; coveredPct: number; discountPct?: number },
): PricedLines {
  const step = roundingStep(opts.rounding, opts.currency);
  const pct = Math.round(opts.coveredPct);
  if (pct < 0 || pct > 100) throw new RangeError(`coveredPct must be 0–100, got ${opts.coveredPct}`);
  const off = Math.round(opts.discountPct ?? 0);
  if (off < 0 || off > 100) throw new RangeError(`discountPct must be 0–100, got ${opts.discountPct}`);
  const lines = drafts.map((d): JobLine => {
    if (!Number.isSafeInteger(d.unitPriceMinor) || d.unitPriceMinor < 0) throw new RangeError(`unit price must be whole minor units, got ${d.unitPriceMinor}`);
    const amountMinor = lineAmount(d.quantity, d.unitPriceMinor, step);
    const coveredMinor = mulDivHalfUp(amountMinor, pct, 100);
    const discountMinor = mulDivHalfUp(amountMinor - coveredMinor, off, 100);
    const part = amountMinor - coveredMinor - discountMinor;
    const taxRateBp = taxRateFor(opts.tax, d.kind);
    const taxMinor = opts.tax.inclusive ? mulDivHalfUp(part, taxRateBp, 10_000 + taxRateBp) : mulDivHalfUp(part, taxRateBp, 10_000);
    const netMinor = opts.tax.inclusive ? part - taxMinor : part;
    return { ...d, proposed: d.proposed ?? null, amountMinor, coveredMinor, ...(off ? { discountMinor } : {}), taxRateBp, taxMinor, netMinor, totalMinor: netMinor + taxMinor };
  });
  const sum = (k: "amountMinor" | "coveredMinor" | "discountMinor" | "netMinor" | "taxMinor" | "totalMinor") => lines.reduce((s, l) => s + (l[k] ?? 0), 0);
  return { lines, subtotalMinor: sum("amountMinor"), coveredMinor: sum("coveredMinor"), discountMinor: sum("discountMinor"), netMinor: sum("netMinor"), taxMinor: sum("taxMinor"), totalMinor: sum("totalMinor") };
}

/**
 * Lines stored before lines carried their own money (the care engine's labour/materials/travel lines):
 * read as typed-in-full lines, their amounts kept, no tax of their own.
 */
export function readLines(stored: unknown): JobLine[] {
  if (!Array.isArray(stored)) return [];
  return stored.map((l: Partial<JobLine> & { amountMinor?: number; unit?: string }) => {
    if (typeof l.totalMinor === "number" && typeof l.netMinor === "number") return l as JobLine;
    const amount = l.amountMinor ?? 0;
    const unit = (LINE_UNITS as readonly string[]).includes(l.unit ?? "") ? (l.unit as LineUnit) : "each";
    const kind = (LINE_KINDS as readonly string[]).includes(l.kind ?? "") ? (l.kind as LineKind) : "other";
    return { kind, source: "typed", description: l.description ?? "", quantity: l.quantity ?? 1, unit, unitPriceMinor: l.unitPriceMinor ?? amount, proposed: null, amountMinor: amount, coveredMinor: 0, taxRateBp: 0, taxMinor: 0, netMinor: amount, totalMinor: amount };
  });
}

/** One entry of a studio's repair price list: its own task and default price. */
export interface PriceListEntry {
  key: string;
  label: string;
  kind: LineKind;
  unit: LineUnit;
  /** null: an hourly task priced at the studio's labour rate. */
  unitPriceMinor: number | null;
  /**
   * The surface whose size an area-priced task is worked from (lib/repairs/price-list.ts entrySurface);
   * absent on lists saved before it could be said.
   */
  surface?: Surface;
}

/** "85.5" typed in a currency with `exponent` decimals → 8550; null when it is not an amount. String math, no float. */
export function parseMajorAmount(text: string, exponent: number): number | null {
  const m = /^\s*(\d{1,9})(?:[.,](\d*))?\s*$/.exec(text);
  if (!m) return null;
  const frac = m[2] ?? "";
  if (frac.length > exponent) return null;
  return Number(m[1]) * 10 ** exponent + Number(frac.padEnd(exponent, "0") || "0");
}

