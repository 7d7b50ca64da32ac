// How the owner's side writes dates, lengths, areas and volumes: in the owner's time zone and unit
// system. Pure (no server-only import): the PDF, the e-mails and the client components use it too.
import { displayFlOz, displayMl } from "@/lib/care/quantity";
import { KM_PER_MILE, L_PER_US_GALLON, M2_PER_FT2, MM_PER_INCH } from "@/lib/care/units";

export type UnitSystem = "metric" | "imperial";

const MONTHS = ["January", "February", "March", "April", "May", "June", "July", "August", "September", "October", "November", "December"];
const SHORT_MONTHS = MONTHS.map((m) => m.slice(0, 3));

/** "2 March 2026" for a calendar date YYYY-MM-DD (no time zone: a calendar date is the same everywhere). */
export function formatDate(iso: string, { short = false }: { short?: boolean } = {}): string {
  const [y, m, d] = iso.split("-").map(Number);
  if (!y || !m || !d) return iso;
  return `${d} ${(short ? SHORT_MONTHS : MONTHS)[m - 1]} ${y}`;
}

/** "March 2026". */
export function formatMonth(iso: string): string {
  const [y, m] = iso.split("-").map(Number);
  if (!y || !m) return iso;
  return `${MONTHS[m - 1]} ${y}`;
}

/** An instant as a date (and time) in the owner's time zone. */
export function formatInstant(at: Date | number, timeZone: string, { time = false }: { time?: boolean } = {}): string {
  const d = typeof at === "number" ? new Date(at) : at;
  return new Intl.DateTimeFormat("en-GB", {
    timeZone,
    day: "numeric",
    month: "long",
    year: "numeric",
    ...(time ? { hour: "2-digit", minute: "2-digit", timeZoneName: "short" } : {}),
  }).format(d);
}

/** "in 12 days", "today", "3 days ago". */
export function relativeDays(days: number): string {
  if (days === 0) return "today";
  if (days === 1) return "tomorrow";
  if (days === -1) return "yesterday";
  if (days > 0) return days < 60 ? `in ${days} days` : `in about ${Math.round(days / 30.44)} months`;
  const ago = -days;
  return ago < 60 ? `${ago} days ago` : `about ${Math.round(ago / 30.44)} months ago`;
}

/** Time left on a warranty line: "1 year 3 months", "24 days", or "ended". */
export function formatTimeLeft(days: number): string {
  if (days < 0) return "ended";
  if (days < 60) return `${days} day${days === 1 ? "" : "s"}`;
  const months = Math.floor(days / 30.44);
  const years = Math.floor(months / 12);
  const rest = months % 12;
  const parts = [];
  if (years) parts.push(`${years} year${years === 1 ? "" : "s"}`);
  if (rest) parts.push(`${rest} month${rest === 1 ? "" : "s"}`);
  return parts.join(" ");
}

/**
 * Inches as a woodworker's tape reads them: whole inches and a fraction to 1/16 in, reduced
 * ("37 5/8 in", "96 in", "5/16 in"). 1 in = 25.4 mm exactly (lib/care/units).
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
  return `${whole.toLocaleString("en-US")}${frac ? ` ${frac}` : ""} in`;
}

/** A length in mm as the reader's unit system writes it: "2,440 mm" or "96 1/16 in". */
export function formatLength(mm: number, units: UnitSystem): string {
  if (units === "metric") return `${mm.toLocaleString("en-US")} mm`;
  return formatInchesTape(mm);
}

/**
 * A board's thickness: in imperial, inches and — where it is a whole number of quarter inches from
 * 4/4 to 16/4 within 1/32 in — the lumber trade's quarters ("2 in (8/4)"). Metric: "51 mm".
 */
export function formatThickness(mm: number, units: UnitSystem): string {
  if (units === "metric") return formatLength(mm, units);
  const inches = mm / MM_PER_INCH;
  const quarters = Math.round(inches * 4);
  const fits = quarters >= 4 && quarters <= 16 && Math.abs(inches - quarters / 4) <= 1 / 32;
  return fits ? `${formatInchesTape((quarters / 4) * MM_PER_INCH)} (${quarters}/4)` : formatInchesTape(mm);
}

/** For staff records: the studio's unit first, the other in brackets ("2,438 mm (96 in)"). */
export function formatLengthBoth(mm: number | null | undefined, units: UnitSystem): string {
  if (mm == null) return "—";
  const other: UnitSystem = units === "metric" ? "imperial" : "metric";
  return `${formatLength(mm, units)} (${formatLength(mm, other)})`;
}

