import { describe, expect, it } from "vitest";
import { CareInputError, checkCoverage, DEFAULT_WARRANTY_POLICY, type CareFinishLayer, type CarePiece, type CoverageClaim } from "@/lib/care";
import { noExclusionAnswers, walnutTable } from "../../support/care-pieces";

const table = walnutTable;
const noAnswers = noExclusionAnswers;
const now = "2025-11-01T12:00:00Z";
const run = (claim: CoverageClaim, extra: Partial<Parameters<typeof checkCoverage>[0]> = {}) =>
  checkCoverage({ claim, piece: table, policy: DEFAULT_WARRANTY_POLICY, careLog: [], now, ...extra });

describe("checkCoverage", () => {
  it("a crack in a room inside the care guide is covered, with term and movement reasons", () => {
    const r = run({ category: "crack_gap", answers: noAnswers, roomClimate: { driest: { tempC: 21, rhPct: 42 }, dampest: { tempC: 23, rhPct: 58 }, largestDailyRhChangePct: 4 } });
    expect(r.suggestion).toBe("covered");
    expect(r.suggestedCoveredPct).toBe(100);
    expect(r.termEndsOn).toBe("2027-03-02");
    expect(r.daysLeft).toBe(486);
    expect(r.climate?.insideCareGuide).toBe(true);
    expect(r.climate?.reported?.changeMm).toBeGreaterThan(0);
    expect(r.climate!.reported!.changeMm).toBeLessThanOrEqual(r.climate!.careGuide!.changeMm);
    expect(r.reasons.join("\n")).toMatch(/Western Australian Museum 2017/);
    expect(r.reasons.join("\n")).toMatch(/expected seasonal movement of this 1000 mm top/);
  });

  it("a crack in a room drier than the care guide is partly covered and shows the larger movement", () => {
    const r = run({ category: "crack_gap", answers: noAnswers, roomClimate: { driest: { tempC: 22, rhPct: 20 }, dampest: { tempC: 24, rhPct: 65 } } });
    expect(r.suggestion).toBe("partly_covered");
    expect(r.suggestedCoveredPct).toBe(50);
    expect(r.climate?.insideCareGuide).toBe(false);
    expect(r.climate!.reported!.changeMm).toBeGreaterThan(r.climate!.careGuide!.changeMm);
    expect(r.reasons.join("\n")).toMatch(/Eq\. 13-3/);
  });

  it("a daily swing over 5 % puts the room outside the care guide", () => {
    const r = run({ category: "crack_gap", answers: noAnswers, roomClimate: { driest: { tempC: 21, rhPct: 45 }, dampest: { tempC: 21, rhPct: 55 }, largestDailyRhChangePct: 12 } });
    expect(r.climate?.insideCareGuide).toBe(false);
  });

  it("needs info when the owner has not answered the exclusion questions or the climate", () => {
    const r = run({ category: "crack_gap", answers: { heat: false } });
    expect(r.suggestion).toBe("needs_info");
    expect(r.suggestedCoveredPct).toBeNull();
    expect(r.questions).toEqual([
      "Was the piece knocked, dropped or hit?",
      "Has the piece been used outdoors?",
      "What are the room's driest and dampest conditions (temperature and relative humidity)?",
    ]);
  });

  it("an exclusion the owner triggers makes it not covered, even with other info missing", () => {
    const r = run({ category: "resin_clouding", answers: { directSun: true } });
    expect(r.suggestion).toBe("not_covered");
    expect(r.exclusionsTriggered).toEqual(["sun_on_resin"]);
  });

  it("direct sun on resin does not apply to a piece without resin, nor outdoor use to an outdoor piece", () => {
    const r = checkCoverage({
      claim: { category: "resin_clouding", answers: { heat: false, chemicals: false } },
      piece: { ...table, resin: "none", use: "outdoor_covered" },
      policy: DEFAULT_WARRANTY_POLICY,
      careLog: [],
      now,
    });
    expect(r.suggestion).toBe("covered");
  });

  it("out of term: not covered, negative daysLeft", () => {
    const r = run({ category: "finish_wear", filedOn: "2026-04-01", answers: noAnswers }, { finishLayers: [] });
    expect(r.termEndsOn).toBe("2026-03-02");
    expect(r.daysLeft).toBe(-30);
    expect(r.suggestion).toBe("not_covered");
  });

  it("no line for the category: not covered", () => {
    const r = run({ category: "scratch_dent", answers: noAnswers });
    expect(r.suggestion).toBe("not_covered");
    expect(r.line).toBeNull();
  });

  it("a line that does not transfer is not covered for a later owner", () => {
    const layers: CareFinishLayer[] = [{ id: "l", surface: "top", finishClass: "hardwax_oil", coats: 2, appliedOn: "2025-03-02" }];
    const r = run({ category: "finish_wear", answers: noAnswers, filedByOriginalOwner: false }, { finishLayers: layers });
    expect(r.suggestion).toBe("not_covered");
    expect(r.reasons.join(" ")).toMatch(/does not transfer/);
  });

  describe("care-log condition (finish wear: refreshes logged within 60 days of due)", () => {
    const layers: CareFinishLayer[] = [{ id: "l", surface: "top", finishClass: "hardwax_oil", coats: 2, appliedOn: "2024-03-02" }];
    const piece = { ...table, deliveredOn: "2024-03-02", sun: "none" as const };
    const claim: CoverageClaim = { category: "finish_wear", filedOn: "2025-02-15", answers: noAnswers };
    const policy = { ...DEFAULT_WARRANTY_POLICY, lines: { finish_wear: { ...DEFAULT_WARRANTY_POLICY.lines.finish_wear!, termMonths: 24 } } };

    it("met when nothing was due yet", () => {
      const r = checkCoverage({ claim, piece, policy, careLog: [], now, finishLayers: layers });
      expect(r.careLogCondition).toBe("met");
      expect(r.suggestion).toBe("covered");
    });

    it("missed when a re-oil due 2025-03-02 was not logged within 60 days → partly covered", () => {
      const r = checkCoverage({ claim: { ...claim, filedOn: "2025-06-01" }, piece, policy, careLog: [], now, finishLayers: layers });
      expect(r.careLogCondition).toBe("missed");
      expect(r.suggestion).toBe("partly_covered");
      expect(r.reasons.join("\n")).toMatch(/re-oil was due 2025-03-02/);
    });

    it("met when the re-oil was logged 20 days late", () => {
      const r = checkCoverage({ claim: { ...claim, filedOn: "2025-06-01" }, piece, policy, careLog: [{ taskKind: "reoil", doneOn: "2025-03-22" }], now, finishLayers: layers });
      expect(r.careLogCondition).toBe("met");
    });

    it("oil under a ceramic topcoat: the care-log condition runs on the longer (oil's) interval, as the schedule does", () => {
      // moderate use: topcoat 18 months, oil 24 → the stack is due 2026-03-02; a claim on 2025-12-01 has nothing overdue.
      const stack: CareFinishLayer[] = [...layers, { id: "c", surface: "top", finishClass: "ceramic_topcoat", coats: 1, appliedOn: "2024-03-02" }];
      const r = checkCoverage({ claim: { ...claim, filedOn: "2025-12-01" }, piece: { ...piece, use: "moderate" }, policy, careLog: [], now, finishLayers: stack });
      expect(r.careLogCondition).toBe("met");
    });

    it("unknown without the finish stack → needs info", () => {
      const r = checkCoverage({ claim, piece, policy, careLog: [], now });
      expect(r.careLogCondition).toBe("unknown");
      expect(r.suggestion).toBe("needs_info");
    });
  });

  describe("sun on resin (default terms: resin yellows in daylight whatever the care)", () => {
    const outdoorResin: CarePiece = { ...table, id: "pc_bench", kind: "bench", use: "outdoor_covered", sun: "direct", resin: "tabletop_coat" };
    it("an outdoor resin piece in direct sun is not covered for yellowing, even when the owner answers no", () => {
      const r = checkCoverage({ claim: { category: "resin_clouding", answers: noAnswers }, piece: outdoorResin, policy: DEFAULT_WARRANTY_POLICY, careLog: [], now });
      expect(r.suggestion).toBe("not_covered");
      expect(r.suggestedCoveredPct).toBe(0);
      expect(r.exclusionsTriggered).toEqual(["sun_on_resin"]);
      expect(r.reasons.join("\n")).toMatch(/kept outdoors, so its resin is in daylight: sun on the resin is excluded/);
    });
    it("an outdoor resin piece out of direct sun is excluded too (daylight), without asking", () => {
      const r = checkCoverage({ claim: { category: "resin_clouding", answers: { heat: false, chemicals: false } }, piece: { ...outdoorResin, sun: "none" }, policy: DEFAULT_WARRANTY_POLICY, careLog: [], now });
      expect(r.suggestion).toBe("not_covered");
      expect(r.questions).toEqual([]);
    });
    it("an indoor resin piece the record places in direct sun is excluded; in indirect sun the owner is asked", () => {
      const direct = run({ category: "resin_clouding", answers: { ...noAnswers } }, { piece: { ...table, sun: "direct" } });
      expect(direct.exclusionsTriggered).toEqual(["sun_on_resin"]);
      expect(direct.reasons.join("\n")).toMatch(/record places it in direct sun/);
      const asked = run({ category: "resin_clouding", answers: { heat: false, chemicals: false, usedOutdoors: false } });
      expect(asked.suggestion).toBe("needs_info");
      expect(asked.questions).toEqual(["Does direct sun fall on the resin?"]);
      expect(run({ category: "resin_clouding", answers: noAnswers }).suggestion).toBe("covered");
    });
    it("terms that only name the older indoor-only exclusion keep their meaning", () => {
      const older = { version: "older (invented)", lines: { resin_clouding: { ...DEFAULT_WARRANTY_POLICY.lines.resin_clouding!, exclusions: ["direct_sun_on_indoor_resin" as const] } } };
      const r = checkCoverage({ claim: { category: "resin_clouding", answers: noAnswers }, piece: outdoorResin, policy: older, careLog: [], now });
      expect(r.suggestion).toBe("covered");
    });
  });

  describe("readings outside the moisture equation's range and the daily temperature change", () => {
    const bench: CarePiece = { ...table, id: "pc_cedar", kind: "bench", use: "outdoor_covered", resin: "none", primarySpeciesId: "western_redcedar", shape: { kind: "rectangle", lengthMm: 1800, widthMm: 400 } };
    it("a crack claim on an outdoor piece with a winter reading (−5 °C, 80 % RH) answers, and says the reading was clamped", () => {
      const claim: CoverageClaim = { category: "crack_gap", answers: noAnswers, roomClimate: { driest: { tempC: 25, rhPct: 35 }, dampest: { tempC: -5, rhPct: 80 } } };
      const r = checkCoverage({ claim, piece: bench, policy: DEFAULT_WARRANTY_POLICY, careLog: [], now });
      expect(r.suggestion).toBe("partly_covered");
      expect(r.climate?.reported?.temperatureClamped).toBe(true);
      expect(r.climate!.reported!.changeMm).toBeGreaterThan(0);
      expect(r.reasons.join("\n")).toMatch(/-5 °C is outside the range of the moisture equation .*worked at -1\.1 °C/);
      expect(r.reasons.join("\n")).toMatch(/outdoor piece/);
    });
    it("a daily temperature change over about 4 °C puts the room outside the care guide", () => {
      const room = { driest: { tempC: 20, rhPct: 45 }, dampest: { tempC: 22, rhPct: 55 }, largestDailyRhChangePct: 3 };
      expect(run({ category: "crack_gap", answers: noAnswers, roomClimate: { ...room, largestDailyTempChangeC: 3.5 } }).climate?.insideCareGuide).toBe(true);
      const r = run({ category: "crack_gap", answers: noAnswers, roomClimate: { ...room, largestDailyTempChangeC: 7 } });
      expect(r.climate?.insideCareGuide).toBe(false);
      expect(r.suggestion).toBe("partly_covered");
      expect(r.reasons.join("\n")).toMatch(/more than about 4 °C in a day/);
    });
  });

  it("bad input throws CareInputError", () => {
    expect(() => run({ category: "wobbly" as never, answers: {} })).toThrow(CareInputError);
    expect(() => run({ category: "crack_gap", filedOn: "2024-01-01", answers: {} })).toThrow(/before delivery/);
  });
});
