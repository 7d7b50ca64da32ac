// lib/plans/savings: what a plan would have saved over the last year of the owner's own care log.
// The rule (each logged task the plan includes, priced as a one-off studio visit, against a year of
// the plan) is the product's own definition — common practice, no published source. Every figure
// below is worked by hand from the inputs; nothing reads the real clock.
import { describe, expect, it } from "vitest";
import type { CareTaskKind } from "@/lib/care/vocabulary";
import { lastYearSavings, planYearMinor, type LoggedCare } from "@/lib/plans/savings";

const today = "2026-12-03";
const prices: Partial<Record<CareTaskKind, number>> = { reoil: 18_500, rewax: 9_000 };
const priceOfTask = (k: CareTaskKind) => prices[k] ?? null;
const base = { today, includedTasks: ["reoil", "rewax"] as CareTaskKind[], priceOfTask, planPerIntervalMinor: 24_000, interval: "year" as const };

describe("lastYearSavings", () => {
  it("prices each included task logged in the last 365 days and sets a year of the plan against it", () => {
    const log: LoggedCare[] = [
      { taskKind: "reoil", doneOn: "2026-03-10" },
      { taskKind: "reoil", doneOn: "2026-09-01" },
      { taskKind: "rewax", doneOn: "2026-12-03" }, // today counts
    ];
    // 18 500 + 18 500 + 9 000 = 46 000; a yearly plan of 24 000 → saved 22 000.
    expect(lastYearSavings({ ...base, log })).toEqual({ entries: 3, wouldHaveCostMinor: 46_000, planYearMinor: 24_000, savedMinor: 22_000 });
  });

  it("leaves out care older than a year, dated after today, or not included in the plan", () => {
    const log: LoggedCare[] = [
      { taskKind: "reoil", doneOn: "2025-12-03" }, // 365 days back: the first day of the window
      { taskKind: "reoil", doneOn: "2025-12-02" }, // 366 days back: outside
      { taskKind: "reoil", doneOn: "2026-12-04" }, // tomorrow: outside
      { taskKind: "annual_check", doneOn: "2026-06-01" }, // not in the plan
    ];
    expect(lastYearSavings({ ...base, log })).toEqual({ entries: 1, wouldHaveCostMinor: 18_500, planYearMinor: 24_000, savedMinor: -5_500 });
  });

  it("counts a monthly plan as twelve months", () => {
    // 2 × 18 500 = 37 000 against 12 × 2 500 = 30 000 → 7 000.
    const log: LoggedCare[] = [
      { taskKind: "reoil", doneOn: "2026-01-15" },
      { taskKind: "reoil", doneOn: "2026-07-15" },
    ];
    expect(lastYearSavings({ ...base, log, planPerIntervalMinor: 2_500, interval: "month" })).toMatchObject({ planYearMinor: 30_000, savedMinor: 7_000 });
    expect(planYearMinor(2_500, "month")).toBe(30_000);
    expect(planYearMinor(24_000, "year")).toBe(24_000);
  });

  it("states nothing without a logged task the plan includes, or one the studio can't price", () => {
    expect(lastYearSavings({ ...base, log: [] })).toBeNull();
    expect(lastYearSavings({ ...base, log: [{ taskKind: "annual_check", doneOn: "2026-06-01" }] })).toBeNull();
    expect(lastYearSavings({ ...base, includedTasks: ["topcoat_refresh"], log: [{ taskKind: "topcoat_refresh", doneOn: "2026-06-01" }] })).toBeNull();
  });
});
