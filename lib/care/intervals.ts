import { CareInputError } from "./errors";
import type { FinishClass, SunExposure, Use } from "./vocabulary";

/** Wear interval in months for each use band. */
export interface WearIntervals {
  heavy: number;
  moderate: number;
  light: number;
}
export type UseBand = keyof WearIntervals;

/**
 * Default wear intervals, months. From memory, common practice of makers who finish
 * with these classes — no published source — except paste wax: US National Park Service,
 * *Conserve O Gram* 7/2 (rewax furnished-room furniture every one to four years; published), and the
 * six-month figure for heavily used tables, which is a conservator's post to a mailing list (a
 * Minnesota Historical Society conservator), not a publication of the society. No published
 * renewal interval exists for oil finishes (lib/care/SOURCES.md). Every studio overrides these in its catalog.
 */
export const DEFAULT_WEAR_INTERVALS: Record<FinishClass, WearIntervals> = {
  hardwax_oil: { heavy: 12, moderate: 24, light: 36 }, // from memory, common practice — no published source
  ceramic_topcoat: { heavy: 12, moderate: 18, light: 24 }, // from memory, common practice — no published source
  paste_wax: { heavy: 6, moderate: 12, light: 12 }, // 12: within NPS Conserve O Gram 7/2's 1–4 years; 6 (heavy): a conservator's list post
  film_finish: { heavy: 24, moderate: 36, light: 60 }, // from memory, common practice — no published source
  epoxy_surface: { heavy: 24, moderate: 36, light: 48 }, // from memory, common practice — no published source
  charred_oiled: { heavy: 12, moderate: 36, light: 36 }, // from memory, common practice — no published source
};

/** Where each default interval comes from: a record for code and tests, never put in words shown to people. */
export const DEFAULT_INTERVAL_SOURCE: Record<FinishClass, string> = {
  hardwax_oil: "default interval, from memory, common practice — no published source",
  ceramic_topcoat: "default interval, from memory, common practice — no published source",
  paste_wax: "default interval after NPS Conserve O Gram 7/2 (one to four years) and, for heavy use, a conservator's list post (six months)",
  film_finish: "default interval, from memory, common practice — no published source",
  epoxy_surface: "default interval, from memory, common practice — no published source",
  charred_oiled: "default interval, from memory, common practice — no published source",
};

/** Yearly clean-and-check of the whole piece: from memory, common practice — no published source. */
export const ANNUAL_CHECK_MONTHS = 12;

/** Direct sun shortens wear intervals to three quarters (from memory, common practice). */
export const DIRECT_SUN_FACTOR = 0.75;

/**
 * Days for a fractional month when the sun factor leaves one (18 × 0.75 = 13.5 months): the fraction ×
 * 30 days, rounded to a whole day, added after the whole months (which clamp to month end). So
 * 13.5 months = 13 months + 15 days. A fixed 30 keeps the result independent of the month it falls in.
 */
export const DAYS_PER_FRACTIONAL_MONTH = 30;

export interface EffectiveInterval {
  months: number;
  days: number;
  /** Months before the sun factor. */
  baseMonths: number;
  factor: number;
  band: UseBand;
  /** e.g. "12 mo × 0.75 = 9 mo". */
  text: string;
}

/** Outdoor covered pieces use the heavy interval. */
export function bandForUse(use: Use): UseBand {
  switch (use) {
    case "heavy":
    case "outdoor_covered":
      return "heavy";
    case "moderate":
      return "moderate";
    case "light":
      return "light";
    default:
      throw new CareInputError(`unknown use ${JSON.stringify(use)}`, "piece.use");
  }
}

export function formatMonthsDays(months: number, days: number): string {
  return days === 0 ? `${months} mo` : `${months} mo ${days} d`;
}

export function effectiveInterval(intervals: WearIntervals, band: UseBand, sun: SunExposure): EffectiveInterval {
  const baseMonths = intervals[band];
  if (typeof baseMonths !== "number" || !Number.isFinite(baseMonths) || baseMonths <= 0) {
    throw new CareInputError(`wear interval for ${band} use must be a number of months > 0, got ${String(baseMonths)}`, "catalog.intervals");
  }
  const factor = sun === "direct" ? DIRECT_SUN_FACTOR : 1;
  const scaled = baseMonths * factor;
  let months = Math.floor(scaled + 1e-9);
  let days = Math.round((scaled - months) * DAYS_PER_FRACTIONAL_MONTH);
  if (days >= DAYS_PER_FRACTIONAL_MONTH) {
    months += 1;
    days = 0;
  }
  const result = formatMonthsDays(months, days);
  const text = factor === 1 ? result : `${baseMonths} mo × ${factor} = ${result}`;
  return { months, days, baseMonths, factor, band, text };
}
