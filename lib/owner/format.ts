// How the owner's side writes dates, lengths, areas and volumes: in the owner's time zone and unit
// system. Pure (no server-only import): the PDF, the e-mails and the client components use it too.
import { M2_PER_FT2, MM_PER_INCH, ML_PER_US_FL_OZ } from "@/lib/care/units";

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

/** A length in mm as the owner reads it: "2,440 mm" or "96 in". */
export function formatLength(mm: number, units: UnitSystem): string {
  if (units === "metric") return `${mm.toLocaleString("en-US")} mm`;
  const inches = mm / MM_PER_INCH;
  const rounded = inches >= 24 ? Math.round(inches) : Math.round(inches * 4) / 4;
  return `${rounded.toLocaleString("en-US")} in`;
}

export function formatArea(m2: number, units: UnitSystem): string {
  return units === "metric" ? `${m2.toFixed(2)} m²` : `${(m2 / M2_PER_FT2).toFixed(1)} ft²`;
}

/** Product volume: mL, or US fl oz (with mL in brackets, as labels print both). */
export function formatVolume(ml: number, units: UnitSystem): string {
  if (units === "metric") return `${ml.toLocaleString("en-US")} mL`;
  const oz = Math.ceil((ml / ML_PER_US_FL_OZ) * 10) / 10;
  return `${oz} US fl oz (${ml.toLocaleString("en-US")} mL)`;
}

/** A top's size: "2,440 × 1,020 mm", "Ø 900 mm", or a measured area. */
export function formatSize(
  shape: { shapeKind: string; lengthMm: number | null; widthMm: number | null; diameterMm: number | null; measuredAreaM2: number | null },
  units: UnitSystem,
): string {
  const unit = units === "metric" ? " mm" : " in";
  const n = (mm: number) => formatLength(mm, units).replace(/ (mm|in)$/, "");
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
