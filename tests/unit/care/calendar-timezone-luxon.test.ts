import fc from "fast-check";
import { DateTime } from "luxon";
import { describe, expect, it } from "vitest";
import { addMonths, addDays, diffDays, isoWeekday, localDate, zonedTimeToEpochMs } from "@/lib/care";

// Not a reference test (no published values): a differential check against Luxon 3.7 (npm "luxon"), a general-purpose date library backed by the IANA time
// zone data of the runtime. lib/care uses Intl only; these checks compare the two on generated inputs.
const ZONES = ["America/New_York", "Europe/Berlin", "UTC", "Asia/Tokyo", "Australia/Sydney"] as const;

const dateArb = fc
  .date({ min: new Date(Date.UTC(1990, 0, 1)), max: new Date(Date.UTC(2060, 11, 31)), noInvalidDate: true })
  .map((d) => d.toISOString().slice(0, 10));
// Month-end and leap days are where clamping happens: bias towards them.
const monthEndArb = fc
  .record({ y: fc.integer({ min: 1990, max: 2060 }), m: fc.integer({ min: 1, max: 12 }), back: fc.integer({ min: 0, max: 3 }) })
  .map(({ y, m, back }) => DateTime.utc(y, m, 1).endOf("month").minus({ days: back }).toISODate()!);

describe("calendar-month arithmetic against Luxon's plus({ months }) (clamps to month end)", () => {
  it("31 Jan + 1 month = 28 Feb, or 29 Feb in a leap year", () => {
    expect(addMonths("2025-01-31", 1)).toBe("2025-02-28");
    expect(addMonths("2024-01-31", 1)).toBe("2024-02-29");
    expect(addMonths("2024-02-29", 12)).toBe("2025-02-28");
    expect(addMonths("2025-03-31", -1)).toBe("2025-02-28");
  });

  it("matches Luxon on 400 generated dates and month counts, biased to month ends", () => {
    fc.assert(
      fc.property(fc.oneof(dateArb, monthEndArb), fc.integer({ min: -120, max: 120 }), (date, months) => {
        expect(addMonths(date, months)).toBe(DateTime.fromISO(date, { zone: "utc" }).plus({ months }).toISODate());
      }),
      { numRuns: 400 },
    );
  });

  it("day arithmetic and ISO weekday match Luxon on 300 generated dates", () => {
    fc.assert(
      fc.property(dateArb, fc.integer({ min: -800, max: 800 }), (date, days) => {
        const l = DateTime.fromISO(date, { zone: "utc" });
        expect(addDays(date, days)).toBe(l.plus({ days }).toISODate());
        expect(diffDays(date, addDays(date, days))).toBe(days);
        expect(isoWeekday(date)).toBe(l.weekday);
      }),
      { numRuns: 300 },
    );
  });
});

describe("time zones against Luxon", () => {
  const instantArb = fc.integer({ min: Date.UTC(1995, 0, 1), max: Date.UTC(2055, 0, 1) });

  it("the local date of an instant matches Luxon on 300 generated instants in 5 zones", () => {
    fc.assert(
      fc.property(instantArb, fc.constantFrom(...ZONES), (ms, zone) => {
        expect(localDate(ms, zone)).toBe(DateTime.fromMillis(ms, { zone }).toISODate());
      }),
      { numRuns: 300 },
    );
  });

  it("a local wall time maps to the instant Luxon shows as that wall time (300 generated, incl. DST days)", () => {
    // Bias to DST change days: the 2nd Sunday of March / 1st Sunday of November (US), last Sundays of March / October (EU).
    const dstDayArb = fc.record({ y: fc.integer({ min: 2000, max: 2050 }), which: fc.integer({ min: 0, max: 3 }) }).map(({ y, which }) => {
      if (which === 0) return DateTime.utc(y, 3, 8).plus({ days: (7 - DateTime.utc(y, 3, 8).weekday) % 7 }).toISODate()!;
      if (which === 1) return DateTime.utc(y, 11, 1).plus({ days: (7 - DateTime.utc(y, 11, 1).weekday) % 7 }).toISODate()!;
      const last = DateTime.utc(y, which === 2 ? 3 : 10, 31);
      return last.minus({ days: last.weekday % 7 }).toISODate()!;
    });
    fc.assert(
      fc.property(fc.oneof(dateArb, dstDayArb), fc.integer({ min: 0, max: 24 * 60 - 1 }), fc.constantFrom(...ZONES), (date, minute, zone) => {
        const ours = zonedTimeToEpochMs(date, minute, zone);
        const [y, mo, d] = date.split("-").map(Number) as [number, number, number];
        const want = { year: y, month: mo, day: d, hour: Math.floor(minute / 60), minute: minute % 60 };
        const luxon = DateTime.fromObject(want, { zone });
        const shown = DateTime.fromMillis(ours, { zone });
        const exists = shown.hour === want.hour && shown.minute === want.minute && shown.day === d;
        if (exists) {
          // Luxon picks the later of two occurrences when clocks go back; we take the first (RFC 5545 §3.3.5), so ours ≤ Luxon's.
          expect(ours).toBeLessThanOrEqual(luxon.toMillis());
          expect(luxon.toMillis() - ours === 0 || luxon.toMillis() - ours === 3_600_000).toBe(true);
        } else {
          // A wall time skipped by spring-forward: both shift it forward by the gap.
          expect(ours).toBe(luxon.toMillis());
        }
      }),
      { numRuns: 300 },
    );
  });

  it("DST change days: 09:00 stays 09:00 local in America/New_York and Europe/Berlin", () => {
    const cases: Array<[string, string, string]> = [
      ["America/New_York", "2025-03-09", "2025-03-09T13:00:00.000Z"], // spring forward: EDT, UTC−4
      ["America/New_York", "2025-11-02", "2025-11-02T14:00:00.000Z"], // fall back: EST, UTC−5
      ["Europe/Berlin", "2025-03-30", "2025-03-30T07:00:00.000Z"], // CEST, UTC+2
      ["Europe/Berlin", "2025-10-26", "2025-10-26T08:00:00.000Z"], // CET, UTC+1
    ];
    for (const [zone, date, iso] of cases) {
      const ms = zonedTimeToEpochMs(date, 9 * 60, zone);
      expect(new Date(ms).toISOString()).toBe(iso);
      expect(DateTime.fromISO(`${date}T09:00`, { zone }).toMillis()).toBe(ms);
    }
  });

  it("ambiguous and skipped wall times on DST days (RFC 5545 §3.3.5 rule, from memory)", () => {
    // 01:30 on 2025-11-02 in New York happens twice: the first occurrence is EDT (05:30Z).
    expect(new Date(zonedTimeToEpochMs("2025-11-02", 90, "America/New_York")).toISOString()).toBe("2025-11-02T05:30:00.000Z");
    // 02:30 on 2025-03-09 does not exist in New York: read with the offset before the gap → 03:30 EDT (07:30Z).
    expect(new Date(zonedTimeToEpochMs("2025-03-09", 150, "America/New_York")).toISOString()).toBe("2025-03-09T07:30:00.000Z");
    // 02:30 on 2025-03-30 does not exist in Berlin → 03:30 CEST (01:30Z).
    expect(new Date(zonedTimeToEpochMs("2025-03-30", 150, "Europe/Berlin")).toISOString()).toBe("2025-03-30T01:30:00.000Z");
  });
});
