// Dates and times, the one way they are written on pages, in e-mails, PDFs and the audit log.
// One form for every studio and owner: English words, day before month ("3 December 2026"), as the
// product's words are English; times on the 24-hour clock ("09:00"). Intl (ECMA-402 DateTimeFormat)
// with the "en-GB" locale gives that form from Unicode CLDR. Instants are written in a named IANA zone
// (the studio's for staff, the owner's for owners) and name it when the viewer's zone differs — or
// always, where a page has no way to know the viewer's zone.
import { addDays, localDate } from "@/lib/care/dates";

const DATE_LOCALE = "en-GB";

type DateOpts = Intl.DateTimeFormatOptions;
const formatters = new Map<string, Intl.DateTimeFormat>();

/** The one DateTimeFormat, cached by its options. */
function dtf(options: DateOpts): Intl.DateTimeFormat {
  const key = JSON.stringify(options);
  let f = formatters.get(key);
  if (!f) {
    f = new Intl.DateTimeFormat(DATE_LOCALE, options);
    formatters.set(key, f);
  }
  return f;
}

const noonUtc = (iso: string): number | null => {
  const [y, m, d] = iso.split("-").map(Number);
  return y && m && d ? Date.UTC(y, m - 1, d, 12) : null;
};

export type CalendarDateOptions = { short?: boolean; weekday?: "long" | "short"; year?: boolean };

/**
 * A calendar date YYYY-MM-DD: "3 December 2026"; short "3 Dec 2026"; with a weekday "Thursday,
 * 3 December 2026", or short "Thu 3 Dec" and "Thu 3 Dec 2026". A calendar date has no zone: it is the same day everywhere.
 */
export function formatDate(iso: string, { short = false, weekday, year = true }: CalendarDateOptions = {}): string {
  const ms = noonUtc(iso);
  if (ms === null) return iso;
  const f = dtf({ timeZone: "UTC", day: "numeric", month: short ? "short" : "long", ...(year ? { year: "numeric" } : {}), ...(weekday ? { weekday } : {}) });
  return short ? withShortMonth(f, ms) : f.format(ms);
}

/** "March 2026" for YYYY-MM or YYYY-MM-DD; short "Mar 2026" (chart axes), written as a short date writes its month. */
export function formatMonth(iso: string, { short = false }: { short?: boolean } = {}): string {
  const [y, m] = iso.split("-").map(Number);
  if (!y || !m) return iso;
  const ms = Date.UTC(y, m - 1, 15);
  return short ? withShortMonth(dtf({ timeZone: "UTC", month: "short", year: "numeric" }), ms) : dtf({ timeZone: "UTC", month: "long", year: "numeric" }).format(ms);
}

/**
 * A short form with its month as the first three letters of the month's name, "Sep" like "Dec": CLDR
 * en-GB alone shortens September to "Sept" (and only September), so a chart axis read "Aug, Sept, Oct".
 */
function withShortMonth(f: Intl.DateTimeFormat, ms: number): string {
  const parts = f.formatToParts(ms);
  return parts
    .map((p, i) => {
      if (p.type === "month") return dtf({ timeZone: "UTC", month: "long" }).format(ms).slice(0, 3);
      // "Sun 6 Dec 2026" as "Mon 30 Nov": Intl puts a comma after the weekday only when a year follows.
      if (p.type === "literal" && parts[i - 1]?.type === "weekday") return " ";
      return p.value;
    })
    .join("");
}

export type InstantOptions = { time?: boolean };

/**
 * An instant as a date (and time) in `timeZone`: "3 December 2026" or "3 December 2026 at 09:00 CET".
 * With a time the zone is always named: a time is never shown without its zone.
 */
export function formatInstant(at: Date | number | string, timeZone: string, { time = false }: InstantOptions = {}): string {
  const ms = typeof at === "string" ? Date.parse(at) : typeof at === "number" ? at : at.getTime();
  const text = dtf({ timeZone, day: "numeric", month: "long", year: "numeric", ...(time ? { hour: "2-digit", minute: "2-digit" } : {}) }).format(ms);
  return time ? `${text} ${zoneAbbreviation(ms, timeZone)}` : text;
}

/**
 * The zone's short name at that instant as its own region writes it: "CET" for Berlin (from en-GB),
 * "PST"/"PDT" for Los Angeles (from en-US, where en-GB only has "GMT-8"); the offset where neither has a name.
 */
export function zoneAbbreviation(ms: number, timeZone: string): string {
  const short = (locale: string) => zoneNamer(locale, timeZone).formatToParts(ms).find((p) => p.type === "timeZoneName")?.value ?? "";
  const gb = short(DATE_LOCALE);
  if (!gb.startsWith("GMT")) return gb;
  const us = short("en-US");
  return us && !us.startsWith("GMT") ? us : gb;
}

const namers = new Map<string, Intl.DateTimeFormat>();
function zoneNamer(locale: string, timeZone: string): Intl.DateTimeFormat {
  const key = `${locale} ${timeZone}`;
  let f = namers.get(key);
  if (!f) {
    f = new Intl.DateTimeFormat(locale, { timeZone, timeZoneName: "short" });
    namers.set(key, f);
  }
  return f;
}

/** A time of day on the 24-hour clock in `timeZone`: "09:00"; with `named`, "09:00 CET". */
export function formatClock(ms: number, timeZone: string, { named = false }: { named?: boolean } = {}): string {
  const clock = dtf({ hour: "2-digit", minute: "2-digit", hourCycle: "h23", timeZone }).format(ms);
  return named ? `${clock} ${zoneAbbreviation(ms, timeZone)}` : clock;
}

