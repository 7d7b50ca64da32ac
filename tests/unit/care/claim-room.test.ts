// The claim form's room readings → the coverage check's input, through the answers schema that stores
// them (lib/validation/claims): temperatures in °C. °F readings convert as (°F − 32) × 5/9; a change
// within a day as a difference, °F × 5/9 with no offset (a 1 °F interval = 5/9 K: NIST SP 811, 2008,
// App. B, from memory). Worked by hand beside each value.
import { describe, expect, it } from "vitest";
import { roomClimate } from "@/lib/claims/coverage";
import { claimAnswersSchema } from "@/lib/validation/claims";

const base = { heat: "no", chemicals: "no", impact: "no", usedOutdoors: "no", directSun: "no" } as const;
const parse = (room: Record<string, unknown>) => claimAnswersSchema.parse({ ...base, room });

describe("claim form room readings → coverage check input", () => {
  it("°F readings and a °F daily change are stored in °C: 23 °F → −5 °C, 77 °F → 25 °C, a 9 °F change → 5 °C", () => {
    const a = parse({ unit: "F", driestTemp: 23, driestRh: 35, dampestTemp: 77, dampestRh: 80, dailySwingPct: 4, dailyTempSwing: 9 });
    expect(a.room).toMatchObject({ unit: "C", driestTemp: -5, dampestTemp: 25, dailyTempSwing: 5 });
    expect(roomClimate(a)).toEqual({ driest: { tempC: -5, rhPct: 35 }, dampest: { tempC: 25, rhPct: 80 }, largestDailyRhChangePct: 4, largestDailyTempChangeC: 5 });
    // Stored answers parse again unchanged (readAnswers re-reads them through the schema).
    expect(claimAnswersSchema.parse(a)).toEqual(a);
  });

  it("rounds to 0.1 °C: 70 °F → 21.1 °C; a 7 °F change → 3.9 °C", () => {
    const a = parse({ unit: "F", driestTemp: 70, driestRh: 40, dampestTemp: 70, dampestRh: 55, dailyTempSwing: 7 });
    expect(roomClimate(a)).toMatchObject({ driest: { tempC: 21.1 }, largestDailyTempChangeC: 3.9 });
  });

  it("in °C it passes through; left empty it is not reported", () => {
    expect(roomClimate(parse({ unit: "C", driestTemp: 18, driestRh: 40, dampestTemp: 24, dampestRh: 60, dailyTempSwing: 3 }))?.largestDailyTempChangeC).toBe(3);
    expect(roomClimate(parse({ unit: "C", driestTemp: 18, driestRh: 40, dampestTemp: 24, dampestRh: 60 }))).not.toHaveProperty("largestDailyTempChangeC");
  });

  it("refuses a daily change beyond 40 °C or 72 °F, or below 0, naming the unit", () => {
    const err = (room: Record<string, unknown>) => claimAnswersSchema.safeParse({ ...base, room }).error?.issues.find((i) => i.path.at(-1) === "dailyTempSwing")?.message;
    expect(err({ unit: "C", dailyTempSwing: 41 })).toBe("Enter a change within a day between 0 and 40 °C.");
    expect(err({ unit: "C", dailyTempSwing: 40 })).toBeUndefined();
    expect(err({ unit: "F", dailyTempSwing: 72 })).toBeUndefined();
    expect(err({ unit: "F", dailyTempSwing: 73 })).toBe("Enter a change within a day between 0 and 72 °F.");
    expect(err({ unit: "F", dailyTempSwing: -1 })).toBe("The daily temperature change must be at least 0.");
  });
});
