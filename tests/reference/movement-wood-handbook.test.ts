import { describe, expect, it } from "vitest";
import { getSpecies, inchesToMm, slabMovement, SPECIES, widthChangeFromShrinkageMm, widthChangeMm } from "@/lib/care";

// Source: Wood Handbook FPL-GTR-190 (2010), ch. 13, Eq. 13-2 (ΔD = D_I · C · (M_F − M_I)) and Table 13-5
// coefficients; Table 4-3 shrinkage (values via ../shared/REFERENCES.md).
describe("dimensional change, Wood Handbook FPL-GTR-190 (2010) Eq. 13-2 with Table 13-5", () => {
  it("12 in flat-sawn black walnut, 6 % → 12 % MC: 12 × 0.00274 × 6 = 0.197 in (Table 13-5 C_T)", () => {
    const walnut = getSpecies("black_walnut")!;
    expect(walnut.tangentialCoefficient).toBe(0.00274); // Table 13-5, black walnut C_T
    const inches = widthChangeMm({ widthMm: 12, coefficient: walnut.tangentialCoefficient, fromMcPct: 6, toMcPct: 12 });
    expect(inches).toBeCloseTo(0.19728, 10);
    const mm = widthChangeMm({ widthMm: inchesToMm(12), coefficient: 0.00274, fromMcPct: 6, toMcPct: 12 });
    expect(mm / 25.4).toBeCloseTo(0.197, 3);
  });

  it("12 in quarter-sawn black walnut, 6 % → 12 %: 12 × 0.00190 × 6 = 0.137 in (Table 13-5 C_R)", () => {
    expect(widthChangeMm({ widthMm: 12, coefficient: getSpecies("black_walnut")!.radialCoefficient, fromMcPct: 6, toMcPct: 12 })).toBeCloseTo(0.1368, 10);
  });

  it("10 in flat-sawn red oak (commercial), 8 % → 12 %: 10 × 0.00369 × 4 = 0.1476 in (Table 13-5)", () => {
    expect(widthChangeMm({ widthMm: 10, coefficient: getSpecies("red_oak")!.tangentialCoefficient, fromMcPct: 8, toMcPct: 12 })).toBeCloseTo(0.1476, 10);
  });

  it("drying gives a negative change of the same size (Eq. 13-2 is linear)", () => {
    expect(widthChangeMm({ widthMm: 12, coefficient: 0.00274, fromMcPct: 12, toMcPct: 6 })).toBeCloseTo(-0.19728, 10);
  });

  it("Eq. 13-3 with Table 4-3 shrinkage (black walnut S_T 7.8 %) agrees with Eq. 13-2 to 0.003 in on the worked example (Eq. 13-3 form from memory)", () => {
    const viaShrinkage = widthChangeFromShrinkageMm({ widthMm: 12, shrinkagePct: 7.8, fromMcPct: 6, toMcPct: 12 });
    expect(Math.abs(viaShrinkage - 0.197)).toBeLessThan(0.003);
  });

  it("slabMovement chains Eq. 4-5 and Eq. 13-2: 1000 mm flat-sawn walnut from 40 % to 60 % RH at 21.1 °C", () => {
    const m = slabMovement({ speciesId: "black_walnut", widthMm: 1000, grain: "flat", from: { tempC: 21.1, rhPct: 40 }, to: { tempC: 21.1, rhPct: 60 } });
    // Table 4-2: 7.7 % and 11.0 % → about 1000 × 0.00274 × 3.3 ≈ 9.0 mm
    expect(m.method).toBe("eq_13_2_linear");
    expect(m.changeMm).toBeGreaterThan(8.8);
    expect(m.changeMm).toBeLessThan(9.3);
    expect(m.reasons.join(" ")).toMatch(/Eq\. 13-2/);
  });

  it("slabMovement says when the moisture range leaves 6–14 % and uses Eq. 13-3", () => {
    const m = slabMovement({ speciesId: "black_walnut", widthMm: 1000, grain: "flat", from: { tempC: 21.1, rhPct: 20 }, to: { tempC: 21.1, rhPct: 80 } });
    expect(m.withinLinearRange).toBe(false);
    expect(m.method).toBe("eq_13_3_shrinkage");
    expect(m.reasons.join(" ")).toMatch(/leaves 6–14 %/);
  });

  it("the species table has ≥ 20 woods, each citing Table 13-5 and Table 4-3", () => {
    expect(SPECIES.length).toBeGreaterThanOrEqual(20);
    for (const s of SPECIES) {
      expect(s.coefficientSource).toMatch(/Table 13-5/);
      expect(s.shrinkageSource).toMatch(/Table 4-3/);
      expect(s.tangentialCoefficient).toBeGreaterThan(s.radialCoefficient);
    }
  });
});
