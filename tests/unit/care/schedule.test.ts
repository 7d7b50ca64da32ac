import fc from "fast-check";
import { describe, expect, it } from "vitest";
import {
  CARE_TASK_KINDS,
  CareInputError,
  careSchedule,
  DEFAULT_INTERVAL_SOURCE,
  effectiveInterval,
  FINISH_CLASSES,
  reminderKey,
  SURFACES,
  SUN_EXPOSURES,
  TASK_KIND_BY_FINISH_CLASS,
  USES,
  type CareFinishLayer,
  type CarePiece,
  type CatalogEntry,
} from "@/lib/care";

// Invented demo piece: a walnut river dining table.
const piece: CarePiece = { id: "pc_demo_1", kind: "dining_table", use: "heavy", sun: "direct", deliveredOn: "2025-03-02", resin: "deep_pour" };
const oil: CareFinishLayer = { id: "fl1", surface: "top", finishClass: "hardwax_oil", coats: 2, appliedOn: "2025-03-02" };

const find = (r: ReturnType<typeof careSchedule>, kind: string) => r.tasks.find((t) => t.kind === kind)!;

describe("careSchedule", () => {
  it("re-oil due 9 months after the last oil coat for heavy use in direct sun, with the reason in words", () => {
    const r = careSchedule({ piece, finishLayers: [oil], careLog: [], catalog: [], now: "2025-06-01T12:00:00Z" });
    const t = find(r, "reoil");
    expect(t.dueOn).toBe("2025-12-02");
    expect(t.status).toBe("upcoming");
    expect(t.isRefresh).toBe(true);
    expect(t.key).toBe("pc_demo_1:reoil:top");
    expect(t.reasons[0]).toBe("re-oil (top) due 2025-12-02: last oil coat 2025-03-02, heavy use, direct sun (12 mo × 0.75 = 9 mo)");
    // The interval's source is data on the task; its label stays in code (intervals.ts), never in the reasons.
    expect(t.intervalFrom).toEqual({ kind: "usual", finishClass: "hardwax_oil", unknownProductId: null });
    expect(DEFAULT_INTERVAL_SOURCE.hardwax_oil).toMatch(/from memory, common practice/);
    expect(t.reasons[1]).toBe("default interval for hardwax_oil");
    expect(t.reminders).toEqual([
      { step: "before_14d", on: "2025-11-18" },
      { step: "due_day", on: "2025-12-02" },
      { step: "after_30d", on: "2026-01-01" },
    ]);
    expect(reminderKey(t, "due_day")).toBe("pc_demo_1:reoil:top:2025-12-02:due_day");
  });

  it("status: upcoming before the window, due from 14 days before through the due day, overdue after", () => {
    const at = (now: string) => find(careSchedule({ piece, finishLayers: [oil], careLog: [], catalog: [], now }), "reoil").status;
    expect(at("2025-11-17T12:00:00Z")).toBe("upcoming");
    expect(at("2025-11-18T12:00:00Z")).toBe("due");
    expect(at("2025-12-02T12:00:00Z")).toBe("due");
    expect(at("2025-12-03T12:00:00Z")).toBe("overdue");
  });

  it("today is the date in the studio's time zone", () => {
    // 2025-12-03T03:00Z is still 2 Dec in New York: due, not overdue.
    const r = careSchedule({ piece, finishLayers: [oil], careLog: [], catalog: [], now: "2025-12-03T03:00:00Z", timeZone: "America/New_York" });
    expect(r.today).toBe("2025-12-02");
    expect(find(r, "reoil").status).toBe("due");
  });

  it("a care-log entry after the layer resets the clock and shows done", () => {
    const r = careSchedule({ piece, finishLayers: [oil], careLog: [{ taskKind: "reoil", doneOn: "2025-12-10" }], catalog: [], now: "2025-12-20T12:00:00Z" });
    const t = find(r, "reoil");
    expect(t.clockSource).toBe("care_log");
    expect(t.dueOn).toBe("2026-09-10");
    expect(t.status).toBe("done");
    expect(t.reasons[0]).toMatch(/last logged re-oil 2025-12-10/);
  });

  it("the newest layer of a class sets the clock; a log entry older than it does not", () => {
    const newer = { ...oil, id: "fl2", appliedOn: "2025-08-01" };
    const r = careSchedule({ piece, finishLayers: [oil, newer], careLog: [{ taskKind: "reoil", doneOn: "2025-05-01" }], catalog: [], now: "2025-09-01T00:00:00Z" });
    const t = find(r, "reoil");
    expect(t.layerId).toBe("fl2");
    expect(t.clockSource).toBe("layer");
    expect(t.dueOn).toBe("2026-05-01");
    expect(t.status).toBe("done"); // a layer applied after delivery is a refresh
  });

  it("fractional months: 18 mo × 0.75 = 13 mo 15 d (whole months clamp, then days)", () => {
    expect(effectiveInterval({ heavy: 12, moderate: 18, light: 24 }, "moderate", "direct")).toMatchObject({ months: 13, days: 15, text: "18 mo × 0.75 = 13 mo 15 d" });
    const r = careSchedule({
      piece: { ...piece, use: "moderate" },
      finishLayers: [{ id: "c", surface: "top", finishClass: "ceramic_topcoat", coats: 1, appliedOn: "2025-01-31" }],
      careLog: [],
      catalog: [],
      now: "2025-02-01T00:00:00Z",
    });
    // 2025-01-31 + 13 months = 2026-02-28 (clamped), + 15 days = 2026-03-15
    expect(find(r, "topcoat_refresh").dueOn).toBe("2026-03-15");
  });

  it("month-end clamp: paste wax applied 2023-08-31, heavy use, no sun → 6 months → 2024-02-29", () => {
    const r = careSchedule({
      piece: { ...piece, sun: "none" },
      finishLayers: [{ id: "w", surface: "top", finishClass: "paste_wax", coats: 1, appliedOn: "2023-08-31" }],
      careLog: [],
      catalog: [],
      now: "2023-09-01T00:00:00Z",
    });
    const t = find(r, "rewax");
    expect(t.dueOn).toBe("2024-02-29");
    expect(t.intervalFrom).toEqual({ kind: "usual", finishClass: "paste_wax", unknownProductId: null });
    expect(DEFAULT_INTERVAL_SOURCE.paste_wax).toMatch(/Conserve O Gram 7\/2/);
  });

  it("outdoor covered uses the heavy interval; catalog intervals override the defaults", () => {
    const bench: CarePiece = { id: "bench", kind: "bench", use: "outdoor_covered", sun: "none", deliveredOn: "2025-05-01", resin: "none" };
    const catalog: CatalogEntry[] = [{ id: "p1", name: "Demo charred-wood oil (invented)", finishClass: "charred_oiled", coverageM2PerL: 12, containerSizesMl: [500], intervals: { heavy: 8 } }];
    const layers: CareFinishLayer[] = [{ id: "l", surface: "top", finishClass: "charred_oiled", productId: "p1", coats: 1, appliedOn: "2025-05-01" }];
    const t = find(careSchedule({ piece: bench, finishLayers: layers, careLog: [], catalog, now: "2025-05-02T00:00:00Z" }), "reoil_charred");
    expect(t.interval.band).toBe("heavy");
    expect(t.dueOn).toBe("2026-01-01");
    expect(t.reasons[1]).toBe("interval from catalog product Demo charred-wood oil (invented)");
    expect(t.intervalFrom).toEqual({ kind: "catalog", productId: "p1", productName: "Demo charred-wood oil (invented)" });
    const noCatalog = find(careSchedule({ piece: bench, finishLayers: layers, careLog: [], catalog: [], now: "2025-05-02T00:00:00Z" }), "reoil_charred");
    expect(noCatalog.dueOn).toBe("2026-05-01");
    expect(noCatalog.intervalFrom).toEqual({ kind: "usual", finishClass: "charred_oiled", unknownProductId: "p1" });
  });

  it("oil under a newer (or same-day) ceramic topcoat gives a topcoat task, not a re-oil task", () => {
    const r = careSchedule({
      piece,
      finishLayers: [oil, { id: "c", surface: "top", finishClass: "ceramic_topcoat", coats: 1, appliedOn: "2025-03-02" }],
      careLog: [],
      catalog: [],
      now: "2025-04-01T00:00:00Z",
    });
    expect(r.tasks.map((t) => t.kind).sort()).toEqual(["annual_check", "topcoat_refresh"]);
  });

  // The stacked-layer rule (lib/care/schedule.ts, protectedByTopcoat): a topcoat protects the oil under it,
  // so the stack's one task runs on the longer of the two intervals. Defaults (lib/care/intervals.ts, common
  // practice): moderate use, no sun — hardwax oil 24 months, ceramic topcoat 18 months → 24 months.
  it("oil under a ceramic topcoat is never due sooner than bare oil: moderate use, 2025-03-02 + 24 months = 2027-03-02", () => {
    const topcoat: CareFinishLayer = { id: "c", surface: "top", finishClass: "ceramic_topcoat", coats: 1, appliedOn: "2025-03-02" };
    const stack = careSchedule({ piece: { ...piece, use: "moderate", sun: "none" }, finishLayers: [oil, topcoat], careLog: [], catalog: [], now: "2025-04-01T00:00:00Z" });
    const bare = careSchedule({ piece: { ...piece, use: "moderate", sun: "none" }, finishLayers: [oil], careLog: [], catalog: [], now: "2025-04-01T00:00:00Z" });
    expect(find(bare, "reoil").dueOn).toBe("2027-03-02");
    const t = find(stack, "topcoat_refresh");
    expect(t.dueOn).toBe("2027-03-02"); // was 2026-09-02 (18 months), sooner than bare oil
    expect(t.reasons.join("\n")).toMatch(/longer of the two intervals \(topcoat alone 18 mo, oil alone 24 mo\)/);
    expect([t.oilBeneath?.topcoat.months, t.oilBeneath?.oil.months]).toEqual([18, 24]);
    // a catalog topcoat rated longer than the oil keeps its own interval
    const long = careSchedule({
      piece: { ...piece, use: "moderate", sun: "none" },
      finishLayers: [oil, { ...topcoat, productId: "cer" }],
      careLog: [],
      catalog: [{ id: "cer", finishClass: "ceramic_topcoat", coverageM2PerL: 186, containerSizesMl: [50], intervals: { moderate: 30 } }],
      now: "2025-04-01T00:00:00Z",
    });
    expect(find(long, "topcoat_refresh").dueOn).toBe("2027-09-02");
  });

  it("oil applied after the topcoat (worn through and re-oiled) keeps its own clock beside the topcoat's", () => {
    const r = careSchedule({
      piece: { ...piece, use: "moderate", sun: "none" },
      finishLayers: [{ id: "c", surface: "top", finishClass: "ceramic_topcoat", coats: 1, appliedOn: "2025-03-02" }, { ...oil, appliedOn: "2025-03-10" }],
      careLog: [],
      catalog: [],
      now: "2025-04-01T00:00:00Z",
    });
    expect(find(r, "reoil").dueOn).toBe("2027-03-10");
    expect(find(r, "topcoat_refresh").dueOn).toBe("2026-09-02");
  });

  it("edges count with the top; the base runs on the light-use interval", () => {
    const r = careSchedule({
      piece: { ...piece, sun: "none" },
      finishLayers: [
        { ...oil, id: "e", surface: "edges", appliedOn: "2025-03-05" },
        { ...oil, id: "b", surface: "base", appliedOn: "2025-03-02" },
        oil,
      ],
      careLog: [],
      catalog: [],
      now: "2025-04-01T00:00:00Z",
    });
    const top = r.tasks.find((t) => t.kind === "reoil" && t.surface === "top")!;
    const base = r.tasks.find((t) => t.kind === "reoil" && t.surface === "base")!;
    expect(top.layerId).toBe("e");
    expect(top.dueOn).toBe("2026-03-05");
    expect(base.dueOn).toBe("2028-03-02"); // light: 36 months
    expect(base.reasons[0]).toMatch(/base, light wear/);
  });

  it("always includes the yearly annual check from delivery, reset by a logged check", () => {
    const r = careSchedule({ piece, finishLayers: [], careLog: [{ taskKind: "annual_check", doneOn: "2026-02-20" }], catalog: [], now: "2026-03-01T00:00:00Z" });
    expect(r.tasks).toHaveLength(1);
    expect(r.tasks[0]).toMatchObject({ kind: "annual_check", surface: "whole_piece", isRefresh: false, dueOn: "2027-02-20", status: "done" });
  });

  it("ignores care logged after today and says so", () => {
    const r = careSchedule({ piece, finishLayers: [oil], careLog: [{ taskKind: "reoil", doneOn: "2026-01-01" }], catalog: [], now: "2025-12-20T00:00:00Z" });
    expect(find(r, "reoil").clockSource).toBe("layer");
    expect(r.notes[0]).toMatch(/after today/);
  });

  it("bad input throws CareInputError with a clear message", () => {
    const base = { piece, finishLayers: [oil], careLog: [], catalog: [], now: "2025-06-01T00:00:00Z" };
    expect(() => careSchedule({ ...base, piece: { ...piece, deliveredOn: "2025-02-30" } })).toThrow(/piece.deliveredOn is not a calendar date/);
    expect(() => careSchedule({ ...base, finishLayers: [{ ...oil, appliedOn: "March 2" }] })).toThrow(CareInputError);
    expect(() => careSchedule({ ...base, finishLayers: [{ ...oil, finishClass: "shellac" as never }] })).toThrow(/finishClass is unknown/);
    expect(() => careSchedule({ ...base, timeZone: "Mars/Olympus" })).toThrow(/unknown time zone/);
    expect(() => careSchedule({ ...base, careLog: [{ taskKind: "sanding" as never, doneOn: "2025-05-01" }] })).toThrow(/taskKind is unknown/);
    expect(() => careSchedule({ ...base, now: "2025-06-01" })).toThrow(/now must be/);
    expect(() =>
      careSchedule({ ...base, finishLayers: [{ ...oil, productId: "x" }], catalog: [{ id: "x", finishClass: "hardwax_oil", coverageM2PerL: 1, containerSizesMl: [], intervals: { heavy: 0 } }] }),
    ).toThrow(/wear interval/);
  });

  it("property: a task logged done on or before today (within its interval) is never overdue", () => {
    const layerArb = fc.record({
      surface: fc.constantFrom(...SURFACES),
      finishClass: fc.constantFrom(...FINISH_CLASSES),
      daysBefore: fc.integer({ min: 0, max: 3000 }),
    });
    fc.assert(
      fc.property(
        fc.constantFrom(...USES),
        fc.constantFrom(...SUN_EXPOSURES),
        fc.array(layerArb, { minLength: 1, maxLength: 4 }),
        fc.integer({ min: 0, max: 60 }),
        fc.date({ min: new Date("2015-01-01"), max: new Date("2040-01-01"), noInvalidDate: true }),
        (use, sun, ls, doneDaysAgo, now) => {
          const today = now.toISOString().slice(0, 10);
          const minus = (d: number) => new Date(now.getTime() - d * 86_400_000).toISOString().slice(0, 10);
          const layers: CareFinishLayer[] = ls.map((l, i) => ({ id: `l${i}`, surface: l.surface, finishClass: l.finishClass, coats: 1, appliedOn: minus(l.daysBefore) }));
          const p: CarePiece = { ...piece, use, sun, deliveredOn: minus(3100) };
          const before = careSchedule({ piece: p, finishLayers: layers, careLog: [], catalog: [], now });
          const careLog = before.tasks.map((t) => ({ taskKind: t.kind, doneOn: minus(doneDaysAgo) }));
          const after = careSchedule({ piece: p, finishLayers: layers, careLog, catalog: [], now });
          expect(after.today).toBe(today);
          for (const t of after.tasks) expect(t.status).not.toBe("overdue");
          for (const t of after.tasks) expect(CARE_TASK_KINDS).toContain(t.kind);
        },
      ),
      { numRuns: 300 },
    );
  });

  it("every finish class maps to its own task kind", () => {
    expect(new Set(Object.values(TASK_KIND_BY_FINISH_CLASS)).size).toBe(FINISH_CLASSES.length);
  });
});
