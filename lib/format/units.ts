// Lengths, areas, volumes, temperatures and distances in the reader's unit system. Stored values are
// metric (mm, m², mL, °C, km); 1 in = 25.4 mm, 1 ft² = 0.09290304 m², 1 US gal = 3.785411784 L and
// 1 mi = 1.609344 km exactly (lib/care/units). Numbers group with English separators ("2,440 mm"):
// the product's words are English in every region.
import { displayFlOz, displayMl } from "@/lib/care/quantity";
import { KM_PER_MILE, L_PER_US_GALLON, M2_PER_FT2, MM_PER_INCH, m2PerLToFt2PerUsGal } from "@/lib/care/units";

export type UnitSystem = "metric" | "imperial";

const NUMBER_LOCALE = "en-US";
const grouped = (n: number) => n.toLocaleString(NUMBER_LOCALE);
const oneDecimal = (n: number) => Number(n.toFixed(1)).toLocaleString(NUMBER_LOCALE);
const otherSystem = (units: UnitSystem): UnitSystem => (units === "metric" ? "imperial" : "metric");

/**
 * Inches as a woodworker's tape reads them: whole inches and a fraction to 1/16 in, reduced
 * ("37 5/8 in", "96 in", "5/16 in").
 */
export function formatInchesTape(mm: number): string {
  const sixteenths = Math.round((mm / MM_PER_INCH) * 16);
  const whole = Math.floor(sixteenths / 16);
  let num = sixteenths % 16;
  let den = 16;
  while (num > 0 && num % 2 === 0) {
    num /= 2;
    den /= 2;
  }
  const frac = num === 0 ? "" : `${num}/${den}`;
  if (whole === 0 && frac) return `${frac} in`;
  return `${grouped(whole)}${frac ? ` ${frac}` : ""} in`;
}

/** A length in mm as the reader's unit system writes it: "2,440 mm" or "96 1/16 in". */
export function formatLength(mm: number, units: UnitSystem): string {
  if (units === "metric") return `${grouped(mm)} mm`;
  return formatInchesTape(mm);
}

/**
 * A board's thickness: in imperial, inches and — for staff, where it is a whole number of quarter
 * inches from 4/4 to 16/4 within 1/32 in — the lumber trade's quarters ("2 in (8/4)"); owners read
 * the inches alone (`quarters: false`), the quarters being the trade's shorthand. Metric: "51 mm".
 */
export function formatThickness(mm: number, units: UnitSystem, { quarters: withQuarters = true }: { quarters?: boolean } = {}): string {
  if (units === "metric") return formatLength(mm, units);
  if (!withQuarters) return formatInchesTape(mm);
  const inches = mm / MM_PER_INCH;
  const quarters = Math.round(inches * 4);
  const fits = quarters >= 4 && quarters <= 16 && Math.abs(inches - quarters / 4) <= 1 / 32;
  return fits ? `${formatInchesTape((quarters / 4) * MM_PER_INCH)} (${quarters}/4)` : formatInchesTape(mm);
}

/** For staff records: the studio's unit first, the other in brackets ("2,438 mm (96 in)"). */
export function formatLengthBoth(mm: number | null | undefined, units: UnitSystem): string {
  if (mm == null) return "—";
  return `${formatLength(mm, units)} (${formatLength(mm, otherSystem(units))})`;
}

export function formatArea(m2: number, units: UnitSystem): string {
  return units === "metric" ? `${m2.toFixed(2)} m²` : `${(m2 / M2_PER_FT2).toFixed(1)} ft²`;
}

/** For staff records: an area in the studio's unit first, the other in brackets. */
export function formatAreaBoth(m2: number | null | undefined, units: UnitSystem): string {
  if (m2 == null) return "—";
  return `${formatArea(m2, units)} (${formatArea(m2, otherSystem(units))})`;
}