export function formatArea(m2: number, units: UnitSystem): string {
  return units === "metric" ? `${m2.toFixed(2)} m²` : `${(m2 / M2_PER_FT2).toFixed(1)} ft²`;
}

/** For staff records: an area in the studio's unit first, the other in brackets. */
export function formatAreaBoth(m2: number | null | undefined, units: UnitSystem): string {
  if (m2 == null) return "—";
  const other: UnitSystem = units === "metric" ? "imperial" : "metric";
  return `${formatArea(m2, units)} (${formatArea(m2, other)})`;
}

/**
 * Product volume from the engine's exact mL (productNeeded().exactMl, or a container's size): mL, or
 * US fl oz with mL in brackets, as labels print both. Each figure is rounded up once, from the exact
 * amount (displayMl, displayFlOz), never from an already rounded one.
 */
export function formatVolume(exactMl: number, units: UnitSystem): string {
  const ml = displayMl(exactMl).toLocaleString("en-US");
  if (units === "metric") return `${ml} mL`;
  return `${displayFlOz(exactMl)} US fl oz (${ml} mL)`;
}

const oneDecimal = (n: number) => Number(n.toFixed(1)).toLocaleString("en-US");

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
  if (units === "metric") return `${Number(km.toFixed(1)).toLocaleString("en-US")} km`;
  return `${Number((km / KM_PER_MILE).toFixed(1)).toLocaleString("en-US")} mi`;
}

/** A large volume (resin pours) for staff records: litres or US gallons, the other in brackets. */
export function formatLargeVolume(ml: number | null | undefined, units: UnitSystem): string {
  if (ml == null) return "—";
  const l = `${Number((ml / 1000).toFixed(2))} L`;
  const gal = `${Number((ml / 1000 / L_PER_US_GALLON).toFixed(2))} US gal`;
  return units === "imperial" ? `${gal} (${l})` : `${l} (${gal})`;
}

/** A top's size: "2,440 × 1,020 mm", "Ø 900 mm", or a measured area. */
export function formatSize(
  shape: { shapeKind: string; lengthMm: number | null; widthMm: number | null; diameterMm: number | null; measuredAreaM2: number | null },
  units: UnitSystem,
): string {
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

/**
 * A care task's state in owner words, named by what to do (the engine's status says where the date
 * falls; "done" only means the last cycle was started by care, which says nothing about what is next):
 * - now: the due date has passed;
 * - soon: inside the reminder window (the 14 days up to the due date);
 * - plan: due within the next two months;
 * - later: nothing to do yet.
 */
export type OwnerTaskState = "now" | "soon" | "plan" | "later";

export const OWNER_TASK_STATE_WORDS: Record<OwnerTaskState, string> = {
  now: "Overdue: do it now",
  soon: "Due: do it soon",
  plan: "Coming up: plan for it",
  later: "Nothing to do yet",
};

/** Days ahead within which a task is worth planning for. */
export const PLAN_AHEAD_DAYS = 60;

export function ownerTaskState(status: "upcoming" | "due" | "overdue" | "done", daysUntilDue: number): OwnerTaskState {
  if (status === "overdue" || daysUntilDue < 0) return "now";
  if (status === "due") return "soon";
  return daysUntilDue <= PLAN_AHEAD_DAYS ? "plan" : "later";
}

/** The locale money is written in for a studio's country (ISO 3166-1 alpha-2): "US" → "en-US", "DE" → "de-DE". */
export function moneyLocale(country: string): string {
  try {
    const l = new Intl.Locale("und", { region: country }).maximize();
    return `${l.language}-${l.region}`;
  } catch {
    return "en-US";
  }
}

/**
 * Money from integer minor units, the one way it is written everywhere (pages, e-mails, PDFs, CSV):
 * by Intl for the studio's country — "$85.00" (US), "85,00 €" (DE), "￥1,235" (JP). The amount goes to
 * Intl as an exact decimal string, never as minor ÷ 100 in floating point.
 */
export function formatMoney(minor: number, currency: string, country = "US"): string {
  const exp = new Intl.NumberFormat("en", { style: "currency", currency }).resolvedOptions().maximumFractionDigits ?? 2;
  const sign = minor < 0 ? "-" : "";
  const digits = String(Math.abs(Math.trunc(minor))).padStart(exp + 1, "0");
  const decimal = exp === 0 ? digits : `${digits.slice(0, -exp)}.${digits.slice(-exp)}`;
  return new Intl.NumberFormat(moneyLocale(country), { style: "currency", currency }).format(`${sign}${decimal}` as `${number}`);
}
