import { describe, expect, it } from "vitest";
import { roomClimate } from "@/lib/claims/coverage";

describe("claim form room readings → coverage check input", () => {
  it("a daily temperature change in °F converts as a difference (× 5/9, no 32 offset): 9 °F → 5 °C", () => {
    const r = roomClimate({ heat: "no", chemicals: "no", impact: "no", usedOutdoors: "no", directSun: "no", room: { unit: "F", driestTemp: 23, driestRh: 35, dampestTemp: 77, dampestRh: 80, dailySwingPct: 4, dailyTempSwing: 9 } });
    expect(r).toEqual({ driest: { tempC: -5, rhPct: 35 }, dampest: { tempC: 25, rhPct: 80 }, largestDailyRhChangePct: 4, largestDailyTempChangeC: 5 });
  });
  it("in °C it passes through; left empty it is not reported", () => {
    const base = { heat: "no", chemicals: "no", impact: "no", usedOutdoors: "no", directSun: "no" } as const;
    expect(roomClimate({ ...base, room: { unit: "C", driestTemp: 18, driestRh: 40, dampestTemp: 24, dampestRh: 60, dailyTempSwing: 3 } })?.largestDailyTempChangeC).toBe(3);
    expect(roomClimate({ ...base, room: { unit: "C", driestTemp: 18, driestRh: 40, dampestTemp: 24, dampestRh: 60 } })).not.toHaveProperty("largestDailyTempChangeC");
  });
});
