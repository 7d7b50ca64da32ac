import fc from "fast-check";
import { DateTime } from "luxon";
import { describe, expect, it } from "vitest";
import { availableSlots, CareInputError, type AvailableSlotsInput, type WorkingHours } from "@/lib/care";

const weekdays: WorkingHours[] = [1, 2, 3, 4, 5].map((weekday) => ({ weekday, start: "09:00", end: "17:00" }));
const base: AvailableSlotsInput = {
  workingHours: weekdays,
  timeZone: "America/New_York",
  existing: [],
  durationMin: 120,
  bufferMin: 30,
  leadTimeHours: 24,
  from: "2025-03-03T00:00:00Z",
  to: "2025-03-15T00:00:00Z",
  stepMin: 60,
  now: "2025-03-01T12:00:00Z",
};

/** The instants (one, or two when clocks go back) that show a wall time on a date in a zone, per Luxon. */
function wallInstants(date: string, hhmm: string, zone: string): number[] {
  const l = hhmm === "24:00" ? DateTime.fromISO(date, { zone }).plus({ days: 1 }).startOf("day") : DateTime.fromISO(`${date}T${hhmm}`, { zone });
  const out = [l.toMillis()];
  for (const alt of [l.minus({ hours: 1 }), l.plus({ hours: 1 })]) {
    if (alt.hour === l.hour && alt.minute === l.minute) out.push(alt.toMillis());
  }
  return out;
}

