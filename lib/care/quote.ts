import { CareInputError, requireNonNegative, requirePositive } from "./errors";
import { productNeeded } from "./quantity";
import { CARE_TASK_KINDS, CARE_TASK_LABELS, type CareTaskKind } from "./vocabulary";

/** ISO 4217 minor units (decimal places): USD, EUR, GBP, CAD 2; JPY 0 (ISO 4217 list one; lib/care/SOURCES.md). */
export const CURRENCY_EXPONENTS = { USD: 2, EUR: 2, GBP: 2, CAD: 2, JPY: 0 } as const;
export const CURRENCIES = Object.keys(CURRENCY_EXPONENTS) as (keyof typeof CURRENCY_EXPONENTS)[];
export type CurrencyCode = keyof typeof CURRENCY_EXPONENTS;

export function currencyExponent(currency: string): number {
  const e = (CURRENCY_EXPONENTS as Record<string, number>)[currency];
  if (e === undefined) throw new CareInputError(`unsupported currency ${JSON.stringify(currency)}; supported: ${Object.keys(CURRENCY_EXPONENTS).join(", ")}`, "currency");
  return e;
}

/** "1234.50" for 123450 USD minor units; "1235" for 1235 JPY. */
export function formatMinorUnits(minor: number, currency: string): string {
  const e = currencyExponent(currency);
  if (!Number.isInteger(minor)) throw new CareInputError(`amount must be whole minor units, got ${minor}`, "minor");
  const sign = minor < 0 ? "-" : "";
  const digits = String(Math.abs(minor)).padStart(e + 1, "0");
  return e === 0 ? sign + digits : `${sign}${digits.slice(0, -e)}.${digits.slice(-e)}`;
}

/** Labour for one task: a fixed part plus a part per m² of top. */
export interface LabourModel {
  baseHours: number;
  hoursPerM2: number;
}

/**
 * Default labour by task kind — invented for the demo, common practice, no published source. Every
 * studio sets its own in `rates.labour`.
 */
export const DEFAULT_LABOUR: Record<CareTaskKind, LabourModel> = {
  reoil: { baseHours: 0.5, hoursPerM2: 0.5 },
  topcoat_refresh: { baseHours: 0.5, hoursPerM2: 0.4 },
  rewax: { baseHours: 0.25, hoursPerM2: 0.5 },
  film_inspect: { baseHours: 0.5, hoursPerM2: 0.1 },
  resin_polish: { baseHours: 0.5, hoursPerM2: 0.75 },
  reoil_charred: { baseHours: 0.5, hoursPerM2: 0.6 },
  annual_check: { baseHours: 0.5, hoursPerM2: 0 },
};

/** Labour is billed and booked in quarter hours, rounded up per task (our own billing rule, no external source). */
export const LABOUR_INCREMENT_HOURS = 0.25;

function labourModel(kind: CareTaskKind, overrides?: Partial<Record<CareTaskKind, LabourModel>>): LabourModel {
  if (!CARE_TASK_KINDS.includes(kind)) throw new CareInputError(`unknown task kind ${JSON.stringify(kind)}`, "tasks");
  return overrides?.[kind] ?? DEFAULT_LABOUR[kind];
}

/** Hours of one task on a top of areaM2, rounded up to the quarter hour. */
export function taskHours(kind: CareTaskKind, areaM2: number, overrides?: Partial<Record<CareTaskKind, LabourModel>>): number {
  requireNonNegative(areaM2, "areaM2");
  const m = labourModel(kind, overrides);
  const raw = m.baseHours + m.hoursPerM2 * areaM2;
  const quarters = Math.ceil(Math.round((raw / LABOUR_INCREMENT_HOURS) * 1e9) / 1e9);
  return quarters * LABOUR_INCREMENT_HOURS;
}

/** A task given by its kind, or a care task (from careSchedule) that has one. */
export type QuotedTask = CareTaskKind | { kind: CareTaskKind };

const kindOf = (t: QuotedTask): CareTaskKind => (typeof t === "string" ? t : t?.kind);

/** Minutes on site for a visit doing these tasks (the booking duration). */
export function taskDurationMinutes(tasks: readonly QuotedTask[], areaM2: number, overrides?: Partial<Record<CareTaskKind, LabourModel>>): number {
  return tasks.reduce((t, k) => t + Math.round(taskHours(kindOf(k), areaM2, overrides) * 60), 0);
}

