// Calendar dates (YYYY-MM-DD, proleptic Gregorian) and time-zone conversion with Intl only.
import { CareInputError } from "./errors";

/** A calendar date "YYYY-MM-DD" with no time zone. */
export type IsoDate = string;
/** An instant: a Date, epoch milliseconds, or an ISO 8601 string with an offset or Z. */
export type InstantInput = Date | number | string;

/** "DDDD-DD-DD" without a regular expression (the 100,000-piece benchmark parses millions of dates). */
function isDateShape(s: string): boolean {
  if (s.length !== 10 || s.charCodeAt(4) !== 45 || s.charCodeAt(7) !== 45) return false;
  for (let i = 0; i < 10; i++) {
    if (i === 4 || i === 7) continue;
    const c = s.charCodeAt(i);
    if (c < 48 || c > 57) return false;
  }
  return true;
}
const MS_PER_DAY = 86_400_000;
const MS_PER_MINUTE = 60_000;

export interface YMD {
  year: number;
  month: number; // 1–12
  day: number;
}

const isLeapYear = (y: number): boolean => (y % 4 === 0 && y % 100 !== 0) || y % 400 === 0;
const MONTH_DAYS = [31, 28, 31, 30, 31, 30, 31, 31, 30, 31, 30, 31];

export function daysInMonth(year: number, month: number): number {
  return month === 2 && isLeapYear(year) ? 29 : MONTH_DAYS[month - 1]!;
}

// Days from civil / civil from days (proleptic Gregorian), after H. Hinnant's "chrono-compatible
// low-level date algorithms" — plain integer arithmetic, fast enough for the 100,000-piece benchmark.
function daysFromCivil(y: number, m: number, d: number): number {
  y -= m <= 2 ? 1 : 0;
  const era = Math.floor(y / 400);
  const yoe = y - era * 400;
  const doy = Math.floor((153 * (m + (m > 2 ? -3 : 9)) + 2) / 5) + d - 1;
  const doe = yoe * 365 + Math.floor(yoe / 4) - Math.floor(yoe / 100) + doy;
  return era * 146097 + doe - 719468;
}

function civilFromDays(z: number): YMD {
  z += 719468;
  const era = Math.floor(z / 146097);
  const doe = z - era * 146097;
  const yoe = Math.floor((doe - Math.floor(doe / 1460) + Math.floor(doe / 36524) - Math.floor(doe / 146096)) / 365);
  const doy = doe - (365 * yoe + Math.floor(yoe / 4) - Math.floor(yoe / 100));
  const mp = Math.floor((5 * doy + 2) / 153);
  const day = doy - Math.floor((153 * mp + 2) / 5) + 1;
  const month = mp < 10 ? mp + 3 : mp - 9;
  return { year: yoe + era * 400 + (month <= 2 ? 1 : 0), month, day };
}

function digits(s: string, from: number, to: number): number {
  let n = 0;
  for (let i = from; i < to; i++) n = n * 10 + (s.charCodeAt(i) - 48);
  return n;
}

export function parseIsoDate(value: string, field = "date"): YMD {
  if (typeof value !== "string" || !isDateShape(value)) {
    throw new CareInputError(`${field} must be a date like 2025-03-02, got ${JSON.stringify(value)}`, field);
  }
  const year = digits(value, 0, 4);
  const month = digits(value, 5, 7);
  const day = digits(value, 8, 10);
  if (month < 1 || month > 12 || day < 1 || day > daysInMonth(year, month)) {
    throw new CareInputError(`${field} is not a calendar date: ${value}`, field);
  }
  return { year, month, day };
}

const pad2 = (n: number): string => (n < 10 ? `0${n}` : String(n));
const pad4 = (n: number): string => String(n).padStart(4, "0");

export function formatIsoDate({ year, month, day }: YMD): IsoDate {
  return `${pad4(year)}-${pad2(month)}-${pad2(day)}`;
}

/** Days since 1970-01-01 of a calendar date. */
export function toDayNumber(date: IsoDate, field?: string): number {
  const { year, month, day } = parseIsoDate(date, field);
  return daysFromCivil(year, month, day);
}

export function fromDayNumber(dayNumber: number): IsoDate {
  return formatIsoDate(civilFromDays(dayNumber));
}

export function addDays(date: IsoDate, days: number): IsoDate {
  return fromDayNumber(toDayNumber(date) + days);
}

/** b − a in whole days. */
export function diffDays(a: IsoDate, b: IsoDate): number {
  return toDayNumber(b) - toDayNumber(a);
}

/**
 * Calendar-month addition that clamps to the end of the target month:
 * 2025-01-31 + 1 month = 2025-02-28, 2024-01-31 + 1 month = 2024-02-29. Same rule as Luxon's plus({ months }).
 */
export function addMonths(date: IsoDate, months: number, field?: string): IsoDate {
  if (!Number.isInteger(months)) throw new CareInputError(`months must be a whole number, got ${months}`, "months");
  const { year, month, day } = parseIsoDate(date, field);
  const total = year * 12 + (month - 1) + months;
  const y = Math.floor(total / 12);
  const m = total - y * 12 + 1;
  return formatIsoDate({ year: y, month: m, day: Math.min(day, daysInMonth(y, m)) });
}