/**
 * Product volume from the engine's exact mL (productNeeded().exactMl, or a container's size): mL, or
 * US fl oz with mL in brackets, as labels print both. Each figure is rounded up once, from the exact
 * amount (displayMl, displayFlOz), never from an already rounded one.
 */
export function formatVolume(exactMl: number, units: UnitSystem): string {
  const ml = grouped(displayMl(exactMl));
  if (units === "metric") return `${ml} mL`;
  return `${displayFlOz(exactMl)} US fl oz (${ml} mL)`;
}

/**
 * A finish's coverage per coat, stored in m²/L: as metric data sheets print it, or in ft² per US gallon
 * (as US labels print it) with m²/L in brackets: "7,579 ft²/US gal (186 m²/L)".
 */
export function formatCoverage(m2PerL: number, units: UnitSystem): string {
  const metric = `${oneDecimal(m2PerL)} m²/L`;
  if (units === "metric") return metric;
  return `${grouped(Math.round(m2PerLToFt2PerUsGal(m2PerL)))} ft²/US gal (${metric})`;
}

/** A large volume (resin pours) for staff records: litres or US gallons, the other in brackets. */
export function formatLargeVolume(ml: number | null | undefined, units: UnitSystem): string {
  if (ml == null) return "—";
  const l = `${Number((ml / 1000).toFixed(2))} L`;
  const gal = `${Number((ml / 1000 / L_PER_US_GALLON).toFixed(2))} US gal`;
  return units === "imperial" ? `${gal} (${l})` : `${l} (${gal})`;
}

/** A temperature reading stored in °C, in the reader's units to 0.1: "21.1 °C" or "70 °F" ((°C × 9/5) + 32). */
export function formatTemperature(c: number, units: UnitSystem): string {
  return units === "metric" ? `${oneDecimal(c)} °C` : `${oneDecimal((c * 9) / 5 + 32)} °F`;
}

/** A temperature change (a difference, no offset) stored in °C: "5 °C" or "9 °F" (°C × 9/5). */
export function formatTemperatureChange(c: number, units: UnitSystem): string {
  return units === "metric" ? `${oneDecimal(c)} °C` : `${oneDecimal((c * 9) / 5)} °F`;
}

/** A road distance (travel on a quote): "12 km", or miles to 0.1 ("7.5 mi"). */
export function formatDistance(km: number, units: UnitSystem): string {
  if (units === "metric") return `${oneDecimal(km)} km`;
  return `${oneDecimal(km / KM_PER_MILE)} mi`;
}

export type TopShape = { shapeKind: string; lengthMm: number | null; widthMm: number | null; diameterMm: number | null; measuredAreaM2: number | null };

/** A top's size: "2,440 × 1,020 mm", "Round, Ø 900 mm", "Live-edge top, 1.20 m² measured". */
export function formatSize(shape: TopShape, units: UnitSystem): string {
  const unit = units === "metric" ? " mm" : " in";
  const n = (mm: number) => formatLength(mm, units).replace(/ (mm|in)$/, "");
  // "96 × 37 5/8 in" reads well; "Ø 36 in" too.
  if ((shape.shapeKind === "rectangle" || shape.shapeKind === "oval") && shape.lengthMm && shape.widthMm) {
    return `${shape.shapeKind === "oval" ? "Oval, " : ""}${n(shape.lengthMm)} × ${n(shape.widthMm)}${unit}`;
  }
  if (shape.shapeKind === "round" && shape.diameterMm) return `Round, Ø ${n(shape.diameterMm)}${unit}`;
  if (shape.shapeKind === "measured" && shape.measuredAreaM2) return `Live-edge top, ${formatArea(shape.measuredAreaM2, units)} measured`;
  return "Size not recorded";
}

/** A size limit in a sentence, rounded down: "15 MB", "256 KB". */
export function formatBytes(bytes: number): string {
  const mb = bytes / (1024 * 1024);
  return mb >= 1 ? `${Math.floor(mb)} MB` : `${Math.max(1, Math.floor(bytes / 1024))} KB`;
}
