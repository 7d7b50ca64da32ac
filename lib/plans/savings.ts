// What a care plan would have saved an owner over the last year of their own care log: each logged
// care task the plan includes, priced as the studio would have charged a visit doing it, against a
// year of the plan's price. Computed from the log, never estimated: with nothing logged that the plan
// includes, there is no saving to state (null). Pure: no database, no clock.
import { addDays, type IsoDate } from "@/lib/care/dates";
import type { CareTaskKind } from "@/lib/care/vocabulary";
import type { PlanInterval } from "./terms";

export type LoggedCare = { taskKind: CareTaskKind; doneOn: IsoDate };

export type LastYearSavings = {
  /** Logged care entries of the last year that the plan includes. */
  entries: number;
  /** Those entries priced as the studio would have charged them. */
  wouldHaveCostMinor: number;
  /** A year of the plan (twelve months of a monthly plan), tax included. */
  planYearMinor: number;
  /** wouldHaveCostMinor − planYearMinor; negative when the plan costs more than that year's care did. */
  savedMinor: number;
};

/** The days a "last year" covers: from 365 days before `today` up to `today`, both included. */
export const LAST_YEAR_DAYS = 365;

/** A year of the plan's price: one yearly interval or twelve monthly ones. */
export function planYearMinor(
  perIntervalMinor: number,
  interval: PlanInterval,
): number {
  return interval === "month" ? perIntervalMinor * 12 : perIntervalMinor;
}

/**
 * The saving over the last year of the log. `priceOfTask` is the studio's one-off price for a visit
 * doing that task (tax included); a task it can't price is left out rather than guessed.
 */
export function lastYearSavings(input: {
  log: readonly LoggedCare[];
  today: IsoDate;
  includedTasks: readonly CareTaskKind[];
  priceOfTask: (kind: CareTaskKind) => number | null;
  planPerIntervalMinor: number;
  interval: PlanInterval;
}): LastYearSavings | null {
  const since = addDays(input.today, -LAST_YEAR_DAYS);
  const prices = new Map<CareTaskKind, number | null>();
  let entries = 0;
  let wouldHaveCostMinor = 0;
  for (const e of input.log) {
    if (
      e.doneOn < since ||
      e.doneOn > input.today ||
      !input.includedTasks.includes(e.taskKind)
    )
      continue;
    if (!prices.has(e.taskKind))
      prices.set(e.taskKind, input.priceOfTask(e.taskKind));
    const price = prices.get(e.taskKind);
    if (price == null) continue;
    entries++;
    wouldHaveCostMinor += price;
  }
  if (entries === 0) return null;
  const year = planYearMinor(input.planPerIntervalMinor, input.interval);
  return {
    entries,
    wouldHaveCostMinor,
    planYearMinor: year,
    savedMinor: wouldHaveCostMinor - year,
  };
}