/** ISO weekday of a calendar date: 1 = Monday … 7 = Sunday. */
export function isoWeekday(date: IsoDate): number {
  const dow = (((toDayNumber(date) + 4) % 7) + 7) % 7; // 1970-01-01 was a Thursday (4)
  return dow === 0 ? 7 : dow;
}

export function toEpochMs(value: InstantInput, field = "instant"): number {
  let ms: number;
  if (value instanceof Date) ms = value.getTime();
  else if (typeof value === "number") ms = value;
  else if (typeof value === "string" && /[zZ]|[+-]\d{2}:?\d{2}$/.test(value)) ms = Date.parse(value);
  else throw new CareInputError(`${field} must be a Date, epoch milliseconds, or an ISO string with Z or an offset, got ${JSON.stringify(value)}`, field);
  if (!Number.isFinite(ms)) throw new CareInputError(`${field} is not a valid instant: ${String(value)}`, field);
  return ms;
}

// ---- time zones (Intl) ----

const formatters = new Map<string, Intl.DateTimeFormat>();

function formatterFor(timeZone: string): Intl.DateTimeFormat {
  let f = formatters.get(timeZone);
  if (!f) {
    try {
      f = new Intl.DateTimeFormat("en-US", {
        timeZone,
        hourCycle: "h23",
        year: "numeric",
        month: "numeric",
        day: "numeric",
        hour: "numeric",
        minute: "numeric",
        second: "numeric",
      });
    } catch {
      throw new CareInputError(`unknown time zone ${JSON.stringify(timeZone)}; use an IANA name like Europe/Berlin`, "timeZone");
    }
    formatters.set(timeZone, f);
  }
  return f;
}

export function assertTimeZone(timeZone: string): void {
  formatterFor(timeZone);
}

export interface LocalDateTime extends YMD {
  hour: number;
  minute: number;
  second: number;
}

/** Wall-clock fields of an instant in a time zone. */
export function localDateTime(ms: number, timeZone: string): LocalDateTime {
  const out: LocalDateTime = { year: 0, month: 0, day: 0, hour: 0, minute: 0, second: 0 };
  for (const p of formatterFor(timeZone).formatToParts(new Date(ms))) {
    if (p.type === "year") out.year = Number(p.value);
    else if (p.type === "month") out.month = Number(p.value);
    else if (p.type === "day") out.day = Number(p.value);
    else if (p.type === "hour") out.hour = Number(p.value) % 24;
    else if (p.type === "minute") out.minute = Number(p.value);
    else if (p.type === "second") out.second = Number(p.value);
  }
  return out;
}

/** The calendar date of an instant in a time zone. */
export function localDate(instant: InstantInput, timeZone: string): IsoDate {
  return formatIsoDate(localDateTime(toEpochMs(instant), timeZone));
}

/** UTC offset of a time zone at an instant, in milliseconds (local − UTC), to the whole second. */
export function offsetMs(ms: number, timeZone: string): number {
  const t = Math.floor(ms / 1000) * 1000;
  const l = localDateTime(t, timeZone);
  return Date.UTC(l.year, l.month - 1, l.day, l.hour, l.minute, l.second) - t;
}

const HHMM_RE = /^([01]\d|2[0-4]):([0-5]\d)$/;

/** Minutes after local midnight of "HH:MM" (00:00–24:00). */
export function parseHhMm(value: string, field = "time"): number {
  const m = typeof value === "string" ? HHMM_RE.exec(value) : null;
  const minutes = m ? Number(m[1]) * 60 + Number(m[2]) : NaN;
  if (!m || minutes > 24 * 60) throw new CareInputError(`${field} must be a time like 09:00 (00:00–24:00), got ${JSON.stringify(value)}`, field);
  return minutes;
}

/**
 * The instant of a local wall time in a time zone. Disambiguation follows RFC 5545 §3.3.5 (from memory):
 * a wall time that occurs twice (clocks go back) means the first occurrence; one that does not exist
 * (clocks go forward) is read with the offset in force before the gap, so 02:30 on a spring-forward
 * night in New York becomes 03:30 EDT.
 */
export function zonedTimeToEpochMs(date: IsoDate, minutesAfterMidnight: number, timeZone: string): number {
  const { year, month, day } = parseIsoDate(date);
  const wall = Date.UTC(year, month - 1, day) + minutesAfterMidnight * MS_PER_MINUTE;
  const before = offsetMs(wall - MS_PER_DAY, timeZone);
  const after = offsetMs(wall + MS_PER_DAY, timeZone);
  const candidates: number[] = [];
  for (const o of before === after ? [before] : [before, after]) {
    const t = wall - o;
    if (offsetMs(t, timeZone) === o) candidates.push(t);
  }
  if (candidates.length === 0) return wall - before; // in a gap
  return Math.min(...candidates);
}
