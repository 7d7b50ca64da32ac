// The finish catalog's form in the studio's units (lib/validation/catalog-form.ts): an imperial studio types
// coverage in ft²/US gal and container sizes in US fl oz; the catalog stores m²/L and whole mL. Each case goes
// the way the form does: schema parse in the studio's units, conversion, then lib/catalog on a real SQLite file.
// Exact factors, as lib/care/units.ts defines them: 1 ft² = 0.09290304 m², 1 US gal = 3.785411784 L,
// 1 US fl oz = 29.5735295625 mL (NIST Handbook 44, Appendix C, "General Tables of Units of Measurement" —
// from memory, not re-read for this test). Each expected figure is worked by hand beside it.
import { describe, expect, it } from "vitest";
import { createCatalogProduct, getCatalogProduct, updateCatalogProduct } from "@/lib/catalog";
import { ft2PerUsGalToM2PerL } from "@/lib/care/units";
import { catalogFormFieldErrors, catalogFormSchema, catalogFormToProduct, catalogProductToForm, type CatalogFormValues } from "@/lib/validation/catalog-form";
import { createStudio, memberContext } from "../support/fixtures";

const base = { name: "Test topcoat (invented)", finishClass: "ceramic_topcoat" as const, safetyNotes: "", intervalHeavyMonths: null, intervalModerateMonths: null, intervalLightMonths: null, cureLightUseHours: null, cureFullDays: null };

/** What the form's submit does: parse in the studio's units, then the stored metric values. */
function submit(values: CatalogFormValues, units: "metric" | "imperial", before?: Parameters<typeof catalogFormToProduct>[2]) {
  return catalogFormToProduct(catalogFormSchema(units).parse(values), units, before);
}

describe("finish catalog form in the studio's units", () => {
  it("an imperial studio's ft²/US gal and US fl oz are stored as m²/L and whole mL", async () => {
    const studio = createStudio({ unitSystem: "imperial" });
    const admin = await memberContext(studio, "admin");
    const units = admin.studio.unitSystem;
    expect(units).toBe("imperial");
    const p = createCatalogProduct(admin, submit({ ...base, coverage: 400, containers: [{ size: 8, priceMinor: 1900 }, { size: 33.8, priceMinor: 5400 }] }, units));
    const stored = getCatalogProduct(admin, p.id);
    // 400 ft²/US gal × 0.09290304 m²/ft² ÷ 3.785411784 L/US gal = 9.81695… m²/L, kept to 0.0001.
    expect(stored.coverageM2PerL).toBe(9.817);
    // 8 × 29.5735295625 = 236.588 mL → 237; 33.8 × 29.5735295625 = 999.585 mL → 1,000.
    expect(stored.containers).toEqual([{ ml: 237, priceMinor: 1900 }, { ml: 1000, priceMinor: 5400 }]);
  });

  it("saving an unchanged imperial form leaves the stored metric values exactly as they were", async () => {
    const studio = createStudio({ unitSystem: "imperial" });
    const admin = await memberContext(studio, "admin");
    const units = admin.studio.unitSystem;
    const p = createCatalogProduct(admin, { ...base, coverageM2PerL: 186, containers: [{ ml: 50, priceMinor: 3400 }, { ml: 250, priceMinor: 9900 }, { ml: 1000, priceMinor: 24000 }] });
    const shown = catalogProductToForm(p, units);
    // 186 ÷ 0.09290304 × 3.785411784 = 7,578.72 → 7,579 ft²/US gal; 50 mL = 1.6907 → 1.7, 250 mL = 8.4535 → 8.5,
    // 1,000 mL = 33.814 → 33.9 US fl oz (rounded up to 0.1, as the catalog list prints them: lib/care/quantity.ts displayFlOz).
    expect(shown).toEqual({ coverage: 7579, containers: [{ size: 1.7, priceMinor: 3400 }, { size: 8.5, priceMinor: 9900 }, { size: 33.9, priceMinor: 24000 }] });
    // Converted back alone, the shown figures would drift: 7,579 ft²/US gal is 186.0067 m²/L, 8.5 US fl oz is 251 mL.
    expect(ft2PerUsGalToM2PerL(7579)).not.toBe(186);
    for (let round = 0; round < 3; round++) {
      const before = getCatalogProduct(admin, p.id);
      updateCatalogProduct(admin, p.id, submit({ ...base, ...catalogProductToForm(before, units) }, units, before));
    }
    const after = getCatalogProduct(admin, p.id);
    expect(after.coverageM2PerL).toBe(186);
    expect(after.containers).toEqual([{ ml: 50, priceMinor: 3400 }, { ml: 250, priceMinor: 9900 }, { ml: 1000, priceMinor: 24000 }]);

    // One container removed and the coverage changed: the others keep their mL, the new coverage is converted.
    const before = getCatalogProduct(admin, p.id);
    const edited = catalogProductToForm(before, units);
    updateCatalogProduct(admin, p.id, submit({ ...base, coverage: 400, containers: edited.containers.slice(1) }, units, before));
    const changed = getCatalogProduct(admin, p.id);
    expect(changed.coverageM2PerL).toBe(9.817); // 400 ft²/US gal, worked in the first case
    expect(changed.containers).toEqual([{ ml: 250, priceMinor: 9900 }, { ml: 1000, priceMinor: 24000 }]);
  });

  it("a metric studio's form is the stored values as typed", async () => {
    const studio = createStudio({ unitSystem: "metric" });
    const admin = await memberContext(studio, "admin");
    const units = admin.studio.unitSystem;
    const p = createCatalogProduct(admin, submit({ ...base, coverage: 18.5, containers: [{ size: 250, priceMinor: 1900 }] }, units));
    expect([p.coverageM2PerL, p.containers]).toEqual([18.5, [{ ml: 250, priceMinor: 1900 }]]);
    expect(catalogProductToForm(p, units)).toEqual({ coverage: 18.5, containers: [{ size: 250, priceMinor: 1900 }] });
    const bad = catalogFormSchema(units).safeParse({ ...base, coverage: 1001, containers: [{ size: 2.5, priceMinor: 0 }] });
    expect(bad.error!.issues.map((i) => [i.path.join("."), i.message])).toEqual([
      ["coverage", "Coverage above 1,000 m²/L; check the unit."],
      ["containers.0.size", "Whole millilitres."],
    ]);
  });

  it("an imperial form's limits are the stored limits in its units, and the server's errors land on its fields", () => {
    // 1,000 m²/L ÷ 0.09290304 × 3.785411784 = 40,745.8 ft²/US gal; 3,381 US fl oz × 29.5735295625 = 99,988 mL (≤ 100,000).
    const bad = catalogFormSchema("imperial").safeParse({ ...base, coverage: 40_746, containers: [{ size: 0, priceMinor: 0 }, { size: 3382, priceMinor: 0 }] });
    expect(bad.error!.issues.map((i) => [i.path.join("."), i.message])).toEqual([
      ["coverage", "Coverage above 40,745 ft²/US gal; check the unit."],
      ["containers.0.size", "At least 0.1 US fl oz."],
      ["containers.1.size", "At most 3,381 US fl oz (26.4 US gal) a container."],
    ]);
    expect(catalogFormSchema("imperial").safeParse({ ...base, coverage: 40_745, containers: [{ size: 3381, priceMinor: 0 }] }).success).toBe(true);
    expect(catalogFormFieldErrors({ coverageM2PerL: ["a"], "containers.2.ml": ["b"], name: ["c"] })).toEqual({ coverage: ["a"], "containers.2.size": ["b"], name: ["c"] });
  });
});
