import type { UnitSystem } from "./unit-fields";

const MM_PER_INCH = 25.4; // exact (NIST Handbook 44 App. C)

/** A stored length in the studio's unit system, with the other in brackets for the record. */
export function formatLength(mm: number | null | undefined, system: UnitSystem): string {
  if (mm == null) return "—";
  const inches = `${Number((mm / MM_PER_INCH).toFixed(2))} in`;
  const metric = `${mm} mm`;
  return system === "imperial" ? `${inches} (${metric})` : `${metric} (${inches})`;
}

export function formatArea(area: { m2: number; ft2: number } | null, system: UnitSystem): string {
  if (!area) return "—";
  const m = `${area.m2.toFixed(2)} m²`;
  const f = `${area.ft2.toFixed(1)} ft²`;
  return system === "imperial" ? `${f} (${m})` : `${m} (${f})`;
}

export function formatVolume(ml: number | null | undefined, system: UnitSystem): string {
  if (ml == null) return "—";
  const l = `${Number((ml / 1000).toFixed(2))} L`;
  const gal = `${Number((ml / 3785.411784).toFixed(2))} US gal`;
  return system === "imperial" ? `${gal} (${l})` : `${l} (${gal})`;
}
