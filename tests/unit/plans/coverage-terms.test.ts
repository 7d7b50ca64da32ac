// The reason the coverage check gives for a lapsed or ended care plan names the day in words, in the
// studio's zone (lib/format), not as an ISO date. Fixed instants; nothing reads the real clock.
import { describe, expect, it } from "vitest";
import type { PlanSubscription, PlanTemplate } from "@/db/schema";
import { DEFAULT_WARRANTY_POLICY } from "@/lib/care/coverage";
import { withPlanTerms, type PlanOnDay } from "@/lib/plans/coverage-terms";

const template = { name: "Oil care", version: 2, transfers: false, included: { tasks: [], visitsPerYear: 1, visitSharePct: 0, extendedLines: [], repairDiscountPct: 0 } } as unknown as PlanTemplate;

function ended(state: "lapsed" | "ended", at: string): PlanOnDay {
  return { sub: { state } as PlanSubscription, template, covers: false, endedAt: new Date(at) };
}

describe("withPlanTerms: the lapse day in the reason", () => {
  it("writes the day in words in the studio's zone, where it may differ from the UTC day", () => {
    // 23:30 UTC on 30 June is already 1 July in Auckland (UTC+12 in winter) — the studio's day is the one shown.
    const { reasons, policy } = withPlanTerms(DEFAULT_WARRANTY_POLICY, ended("lapsed", "2026-06-30T23:30:00Z"), "Pacific/Auckland");
    expect(reasons).toEqual(["the care plan “Oil care” (version 2) lapsed on 1 July 2026; the base terms apply from that day"]);
    expect(policy).toBe(DEFAULT_WARRANTY_POLICY);
  });

  it("keeps the UTC day for a studio west of it, and says 'ended' for a plan that ran out", () => {
    // 03:00 UTC on 1 March is still 28 February in Chicago (UTC−6).
    const { reasons } = withPlanTerms(DEFAULT_WARRANTY_POLICY, ended("ended", "2027-03-01T03:00:00Z"), "America/Chicago");
    expect(reasons[0]).toContain("ended on 28 February 2027");
    expect(reasons[0]).not.toMatch(/\d{4}-\d{2}-\d{2}/);
  });
});