export interface QuoteProduct {
  /** The task this product is used for. */
  taskKind: CareTaskKind;
  label: string;
  coverageM2PerL: number;
  coats: number;
  containerSizesMl: readonly number[];
  /** Price of one container by its size (mL), minor units. */
  containerPricesMinor: Readonly<Record<number, number>>;
}

export interface QuoteInput {
  tasks: readonly QuotedTask[];
  areaM2: number;
  rates: { labourPerHourMinor: number; labour?: Partial<Record<CareTaskKind, LabourModel>> };
  products: readonly QuoteProduct[];
  travel?: { flatMinor?: number; distanceKm?: number; perKmMinor?: number };
  /** e.g. 8.875; at most 4 decimals. */
  taxRatePct: number;
  /** Share of the job the warranty covers, 0–100. */
  coveredPct: number;
  currency: string;
}

export interface QuoteLine {
  kind: "labour" | "materials" | "travel";
  description: string;
  taskKind?: CareTaskKind;
  quantity: number;
  unit: "h" | "container" | "km" | "trip";
  unitPriceMinor: number;
  amountMinor: number;
  /** Materials: the product and its container size (mL), so a reader's page can write the size in their units. */
  product?: string;
  sizeMl?: number;
}

export interface Quote {
  currency: string;
  exponent: number;
  lines: QuoteLine[];
  subtotalMinor: number;
  coveredPct: number;
  coveredMinor: number;
  taxableMinor: number;
  taxRatePct: number;
  taxMinor: number;
  totalMinor: number;
  /** Totals as decimal strings in the currency's own exponent. */
  display: { subtotal: string; covered: string; tax: string; total: string };
  reasons: string[];
}

/** round(n × num / den) with halves rounded up, exact for integers (BigInt). */
function mulDivHalfUp(n: number, num: bigint, den: bigint): number {
  const p = BigInt(n) * num;
  const q = p / den;
  const r = p % den;
  return Number(2n * r >= den ? q + 1n : q);
}

/** A rate with up to 4 decimals as a rational over 10^6 (percent → fraction). */
function pctRational(pct: number, field: string): bigint {
  const scaled = Math.round(pct * 10_000);
  if (Math.abs(scaled - pct * 10_000) > 1e-6) throw new CareInputError(`${field} may have at most 4 decimals, got ${pct}`, field);
  return BigInt(scaled);
}

const PCT_DEN = 1_000_000n;

function requireMinor(n: number, field: string): number {
  if (!Number.isSafeInteger(n) || n < 0) throw new CareInputError(`${field} must be a whole, non-negative amount in minor units, got ${n}`, field);
  return n;
}

/**
 * A repair or refresh quote, in integer minor units. Rounding: each line is rounded
 * once (half up); the covered share and the tax are each computed once on the totals and rounded half up.
 * Order: subtotal = labour + materials + travel; covered = subtotal × coveredPct; tax on (subtotal − covered).
 */
