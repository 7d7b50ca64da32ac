// Visit times as people read them, in the studio's (or, in an owner's mail, the owner's) time zone.
// Pure: client components use it too.
import { addDays, localDate } from "@/lib/care/dates";

export function formatVisitWhen(startMs: number, endMs: number, timeZone: string): string {
  const day = new Intl.DateTimeFormat("en-GB", { weekday: "long", day: "numeric", month: "long", year: "numeric", timeZone }).format(startMs);
  return `${day}, ${formatClock(startMs, timeZone)}–${formatClock(endMs, timeZone)}`;
}

export function formatClock(ms: number, timeZone: string): string {
  return new Intl.DateTimeFormat("en-GB", { hour: "2-digit", minute: "2-digit", hourCycle: "h23", timeZone }).format(ms);
}

/**
 * "today", "tomorrow" or "on Friday 4 June 2027": the visit's day as the reader's own calendar in
 * `timeZone` sees it at `nowMs` — not "within 24 hours", which reads 09:00 today as tomorrow at 08:42.
 */
export function visitDayWord(startMs: number, nowMs: number, timeZone: string): string {
  const day = localDate(startMs, timeZone);
  const today = localDate(nowMs, timeZone);
  if (day === today) return "today";
  if (day === addDays(today, 1)) return "tomorrow";
  return `on ${new Intl.DateTimeFormat("en-GB", { weekday: "long", day: "numeric", month: "long", year: "numeric", timeZone }).format(startMs)}`;
}

/**
 * The zone an owner reads visit times in: their account's; while they have never set one (still
 * "UTC", the sign-up default, as the account page reads it), the studio's client record of them, else
 * the studio's own.
 */
export function ownerTimeZone(account: string, client: string | null | undefined, studio: string): string {
  return account !== "UTC" ? account : (client ?? studio);
}
