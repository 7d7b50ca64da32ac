// The words of care reminders and refresh offers, built from a care task (pure: no database, no React).
// Templates in emails/ only lay these out. Safety copy comes from lib/care/cautions.ts.
import { topArea, type TopShape } from "@/lib/care/area";
import { diffDays } from "@/lib/care/dates";
import { productNeeded } from "@/lib/care/quantity";
import type { Quote } from "@/lib/care/quote";
import type { CareTask, CatalogEntry } from "@/lib/care/schedule";
import { cautionLine, cautionsFor as catalogueCautions } from "@/lib/care/cautions";
import { formatArea, formatDate, formatDistance, formatMoney, formatVolume, type UnitSystem } from "@/lib/format";
import { FINISH_CLASS_LABELS, type CareTaskKind, type ReminderStep } from "@/lib/care/vocabulary";

/** "2 May 2026": lib/format's date, under the name lib/reminders/compose.ts imports. */
export const longDate = (iso: string) => formatDate(iso);

export const SURFACE_WORDS: Record<CareTask["surface"], string> = { top: "top", base: "base", whole_piece: "whole piece" };

const USE_WORDS = { heavy: "heavy use", moderate: "moderate use", light: "light use", outdoor_covered: "outdoor use under cover" } as const;
const SUN_WORDS = { none: "out of the sun", indirect: "in indirect sun", direct: "in direct sun" } as const;

/** What to do, step by step, by task kind. Common practice, no published source; the product's label comes first. */
export const TASK_STEPS: Record<CareTaskKind, string[]> = {
  reoil: [
    "Clean the surface with a little mild soap in water and let it dry completely.",
    "Apply a thin coat of the oil with a lint-free cloth or pad, working along the grain.",
    "After the waiting time on the label, wipe off every bit of oil that has not soaked in.",
    "Keep cups and plates off it until it has cured as long as the label says.",
  ],
  topcoat_refresh: [
    "Clean the surface with mild soap in water and let it dry completely.",
    "Apply a very thin coat of the topcoat with the applicator the label names, one section at a time.",
    "Buff off any excess within the time on the label, then leave it to cure before use.",
  ],
  rewax: [
    "Dust the surface and wipe it with a barely damp cloth; let it dry.",
    "Rub in a thin layer of paste wax with a soft cloth, a small area at a time.",
    "Let it haze, then buff to a soft sheen with a clean cloth.",
  ],
  film_inspect: [
    "Clean the surface with mild soap in water and dry it.",
    "Look across it towards a window for worn-through patches, white rings, cracks or peeling.",
    "Do not sand or recoat a film finish yourself: if you see wear, tell the studio.",
  ],
  resin_polish: [
    "Clean the resin with mild soap in water and dry it with a soft cloth.",
    "Look for fine scratches, clouding or yellowing, and for gaps where resin meets wood.",
    "Polish light scratches by hand with the polishing compound and a soft cloth; tell the studio about anything deeper.",
  ],
  reoil_charred: [
    "Brush off dust and cobwebs gently with a soft brush — do not scrub the char.",
    "Apply a thin coat of the exterior oil with a cloth or brush and let it soak in.",
    "Wipe off what has not soaked in after the time on the label, and let it cure before the piece gets wet.",
  ],
  annual_check: [
    "Clean the whole piece with mild soap in water and dry it.",
    "Check that the base stands firm and does not wobble; look for new cracks, gaps or loose joints.",
    "If anything has moved or loosened, tell the studio rather than forcing it.",
  ],
};

const APPLIES_PRODUCT: readonly CareTaskKind[] = ["reoil", "topcoat_refresh", "rewax", "resin_polish", "reoil_charred"];

/** The cautions that apply to a task on this piece, from the one catalogue (lib/care/cautions). */
export function cautionsFor(task: Pick<CareTask, "kind" | "finishClass">, piece: { hasResin: boolean }, productName?: string): string[] {
  return catalogueCautions({ tasks: [task.kind], hasResin: piece.hasResin, audience: "owner" }).map((c) =>
    c.key === "product_label" && productName ? `Read the label and safety data sheet of ${productName} first, and follow them, including the gloves and eye protection they ask for.` : cautionLine(c),
  );
}

/** Days from the owner's date to the due date (negative: overdue). Steps can go out late (first pass after registration or downtime). */
export function daysUntil(ownerToday: string, dueOn: string): number {
  return diffDays(ownerToday, dueOn);
}

