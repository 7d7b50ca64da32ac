// The finish catalog's form (components/catalog/catalog-manager.tsx) in the studio's units. The catalog is
// stored metric (m²/L, whole mL; lib/validation/pieces.ts catalogProductSchema, which the API parses); an
// imperial studio types coverage in ft²/US gal and container sizes in US fl oz, as US labels print them.
// The form's values become the stored ones in one place, catalogFormToProduct, when the form is sent;
// catalogProductToForm is its inverse for editing. Conversions: lib/care/units.ts.
import { z } from "zod";
import { displayFlOz } from "@/lib/care/quantity";
import { ft2PerUsGalToM2PerL, m2PerLToFt2PerUsGal, usFlOzToMl } from "@/lib/care/units";
import { formatCount } from "@/lib/format/money";
import type { UnitSystem } from "@/lib/format/units";
import type { FieldErrors } from "@/lib/errors";
import { catalogProductSchema, type CatalogProductInput } from "@/lib/validation/pieces";

const stored = catalogProductSchema.shape;
const storedContainer = stored.containers.unwrap().element.shape;

/** The largest coverage the stored schema takes (1,000 m²/L), in ft²/US gal: 40,745. */
const MAX_FT2_PER_GAL = Math.floor(m2PerLToFt2PerUsGal(1000));
/** The largest container the stored schema takes (100,000 mL), in whole US fl oz: 3,381 (26.4 US gal). */
const MAX_FL_OZ = 3381;

const imperialCoverage = z
  .number({ error: (issue) => (issue.input == null ? "Enter the coverage." : "Coverage must be a number.") })
  .positive("Coverage must be more than 0.")
  .max(MAX_FT2_PER_GAL, `Coverage above ${formatCount(MAX_FT2_PER_GAL)} ft²/US gal; check the unit.`);
const imperialSize = z
  .number({ error: (issue) => (issue.input == null ? "Enter the size." : "Size must be a number.") })
  .min(0.1, "At least 0.1 US fl oz.")
  .max(MAX_FL_OZ, `At most ${formatCount(MAX_FL_OZ)} US fl oz (26.4 US gal) a container.`);

/** The form's fields: the stored product's, with coverage and container sizes in the studio's units. */
export function catalogFormSchema(units: UnitSystem) {
  const metric = units === "metric";
  return catalogProductSchema.omit({ coverageM2PerL: true, containers: true }).extend({
    coverage: metric ? stored.coverageM2PerL : imperialCoverage,
    containers: z
      .array(z.object({ size: metric ? storedContainer.ml : imperialSize, priceMinor: storedContainer.priceMinor }))
      .max(10, "At most 10 container sizes.")
      .default([]),
  });
}
export type CatalogFormValues = z.input<ReturnType<typeof catalogFormSchema>>;
export type CatalogFormOutput = z.output<ReturnType<typeof catalogFormSchema>>;

type StoredUnits = { coverageM2PerL: number; containers: { ml: number; priceMinor: number }[] };

/** As the form shows them: metric as stored; imperial as the catalog list prints them (whole ft²/US gal, US fl oz to 0.1). */
const shownCoverage = (m2PerL: number, units: UnitSystem) => (units === "metric" ? m2PerL : Math.round(m2PerLToFt2PerUsGal(m2PerL)));
const shownSize = (ml: number, units: UnitSystem) => (units === "metric" ? ml : displayFlOz(ml));

/** A stored product's coverage and containers as the form shows them for editing. */
export function catalogProductToForm(p: StoredUnits, units: UnitSystem): Pick<CatalogFormOutput, "coverage" | "containers"> {
  return { coverage: shownCoverage(p.coverageM2PerL, units), containers: p.containers.map((c) => ({ size: shownSize(c.ml, units), priceMinor: c.priceMinor })) };
}

/**
 * The form's values as the catalog stores them. A figure left as the form showed it keeps the stored
 * value (`before`, the product being edited), so saving an unchanged form changes nothing: 186 m²/L shows
 * as 7,579 ft²/US gal, which alone would come back as 185.9987 m²/L. A container is matched by its place,
 * else by any stored size that shows the same. New figures: coverage to 0.0001 m²/L, sizes to a whole mL.
 */
export function catalogFormToProduct(v: CatalogFormValues, units: UnitSystem, before?: StoredUnits): CatalogProductInput {
  const { coverage, containers = [], ...rest } = v;
  if (units === "metric") return { ...rest, coverageM2PerL: coverage, containers: containers.map((c) => ({ ml: c.size, priceMinor: c.priceMinor })) };
  const coverageM2PerL = before && coverage === shownCoverage(before.coverageM2PerL, units) ? before.coverageM2PerL : Math.round(ft2PerUsGalToM2PerL(coverage) * 1e4) / 1e4;
  const keptMl = (size: number, i: number) => {
    const same = (c: { ml: number } | undefined) => c !== undefined && shownSize(c.ml, units) === size;
    const atPlace = before?.containers[i];
    return same(atPlace) ? atPlace!.ml : before?.containers.find(same)?.ml;
  };
  return {
    ...rest,
    coverageM2PerL,
    containers: containers.map((c, i) => ({ ml: keptMl(c.size, i) ?? Math.round(usFlOzToMl(c.size)), priceMinor: c.priceMinor })),
  };
}

/** The server's field errors (stored names, lib/validation/pieces.ts) under the form's field names. */
export function catalogFormFieldErrors(errors: FieldErrors | undefined): FieldErrors | undefined {
  if (!errors) return errors;
  return Object.fromEntries(Object.entries(errors).map(([k, m]) => [k === "coverageM2PerL" ? "coverage" : k.replace(/^(containers\.\d+)\.ml$/, "$1.size"), m]));
}
