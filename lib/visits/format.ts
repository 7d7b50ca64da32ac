// Visit times as people read them, in the studio's time zone. Pure: client components use it too.

export function formatVisitWhen(startMs: number, endMs: number, timeZone: string): string {
  const day = new Intl.DateTimeFormat("en-GB", { weekday: "long", day: "numeric", month: "long", year: "numeric", timeZone }).format(startMs);
  return `${day}, ${formatClock(startMs, timeZone)}–${formatClock(endMs, timeZone)}`;
}

export function formatClock(ms: number, timeZone: string): string {
  return new Intl.DateTimeFormat("en-GB", { hour: "2-digit", minute: "2-digit", hourCycle: "h23", timeZone }).format(ms);
}

export function formatDay(ms: number, timeZone: string): string {
  return new Intl.DateTimeFormat("en-GB", { weekday: "short", day: "numeric", month: "short", timeZone }).format(ms);
}

export function formatDuration(min: number): string {
  const h = Math.floor(min / 60);
  const m = min % 60;
  return h ? `${h} h${m ? ` ${m} min` : ""}` : `${m} min`;
}