const inDays = (n: number) => (n === 1 ? "tomorrow" : `in ${n} days`);
const daysAgo = (n: number) => (n === 1 ? "yesterday" : `${n} days ago`);

export function stepHeadline(step: ReminderStep, label: string, dueOn: string, days: number): string {
  if (days > 0) return `${label} coming due on ${formatDate(dueOn)}`;
  if (days === 0) return `${label} is due today`;
  return step === "after_30d" ? `${label} is overdue` : `${label} was due on ${formatDate(dueOn)}`;
}

export function subjectFor(step: ReminderStep, label: string, pieceTitle: string, dueOn: string, days: number, surface: CareTask["surface"] = "top"): string {
  // A piece can have the same task on its top and its base; the base one says so.
  const what = `${label.toLowerCase()}${surface === "base" ? " of the base" : ""} for your ${pieceTitle}`;
  if (days > 0) return `Coming due ${formatDate(dueOn)}: ${what}`;
  if (days === 0) return `Due today: ${what}`;
  return step === "after_30d" ? `Overdue since ${formatDate(dueOn)}: ${what}` : `Due since ${formatDate(dueOn)}: ${what}`;
}

/** The opening sentence: when, relative to the owner's today. */
export function leadFor(step: ReminderStep, p: { pieceTitle: string; taskLabel: string; surface: string; dueOn: string }, days: number): string {
  const what = `${p.taskLabel.toLowerCase()} (${p.surface})`;
  if (days > 0) return `Your ${p.pieceTitle} is due for care ${inDays(days)}, on ${formatDate(p.dueOn)}: ${what}.`;
  if (days === 0) return `Your ${p.pieceTitle} is due for care today: ${what}.`;
  const last = step === "after_30d" ? " This is the last reminder for this round." : "";
  return `Your ${p.pieceTitle} was due for care on ${formatDate(p.dueOn)}, ${daysAgo(-days)}: ${what}. If you have done it, log it and we will stop reminding you.${last}`;
}

const SINCE_WORDS: Record<CareTaskKind, string> = {
  reoil: "The last oil coat",
  topcoat_refresh: "The last topcoat",
  rewax: "The last wax coat",
  film_inspect: "The finish",
  resin_polish: "The resin surface",
  reoil_charred: "The last oil coat on the charred surface",
  annual_check: "",
};

/** "12 months", "13 months and 15 days": an interval in words. */
export function monthsText(months: number, days: number): string {
  const m = months === 1 ? "1 month" : `${months} months`;
  return days > 0 ? `${m} and ${days} days` : m;
}

const BAND_WORDS = { heavy: "heavy use", moderate: "moderate use", light: "light use" } as const;

/**
 * Why a task falls when it does, in owner words (or the studio's, on its piece page: "The piece", not
 * "Your piece"): when its clock started, the use and sun it was judged for, the interval. With the
 * piece, its use and sun are named; without it, the task's own interval says the band and whether
 * direct sun shortened it.
 */
export function whyNow(task: CareTask, piece?: { use: keyof typeof USE_WORDS; sun: keyof typeof SUN_WORDS }, reader: "owner" | "studio" = "owner"): string[] {
  const interval = monthsText(task.interval.months, task.interval.days);
  const where = task.surface === "whole_piece" ? "" : ` on the ${SURFACE_WORDS[task.surface]}`;
  if (task.kind === "annual_check") {
    const from = task.clockSource === "care_log" ? `The last check was on ${formatDate(task.clockFrom)}` : `${reader === "owner" ? "Your piece" : "The piece"} was delivered on ${formatDate(task.clockFrom)}`;
    return [`${from}; we suggest a clean and check every ${interval}, so the next one is due on ${formatDate(task.dueOn)}.`];
  }
  const since =
    task.clockSource === "care_log"
      ? `This was last done${where} on ${formatDate(task.clockFrom)}, as the care log shows.`
      : `${SINCE_WORDS[task.kind]}${where} went on ${formatDate(task.clockFrom)}.`;
  const useWords = piece ? USE_WORDS[piece.use] : BAND_WORDS[task.interval.band];
  const sunWords = piece ? `, ${SUN_WORDS[piece.sun]}` : task.interval.factor !== 1 ? ", in direct sun" : "";
  const band = task.surface === "base" && task.interval.band === "light" ? "a base, which sees light wear" : useWords;
  return [since, `For ${band}${sunWords}, this finish lasts about ${interval}, so it is due on ${formatDate(task.dueOn)}.`];
}