describe("availableSlots", () => {
  it("09:00 local stays 09:00 across the spring-forward change in New York (2025-03-09)", () => {
    const slots = availableSlots({ ...base, workingHours: [...weekdays, { weekday: 7, start: "09:00", end: "12:00" }] });
    const fri = slots.find((s) => s.localDate === "2025-03-07")!;
    const sun = slots.find((s) => s.localDate === "2025-03-09")!;
    const mon = slots.find((s) => s.localDate === "2025-03-10")!;
    expect([fri.start, sun.start, mon.start]).toEqual(["2025-03-07T14:00:00.000Z", "2025-03-09T13:00:00.000Z", "2025-03-10T13:00:00.000Z"]);
    expect([fri.localStart, sun.localStart, mon.localStart]).toEqual(["09:00", "09:00", "09:00"]);
    // 8 h day, 2 h visit, hourly starts: 09, 10, … 15 → 7 per weekday
    expect(slots.filter((s) => s.localDate === "2025-03-10")).toHaveLength(7);
  });

  it("09:00 stays 09:00 across the autumn change in Berlin (2025-10-26)", () => {
    const slots = availableSlots({
      ...base,
      timeZone: "Europe/Berlin",
      workingHours: [6, 7, 1].map((weekday) => ({ weekday, start: "09:00", end: "11:00" })),
      from: "2025-10-25T00:00:00Z",
      to: "2025-10-28T00:00:00Z",
      now: "2025-10-01T00:00:00Z",
    });
    expect(slots.map((s) => s.start)).toEqual(["2025-10-25T07:00:00.000Z", "2025-10-26T08:00:00.000Z", "2025-10-27T08:00:00.000Z"]);
  });

  it("keeps the buffer around existing visits and respects the lead time", () => {
    const slots = availableSlots({
      ...base,
      existing: [{ start: "2025-03-04T15:00:00Z", end: "2025-03-04T17:00:00Z" }], // 10:00–12:00 EST
      now: "2025-03-03T14:30:00Z", // lead time 24 h → nothing before 2025-03-04T14:30Z
    });
    const tue = slots.filter((s) => s.localDate === "2025-03-04").map((s) => s.localStart);
    // 09:00 is inside the lead time; 10–12 busy, with 30 min buffer: no start before 12:30 whose visit ends after 09:30
    expect(tue).toEqual(["13:00", "14:00", "15:00"]);
    expect(slots.some((s) => s.localDate === "2025-03-03")).toBe(false);
  });

  it("bad input throws CareInputError", () => {
    expect(() => availableSlots({ ...base, timeZone: "Nowhere/City" })).toThrow(/unknown time zone/);
    expect(() => availableSlots({ ...base, workingHours: [{ weekday: 8, start: "09:00", end: "17:00" }] })).toThrow(/weekday must be 1/);
    expect(() => availableSlots({ ...base, workingHours: [{ weekday: 1, start: "17:00", end: "09:00" }] })).toThrow(/ends \(09:00\) before/);
    expect(() => availableSlots({ ...base, workingHours: [{ weekday: 1, start: "9am", end: "17:00" }] })).toThrow(/like 09:00/);
    expect(() => availableSlots({ ...base, durationMin: 0 })).toThrow(CareInputError);
    expect(() => availableSlots({ ...base, to: base.from })).toThrow(/to must be after from/);
  });

  it("property: slots never overlap existing visits (plus buffer), never leave working hours, never start before now + lead", () => {
    const zones = ["America/New_York", "Europe/Berlin", "Australia/Sydney", "UTC"];
    const hoursArb = fc
      .record({ weekday: fc.integer({ min: 1, max: 7 }), startMin: fc.integer({ min: 0, max: 20 * 60 }), len: fc.integer({ min: 30, max: 10 * 60 }) })
      .map(({ weekday, startMin, len }) => {
        const end = Math.min(startMin + len, 24 * 60);
        const f = (m: number) => `${String(Math.floor(m / 60)).padStart(2, "0")}:${String(m % 60).padStart(2, "0")}`;
        return { weekday, start: f(startMin), end: f(end) };
      });
    // Start days drawn around DST changes as well as anywhere.
    const fromArb = fc.oneof(
      fc.integer({ min: Date.UTC(2024, 0, 1), max: Date.UTC(2027, 0, 1) }),
      fc.constantFrom(Date.UTC(2025, 2, 7), Date.UTC(2025, 2, 28), Date.UTC(2025, 9, 24), Date.UTC(2025, 10, 1), Date.UTC(2025, 3, 4)),
    );
    fc.assert(
      fc.property(
        fc.array(hoursArb, { minLength: 1, maxLength: 6 }),
        fc.constantFrom(...zones),
        fromArb,
        fc.array(fc.record({ offsetMin: fc.integer({ min: 0, max: 10 * 1440 }), lenMin: fc.integer({ min: 15, max: 300 }) }), { maxLength: 6 }),
        fc.integer({ min: 15, max: 240 }),
        fc.integer({ min: 0, max: 60 }),
        fc.integer({ min: 0, max: 72 }),
        fc.constantFrom(15, 30, 60),
        (workingHours, timeZone, fromMs, ex, durationMin, bufferMin, leadTimeHours, stepMin) => {
          const existing = ex.map((e) => ({ start: fromMs + e.offsetMin * 60_000, end: fromMs + (e.offsetMin + e.lenMin) * 60_000 }));
          const now = fromMs - 36 * 3_600_000;
          const to = fromMs + 10 * 86_400_000;
          const slots = availableSlots({ workingHours, timeZone, existing, durationMin, bufferMin, leadTimeHours, from: fromMs, to, stepMin, now });
          for (const s of slots) {
            expect(s.endMs - s.startMs).toBe(durationMin * 60_000);
            expect(s.startMs).toBeGreaterThanOrEqual(Math.max(fromMs, now + leadTimeHours * 3_600_000));
            expect(s.endMs).toBeLessThanOrEqual(to);
            for (const e of existing) {
              expect(s.startMs >= e.end + bufferMin * 60_000 || s.endMs + bufferMin * 60_000 <= e.start).toBe(true);
            }
            // Inside one working range on its local date, with the range's instants from Luxon. A wall time
            // that occurs twice (clocks go back) may mean either instant, so the range is taken at its widest.
            const ls = DateTime.fromMillis(s.startMs, { zone: timeZone });
            const inside = workingHours.some(
              (w) =>
                w.weekday === ls.weekday &&
                s.startMs >= Math.min(...wallInstants(ls.toISODate()!, w.start, timeZone)) &&
                s.endMs <= Math.max(...wallInstants(ls.toISODate()!, w.end, timeZone)),
            );
            expect(inside).toBe(true);
          }
          for (let i = 1; i < slots.length; i++) expect(slots[i]!.startMs).toBeGreaterThan(slots[i - 1]!.startMs);
        },
      ),
      { numRuns: 200 },
    );
  });
});