export function quote(input: QuoteInput): Quote {
  const exponent = currencyExponent(input.currency);
  requireNonNegative(input.areaM2, "areaM2");
  const rate = requireMinor(input.rates?.labourPerHourMinor, "rates.labourPerHourMinor");
  requireNonNegative(input.taxRatePct, "taxRatePct");
  requireNonNegative(input.coveredPct, "coveredPct");
  if (input.coveredPct > 100) throw new CareInputError(`coveredPct must be 0–100, got ${input.coveredPct}`, "coveredPct");
  if (input.tasks.length === 0) throw new CareInputError("a quote needs at least one task", "tasks");
  const lines: QuoteLine[] = [];
  const reasons: string[] = [];

  const kinds = input.tasks.map(kindOf);
  for (const kind of kinds) {
    const hours = taskHours(kind, input.areaM2, input.rates.labour);
    const quarters = BigInt(Math.round(hours / LABOUR_INCREMENT_HOURS));
    lines.push({
      kind: "labour",
      description: `${CARE_TASK_LABELS[kind]} — labour`,
      taskKind: kind,
      quantity: hours,
      unit: "h",
      unitPriceMinor: rate,
      amountMinor: mulDivHalfUp(rate, quarters, 4n),
    });
    const m = labourModel(kind, input.rates.labour);
    reasons.push(`${CARE_TASK_LABELS[kind]}: ${m.baseHours} h + ${m.hoursPerM2} h/m² × ${input.areaM2.toFixed(2)} m², rounded up to the quarter hour = ${hours} h`);
  }

  for (const [i, p] of input.products.entries()) {
    if (!kinds.includes(p.taskKind)) {
      reasons.push(`product ${p.label} is for ${p.taskKind}, which is not quoted; left out`);
      continue;
    }
    const need = productNeeded({ areaM2: input.areaM2, coats: p.coats, coverageM2PerL: p.coverageM2PerL, containerSizesMl: p.containerSizesMl });
    if (need.containers.length === 0) throw new CareInputError(`products[${i}] (${p.label}) has no container sizes`, "products.containerSizesMl");
    for (const c of need.containers) {
      const price = p.containerPricesMinor[c.sizeMl];
      if (price === undefined) throw new CareInputError(`products[${i}] (${p.label}) has no price for its ${c.sizeMl} mL container`, "products.containerPricesMinor");
      requireMinor(price, `products[${i}].containerPricesMinor[${c.sizeMl}]`);
      lines.push({
        kind: "materials",
        description: `${p.label}, ${c.sizeMl} mL`,
        product: p.label,
        sizeMl: c.sizeMl,
        taskKind: p.taskKind,
        quantity: c.count,
        unit: "container",
        unitPriceMinor: price,
        amountMinor: price * c.count,
      });
    }
    reasons.push(`${p.label}: ${need.reasons.join("; ")}`);
  }

  const t = input.travel;
  if (t) {
    if (t.flatMinor !== undefined && t.flatMinor > 0) {
      lines.push({ kind: "travel", description: "Travel", quantity: 1, unit: "trip", unitPriceMinor: requireMinor(t.flatMinor, "travel.flatMinor"), amountMinor: t.flatMinor });
    }
    if (t.distanceKm !== undefined && t.distanceKm > 0) {
      const perKm = requireMinor(t.perKmMinor ?? NaN, "travel.perKmMinor");
      requirePositive(t.distanceKm, "travel.distanceKm");
      const kmMilli = BigInt(Math.round(t.distanceKm * 1000));
      lines.push({ kind: "travel", description: `Travel, ${t.distanceKm} km`, quantity: t.distanceKm, unit: "km", unitPriceMinor: perKm, amountMinor: mulDivHalfUp(perKm, kmMilli, 1000n) });
    }
  }

  const subtotalMinor = lines.reduce((s, l) => s + l.amountMinor, 0);
  const coveredMinor = mulDivHalfUp(subtotalMinor, pctRational(input.coveredPct, "coveredPct"), PCT_DEN);
  const taxableMinor = subtotalMinor - coveredMinor;
  const taxMinor = mulDivHalfUp(taxableMinor, pctRational(input.taxRatePct, "taxRatePct"), PCT_DEN);
  const totalMinor = taxableMinor + taxMinor;
  if (input.coveredPct > 0) reasons.push(`${input.coveredPct} % covered by the warranty`);
  reasons.push(`tax ${input.taxRatePct} % on ${formatMinorUnits(taxableMinor, input.currency)} ${input.currency}, rounded half up once on the total`);
  const f = (n: number) => formatMinorUnits(n, input.currency);
  return {
    currency: input.currency,
    exponent,
    lines,
    subtotalMinor,
    coveredPct: input.coveredPct,
    coveredMinor,
    taxableMinor,
    taxRatePct: input.taxRatePct,
    taxMinor,
    totalMinor,
    display: { subtotal: f(subtotalMinor), covered: f(coveredMinor), tax: f(taxMinor), total: f(totalMinor) },
    reasons,
  };
}

/** A quote product from a catalog entry (its containers and prices), for the task it refreshes. */
export function quoteProductFromCatalog(
  entry: { id: string; name?: string; coverageM2PerL: number; containerSizesMl: readonly number[]; containerPricesMinor?: Readonly<Record<number, number>>; refreshCoats?: number },
  taskKind: CareTaskKind,
): QuoteProduct {
  if (!entry.containerPricesMinor) throw new CareInputError(`catalog product ${entry.id} has no container prices`, "catalog.containerPricesMinor");
  return {
    taskKind,
    label: entry.name ?? entry.id,
    coverageM2PerL: entry.coverageM2PerL,
    coats: entry.refreshCoats ?? 1,
    containerSizesMl: entry.containerSizesMl,
    containerPricesMinor: entry.containerPricesMinor,
  };
}
