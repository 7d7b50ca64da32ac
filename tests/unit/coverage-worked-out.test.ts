// "How this was worked out" on the staff claim page (lib/claims/coverage-words coverageWorkedOut) for
// the cases the database test does not reach: a care plan that lengthened or added a line, one that
// lapsed, and an exclusion the piece record answers. Fixed dates; invented pieces and plans.
import { describe, expect, it } from "vitest";
import { checkCoverage, DEFAULT_WARRANTY_POLICY, type CarePiece } from "@/lib/care";
import { coverageWorkedOut, type CoverageFacts } from "@/lib/claims/coverage-words";
import { noExclusionAnswers, walnutTable } from "../support/care-pieces";

const piece: CarePiece = { ...walnutTable, id: "pc_words" };
const no = noExclusionAnswers;
const facts = (over: Partial<CoverageFacts> = {}): CoverageFacts => ({ deliveredOn: piece.deliveredOn, units: "metric", plan: null, ...over });
const MACHINE = /\d{4}-\d{2}-\d{2}|from memory|common practice|no published source|Wood Handbook|Eq\. ?\d|Table \d|\b[a-z]+_[a-z_]+\b|version/i;

describe("coverageWorkedOut", () => {
  it("says what a running plan did to the term, in words", () => {
    const c = checkCoverage({ claim: { category: "resin_clouding", filedOn: "2027-06-01", answers: no }, piece, policy: { ...DEFAULT_WARRANTY_POLICY, lines: { resin_clouding: { ...DEFAULT_WARRANTY_POLICY.lines.resin_clouding!, termMonths: 60 } } }, careLog: [], now: "2027-06-01T12:00:00Z" });
    const lines = coverageWorkedOut(c, facts({ plan: { name: "Keeping (invented)", covers: true, lapsed: false, endedOn: null, changes: [{ label: "Resin clouding or yellowing", fromMonths: 24, toMonths: 60 }, { label: "Scratches and dents", fromMonths: null, toMonths: 36 }] } }));
    expect(lines.slice(0, 3)).toEqual([
      "The care plan “Keeping (invented)” was running when the claim was filed, so resin clouding or yellowing is covered for 60 months instead of 24 months.",
      "The care plan “Keeping (invented)” was running when the claim was filed and adds cover for scratches and dents, 36 months from delivery.",
      "The “Resin clouding or yellowing” line runs 60 months from delivery on 2 March 2025, to 2 March 2030; the claim was filed on 1 June 2027, with 2 years 9 months left.",
    ]);
    for (const l of lines) expect(l).not.toMatch(MACHINE);
  });

  it("a lapsed plan, and an exclusion the piece record answers whatever the owner said", () => {
    const c = checkCoverage({ claim: { category: "resin_clouding", filedOn: "2025-11-01", answers: no }, piece: { ...piece, sun: "direct" }, policy: DEFAULT_WARRANTY_POLICY, careLog: [], now: "2025-11-01T12:00:00Z" });
    const lines = coverageWorkedOut(c, facts({ plan: { name: "Keeping (invented)", covers: false, lapsed: true, endedOn: "3 October 2025", changes: [] } }));
    expect(lines[0]).toBe("The care plan “Keeping (invented)” lapsed on 3 October 2025, before the claim, so the warranty's own terms apply.");
    expect(lines).toContain("The piece record places it in direct sun, and sun on the resin (resin yellows in daylight) is excluded.");
    expect(lines.at(-1)).toBe("The check suggests: not covered; staff decide.");
    for (const l of lines) expect(l).not.toMatch(MACHINE);
  });
});
