import { describe, expect, it } from "vitest";
import { CareInputError, findSpecies, getSpecies, slabMovement, SPECIES, widthChangeMm } from "@/lib/care";

describe("species table", () => {
  it("has the furniture woods the demo studio uses, with unique ids", () => {
    expect(new Set(SPECIES.map((s) => s.id)).size).toBe(SPECIES.length);
    expect(findSpecies("hard maple")?.id).toBe("sugar_maple");
    expect(findSpecies("Spalted Maple")?.id).toBe("red_maple");
    expect(findSpecies("burl of buckeye")?.id).toBe("yellow_buckeye");
    expect(findSpecies("cedar")?.id).toBe("western_redcedar");
    expect(findSpecies("black-walnut")?.id).toBe("black_walnut");
  });

  it("marks values not read from REFERENCES.md as from memory", () => {
    expect(getSpecies("western_redcedar")!.coefficientSource).toMatch(/from memory/);
    expect(getSpecies("yellow_poplar")!.coefficientSource).toMatch(/from memory/);
    expect(getSpecies("black_walnut")!.coefficientSource).not.toMatch(/from memory/);
  });
});

describe("movement input errors", () => {
  it("throws CareInputError for unknown species, bad grain and bad widths", () => {
    const c = { tempC: 20, rhPct: 50 };
    expect(() => slabMovement({ speciesId: "teak", widthMm: 900, grain: "flat", from: c, to: c })).toThrow(/unknown species "teak"/);
    expect(() => slabMovement({ speciesId: "black_walnut", widthMm: 900, grain: "rift" as never, from: c, to: c })).toThrow(CareInputError);
    expect(() => widthChangeMm({ widthMm: -1, coefficient: 0.002, fromMcPct: 6, toMcPct: 8 })).toThrow(/widthMm/);
    expect(() => slabMovement({ speciesId: "black_walnut", widthMm: 900, grain: "flat", from: c, to: { tempC: 20, rhPct: 130 } })).toThrow(/between 0 and 100/);
  });

  it("quarter-sawn moves less than flat-sawn for the same climate", () => {
    const args = { speciesId: "white_oak", widthMm: 600, from: { tempC: 20, rhPct: 40 }, to: { tempC: 20, rhPct: 60 } };
    expect(slabMovement({ ...args, grain: "quarter" }).changeMm).toBeLessThan(slabMovement({ ...args, grain: "flat" }).changeMm);
  });
});
