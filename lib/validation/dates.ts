// The one date field of every form, action, route and query string: a real calendar date
// "YYYY-MM-DD" within a range that fits what the date is. A date far outside any sensible range
// (9999-12-31, 0001-01-01) is a typo, and the care engine, the calendars and the reports can't
// compute with it, so it is refused here with words a person can act on.
//
// Bounds that move with the calendar ("not after tomorrow") are read when a value is parsed, never
// when the module loads. "Tomorrow" is tomorrow in UTC, which is on or after today in every time zone;
// the checks that need a person's own today (the care log, a visit report) stay in lib/.
import { z } from "zod";
import { addDays, addMonths } from "@/lib/care/dates";
import { formatDate } from "@/lib/format";

const DATE_RE = /^\d{4}-\d{2}-\d{2}$/;

/** No record a studio keeps starts before this. */
export const EARLIEST_DATE = "1900-01-01";
/** Nothing is planned after this; with EARLIEST_DATE, the range rows are read back within (lib/pieces/care-inputs). */
export const LATEST_DATE = "2199-12-31";

export function isRealDate(s: string): boolean {
  if (!DATE_RE.test(s)) return false;
  const d = new Date(`${s}T00:00:00Z`);
  return !Number.isNaN(d.getTime()) && d.toISOString().slice(0, 10) === s;
}

/** Today's date in UTC. */
export function utcToday(now: Date | number = Date.now()): string {
  return new Date(now).toISOString().slice(0, 10);
}

/** A stored date moved into [EARLIEST_DATE, LATEST_DATE], for computations over rows written before the ranges existed. */
export function clampStoredDate(s: string): string {
  return s < EARLIEST_DATE ? EARLIEST_DATE : s > LATEST_DATE ? LATEST_DATE : s;
}

/** "2 Dec 2026" in messages (UTC calendar date, no zone involved). */
function spoken(iso: string): string {
  return formatDate(iso, { short: true });
}

type Bound = string | (() => string);
const read = (b: Bound) => (typeof b === "function" ? b() : b);

export type DateFieldOptions = {
  /** Earliest accepted date (inclusive); a function is read at parse time. */
  min: Bound;
  /** Latest accepted date (inclusive); a function is read at parse time. */
  max: Bound;
  /** When nothing (or not a string) is given, e.g. "Pick the date you did it." */
  required?: string;
  /** When the date is before min; defaults to "Pick {min} or later." */
  tooEarly?: (min: string) => string;
  /** When the date is after max; defaults to "Pick {max} or earlier." */
  tooLate?: (max: string) => string;
};

/** A "YYYY-MM-DD" field: a real date within [min, max]. */
export function dateField(opts: DateFieldOptions) {
  const required = opts.required ?? "Enter a date.";
  return z
    .string({ error: required })
    .trim()
    .superRefine((s, ctx) => {
      if (!DATE_RE.test(s)) return void ctx.addIssue({ code: "custom", message: s ? "Use a real date, YYYY-MM-DD." : required });
      if (!isRealDate(s)) return void ctx.addIssue({ code: "custom", message: "That date doesn't exist." });
      const min = read(opts.min);
      const max = read(opts.max);
      if (s < min) ctx.addIssue({ code: "custom", message: opts.tooEarly ? opts.tooEarly(min) : `Pick ${spoken(min)} or later.` });
      else if (s > max) ctx.addIssue({ code: "custom", message: opts.tooLate ? opts.tooLate(max) : `Pick ${spoken(max)} or earlier.` });
    });
}

/**
 * Something that has happened: a delivery, a pour, a finish layer, care done, damage noticed. Not
 * before 1900, not after tomorrow.
 */
export const pastDate = (required?: string) =>
  dateField({
    min: EARLIEST_DATE,
    max: () => addDays(utcToday(), 1),
    required,
    tooEarly: () => "That date is before 1900; check the year.",
    tooLate: () => "That date is in the future; pick today or an earlier day.",
  });

/** How far back and ahead a warranty policy version may take effect. */
export const POLICY_YEARS_BACK = 10;
export const POLICY_YEARS_AHEAD = 2;
/** A warranty policy's start: within 10 years back and 2 years ahead of today. */
export const policyDate = () =>
  dateField({
    min: () => addMonths(utcToday(), -12 * POLICY_YEARS_BACK),
    max: () => addMonths(utcToday(), 12 * POLICY_YEARS_AHEAD),
    tooEarly: (min) => `A policy can take effect from ${spoken(min)} at the earliest.`,
    tooLate: (max) => `A policy can take effect up to ${spoken(max)}; pick an earlier date.`,
  });

/** How far ahead visits, days off and the calendar go. */
export const VISIT_YEARS_AHEAD = 2;
/**
 * A day in the visit calendar (days off, the technician's day, a calendar week): from 1900 (past
 * weeks stay readable; booking in the past is refused by lib/visits) to two years ahead.
 */
export const visitDay = () =>
  dateField({
    min: EARLIEST_DATE,
    max: () => addMonths(utcToday(), 12 * VISIT_YEARS_AHEAD),
    tooEarly: () => "That date is before 1900; check the year.",
    tooLate: (max) => `Visits are planned up to ${spoken(max)}; pick an earlier day.`,
  });

/**
 * A layer recorded in a visit report: from 1900 to the end of the visit calendar. The report itself
 * checks it against the studio's today (lib/visits/report.ts submitReport) with the visit's clock.
 */
export const visitRecordDate = () =>
  dateField({ min: EARLIEST_DATE, max: () => addMonths(utcToday(), 12 * VISIT_YEARS_AHEAD), tooEarly: () => "That date is before 1900; check the year." });

/** A filter's date in a query string (reports, audit, lists): 1900 to 2199, so any real period can be asked for. */
export const filterDate = () => dateField({ min: EARLIEST_DATE, max: LATEST_DATE, tooEarly: () => "That date is before 1900; check the year.", tooLate: () => "That date is after 2199; check the year." });
