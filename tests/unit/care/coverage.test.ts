import { describe, expect, it } from "vitest";
import { CareInputError, checkCoverage, DEFAULT_WARRANTY_POLICY, type CareFinishLayer, type CarePiece, type CoverageClaim } from "@/lib/care";

// Invented demo pieces (DESIGN.md §9).
const table: CarePiece = {
  id: "pc_walnut",
  kind: "dining_table",
  use: "heavy",
  sun: "indirect",
  deliveredOn: "2025-03-02",
  resin: "deep_pour",
  shape: { kind: "rectangle", lengthMm: 2400, widthMm: 1000 },
  primarySpeciesId: "black_walnut",
};
const noAnswers = { heat: false, chemicals: false, impact: false, usedOutdoors: false, directSun: false };
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
    expect(r.reasons.join("\n")).toMatch(/leaves 6–14 %/);
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
    expect(r.exclusionsTriggered).toEqual(["direct_sun_on_indoor_resin"]);
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

    it("unknown without the finish stack → needs info", () => {
      const r = checkCoverage({ claim, piece, policy, careLog: [], now });
      expect(r.careLogCondition).toBe("unknown");
      expect(r.suggestion).toBe("needs_info");
    });
  });

  it("bad input throws CareInputError", () => {
    expect(() => run({ category: "wobbly" as never, answers: {} })).toThrow(CareInputError);
    expect(() => run({ category: "crack_gap", filedOn: "2024-01-01", answers: {} })).toThrow(/before delivery/);
  });
});
