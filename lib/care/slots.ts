import { addDays, assertTimeZone, isoWeekday, localDate, localDateTime, parseHhMm, toEpochMs, zonedTimeToEpochMs, type InstantInput, type IsoDate } from "./dates";
import { CareInputError, requireNonNegative, requirePositive } from "./errors";

/** One working-hours range in the studio's time zone: ISO weekday (1 = Monday … 7 = Sunday), local "HH:MM". */
export interface WorkingHours {
  weekday: number;
  start: string;
  end: string;
}

export interface BusyInterval {
  start: InstantInput;
  end: InstantInput;
}

export interface AvailableSlotsInput {
  workingHours: readonly WorkingHours[];
  /** IANA time zone of the working hours, e.g. "America/New_York". */
  timeZone: string;
  /** Visits already booked for this technician. */
  existing: readonly BusyInterval[];
  durationMin: number;
  /** Travel buffer kept free before and after every existing visit. */
  bufferMin: number;
  /** No slot starts before now + leadTimeHours. */
  leadTimeHours: number;
  from: InstantInput;
  to: InstantInput;
  /** Candidate starts every stepMin minutes from the start of each working range. */
  stepMin: number;
  /** Default Date.now(); pass it for reproducible results. */
  now?: InstantInput;
}

export interface Slot {
  /** ISO 8601 UTC instants. */
  start: string;
  end: string;
  startMs: number;
  endMs: number;
  /** Local date and wall times in the studio's time zone. */
  localDate: IsoDate;
  localStart: string;
  localEnd: string;
}

const MINUTE = 60_000;
const MAX_RANGE_DAYS = 400;

function hhmm(ms: number, timeZone: string): string {
  const l = localDateTime(ms, timeZone);
  return `${String(l.hour).padStart(2, "0")}:${String(l.minute).padStart(2, "0")}`;
}

/**
 * Free visit slots. Working hours are wall-clock times in `timeZone`, converted per date, so a 09:00
 * start stays 09:00 local on daylight-saving change days. A slot lies wholly inside one working range,
 * ends by `to`, starts at or after max(from, now + lead time), and keeps `bufferMin` clear of every
 * existing visit on both sides.
 */
export function availableSlots(input: AvailableSlotsInput): Slot[] {
  const { workingHours, timeZone, existing } = input;
  assertTimeZone(timeZone);
  const durationMs = requirePositive(input.durationMin, "durationMin") * MINUTE;
  const bufferMs = requireNonNegative(input.bufferMin, "bufferMin") * MINUTE;
  const stepMs = requirePositive(input.stepMin, "stepMin") * MINUTE;
  const leadMs = requireNonNegative(input.leadTimeHours, "leadTimeHours") * 60 * MINUTE;
  const fromMs = toEpochMs(input.from, "from");
  const toMs = toEpochMs(input.to, "to");
  if (toMs <= fromMs) throw new CareInputError("to must be after from", "to");
  if (toMs - fromMs > MAX_RANGE_DAYS * 1440 * MINUTE) throw new CareInputError(`the search range may span at most ${MAX_RANGE_DAYS} days`, "to");
  const nowMs = input.now === undefined ? Date.now() : toEpochMs(input.now, "now");
  const earliest = Math.max(fromMs, nowMs + leadMs);

  const ranges = workingHours.map((w, i) => {
    if (!Number.isInteger(w.weekday) || w.weekday < 1 || w.weekday > 7) {
      throw new CareInputError(`workingHours[${i}].weekday must be 1 (Monday) to 7 (Sunday), got ${w.weekday}`, "workingHours.weekday");
    }
    const start = parseHhMm(w.start, `workingHours[${i}].start`);
    const end = parseHhMm(w.end, `workingHours[${i}].end`);
    if (end <= start) throw new CareInputError(`workingHours[${i}] ends (${w.end}) before it starts (${w.start})`, "workingHours.end");
    return { weekday: w.weekday, start, end };
  });
  const busy = existing
    .map((e, i) => {
      const s = toEpochMs(e.start, `existing[${i}].start`);
      const en = toEpochMs(e.end, `existing[${i}].end`);
      if (en < s) throw new CareInputError(`existing[${i}] ends before it starts`, "existing");
      return { start: s - bufferMs, end: en + bufferMs };
    })
    .sort((a, b) => a.start - b.start);

  const slots: Slot[] = [];
  const lastDate = localDate(toMs, timeZone);
  // Start one day early so a range that began the previous local day is not missed.
  for (let date = addDays(localDate(fromMs, timeZone), -1); date <= lastDate; date = addDays(date, 1)) {
    const weekday = isoWeekday(date);
    for (const r of ranges) {
      if (r.weekday !== weekday) continue;
      const rangeStart = zonedTimeToEpochMs(date, r.start, timeZone);
      const rangeEnd = zonedTimeToEpochMs(date, r.end, timeZone);
      for (let s = rangeStart; s + durationMs <= rangeEnd; s += stepMs) {
        const e = s + durationMs;
        if (s < earliest || e > toMs) continue;
        if (busy.some((b) => s < b.end && e > b.start)) continue;
        slots.push({
          start: new Date(s).toISOString(),
          end: new Date(e).toISOString(),
          startMs: s,
          endMs: e,
          localDate: localDate(s, timeZone),
          localStart: hhmm(s, timeZone),
          localEnd: hhmm(e, timeZone),
        });
      }
    }
  }
  slots.sort((a, b) => a.startMs - b.startMs);
  // Overlapping working ranges could yield the same start twice.
  return slots.filter((s, i) => i === 0 || s.startMs !== slots[i - 1]!.startMs);
}