/**
 * A visit's slot in `timeZone`, naming the zone as every time shown to a person does:
 * "Thursday, 3 December 2026, 09:00–11:00 EST" (the zone of its end, the same as its start's but
 * across a clock change).
 */
export function formatVisitWhen(startMs: number, endMs: number, timeZone: string): string {
  const day = dtf({ weekday: "long", day: "numeric", month: "long", year: "numeric", timeZone }).format(startMs);
  return `${day}, ${formatClock(startMs, timeZone)}–${formatClock(endMs, timeZone, { named: true })}`;
}

/**
 * "today", "tomorrow" or "on Friday, 4 June 2027": the visit's day as the reader's own calendar in
 * `timeZone` sees it at `nowMs` — not "within 24 hours", which reads 09:00 today as tomorrow at 08:42.
 */
export function visitDayWord(startMs: number, nowMs: number, timeZone: string): string {
  const day = localDate(startMs, timeZone);
  const today = localDate(nowMs, timeZone);
  if (day === today) return "today";
  if (day === addDays(today, 1)) return "tomorrow";
  return `on ${dtf({ weekday: "long", day: "numeric", month: "long", year: "numeric", timeZone }).format(startMs)}`;
}

/**
 * The zone an owner reads visit times in: their account's; while they have never set one (still
 * "UTC", the sign-up default, as the account page reads it), the studio's client record of them, else
 * the studio's own.
 */
export function ownerTimeZone(account: string, client: string | null | undefined, studio: string): string {
  return account !== "UTC" ? account : (client ?? studio);
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

/**
 * How long something has waited, short for lists: "under a minute", "40 min", "3 h", "2 d 4 h", "4 d",
 * "12 d". Under a minute is said in words, never "0 min" ("waiting 0 min for a first answer").
 */
export function formatWait(ms: number): string {
  const h = Math.max(0, Math.floor(ms / 3_600_000));
  if (h < 1) {
    const min = Math.floor(ms / 60_000);
    return min < 1 ? "under a minute" : `${min} min`;
  }
  if (h < 48) return `${h} h`;
  const d = Math.floor(h / 24);
  return d < 10 && h % 24 ? `${d} d ${h % 24} h` : `${d} d`;
}

/** How long ago something happened, short for lists: "just now" under a minute, else "40 min ago", "2 d 4 h ago". */
export function formatAgo(ms: number): string {
  return ms < 60_000 ? "just now" : `${formatWait(ms)} ago`;
}

/** When to try again, in a sentence: "1 second", "20 seconds", "3 minutes". */
export function formatRetryWait(sec: number): string {
  const [n, unit] = sec < 90 ? [Math.max(1, Math.ceil(sec)), "second"] : [Math.ceil(sec / 60), "minute"];
  return `${n} ${unit}${n === 1 ? "" : "s"}`;
}

/** How long a visit takes, in a sentence, to the quarter hour: "30 minutes", "1 hour", "1 hour 30 minutes", "2 hours". */
export function formatDuration(minutes: number): string {
  const total = Math.max(15, Math.round(minutes / 15) * 15);
  const h = Math.floor(total / 60);
  const m = total % 60;
  const hours = h === 0 ? "" : `${h} hour${h === 1 ? "" : "s"}`;
  const mins = m === 0 ? "" : `${m} minutes`;
  return [hours, mins].filter(Boolean).join(" ");
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

/** Places the runtime still lists under an old name (IANA keeps the old ids as links), as they are called now. */
const PLACE_NOW: Record<string, string> = {
  Kiev: "Kyiv",
  Calcutta: "Kolkata",
  Saigon: "Ho Chi Minh City",
  Rangoon: "Yangon",
  Katmandu: "Kathmandu",
  Godthab: "Nuuk",
  Asmera: "Asmara",
  Truk: "Chuuk",
  Ponape: "Pohnpei",
  Enderbury: "Kanton",
  Faeroe: "Faroe Islands",
  DumontDUrville: "Dumont d’Urville",
};

/**
 * A zone as people say it: its generic name from CLDR and the place the IANA name is after,
 * "Pacific Time, Los Angeles", "Central European Time, Berlin"; "UTC" for UTC itself.
 */
export function formatZone(timeZone: string): string {
  if (timeZone === "UTC" || timeZone === "Etc/UTC") return "UTC";
  // The name the zone has now: read at 1970 (formatToParts(0)) Kyiv, Riga, Vilnius and Tallinn were
  // "Moscow Time", Lisbon "Central European Time" and Istanbul "Eastern European Time".
  const generic = dtf({ timeZone, timeZoneName: "longGeneric" }).formatToParts(Date.now()).find((p) => p.type === "timeZoneName")?.value;
  const last = timeZone.split("/").pop()!;
  const place = PLACE_NOW[last] ?? last.replace(/_/g, " ");
  return generic && !generic.startsWith("GMT") ? `${generic.replace(/ Standard Time$/, " Time")}, ${place}` : place;
}

/** Whether `timeZone` is an IANA zone this runtime knows ("Europe/Berlin"). */
export function isTimeZone(timeZone: string): boolean {
  try {
    new Intl.DateTimeFormat("en-US", { timeZone });
    return true;
  } catch {
    return false;
  }
}

/** The browser's (or server's) own zone, or null where the runtime does not say. */
export function runtimeTimeZone(): string | null {
  return Intl.DateTimeFormat().resolvedOptions().timeZone || null;
}