/**
 * How a task's date was worked out, in words for the studio's staff (the piece page's "How this was
 * worked out"): where the interval came from, what direct sun did to it, the topcoat-over-oil rule, and
 * how far past due it is. Built from the task's data; the engine's own `reasons` (ISO dates, source
 * notes) stay for the API and the tests.
 */
export function howWorkedOut(task: CareTask): string[] {
  const lines: string[] = [];
  const from = task.intervalFrom;
  const finish = from.kind === "usual" && from.finishClass ? FINISH_CLASS_LABELS[from.finishClass].toLowerCase() : null;
  const base = monthsText(task.interval.baseMonths, 0);
  if (task.kind === "annual_check") lines.push(`A clean and check every ${base} is our usual interval for every piece.`);
  else if (from.kind === "catalog") lines.push(`The interval, ${base} for ${BAND_WORDS[task.interval.band]}, comes from the studio's catalog product ${from.productName ?? "for this layer"}.`);
  else lines.push(`The interval, ${base} for ${BAND_WORDS[task.interval.band]}, is our usual one for ${finish ?? "this finish"}.`);
  if (from.kind === "usual" && from.unknownProductId !== null) lines.push("The layer names a product that is no longer in the studio's catalog, so the usual interval applies.");
  if (task.interval.factor !== 1) lines.push(`Direct sun shortens it to ${monthsText(task.interval.months, task.interval.days)}.`);
  if (task.oilBeneath) {
    const t = task.oilBeneath.topcoat;
    const o = task.oilBeneath.oil;
    lines.push(
      `The hardwax oil beneath is protected by the topcoat, so refreshing the topcoat is its care, on the longer of the two intervals ` +
        `(topcoat alone ${monthsText(t.months, t.days)}, oil alone ${monthsText(o.months, o.days)}).`,
    );
  }
  const counted = task.clockSource === "care_log" ? "the care log's last entry" : task.clockSource === "delivery" ? "delivery" : "when the layer went on";
  lines.push(`Counted from ${formatDate(task.clockFrom)} (${counted}), it falls due on ${formatDate(task.dueOn)}.`);
  if (task.status === "overdue") lines.push(`It is ${-task.daysUntilDue} day${task.daysUntilDue === -1 ? "" : "s"} overdue.`);
  return lines;
}

/** How much product a refresh of this top takes, in the owner's units first. */
export function quantityText(
  task: Pick<CareTask, "surface" | "kind">,
  shape: TopShape | undefined,
  product: CatalogEntry | undefined,
  unitSystem: "metric" | "imperial",
): string | undefined {
  if (task.surface !== "top" || !shape || !product || !APPLIES_PRODUCT.includes(task.kind)) return undefined;
  const area = topArea(shape);
  const coats = product.refreshCoats ?? 1;
  const need = productNeeded({ areaM2: area.m2, coats, coverageM2PerL: product.coverageM2PerL, containerSizesMl: product.containerSizesMl });
  const amount = formatVolume(need.exactMl, unitSystem);
  const size = formatArea(area.m2, unitSystem);
  const name = product.name ?? "the product";
  const cans = need.containers.length > 0 ? ` — ${need.containers.map((c) => `${c.count} × ${formatVolume(c.sizeMl, unitSystem)}`).join(" + ")} is enough` : "";
  return `About ${amount} of ${name} for ${coats === 1 ? "one coat" : `${coats} coats`} on this top (${size})${cans}.`;
}

export type OfferView = {
  total: string;
  lines: { description: string; amount: string }[];
  tax: string;
  acceptUrl: string;
};

/** A stored quote's line in the reader's units (container sizes, travel distance); offers stored before sizes were kept read as written. */
function lineWords(l: Quote["lines"][number], units: UnitSystem): string {
  if (l.unit === "h") return `${l.description} (${l.quantity} h)`;
  if (l.unit === "container") return `${l.product && l.sizeMl ? `${l.product}, ${formatVolume(l.sizeMl, units)}` : l.description} × ${l.quantity}`;
  if (l.unit === "km") return `Travel, ${formatDistance(l.quantity, units)}`;
  return l.description;
}

export function offerView(q: Quote, acceptUrl: string, units: UnitSystem, country: string): OfferView {
  const money = (minor: number) => formatMoney(minor, q.currency, country);
  return {
    total: money(q.totalMinor),
    lines: q.lines.map((l) => ({
      description: lineWords(l, units),
      amount: money(l.amountMinor),
    })),
    tax: `${money(q.taxMinor)} tax (${q.taxRatePct} %)`,
    acceptUrl,
  };
}
