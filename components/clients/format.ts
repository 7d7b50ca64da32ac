// How the clients pages write instants: in the studio's time zone, naming the zone when it is not
// the viewer's own.
export function formatAt(at: string | number, studioZone: string, viewerZone: string, { time = true }: { time?: boolean } = {}): string {
  return new Intl.DateTimeFormat("en-GB", {
    timeZone: studioZone,
    day: "numeric",
    month: "long",
    year: "numeric",
    ...(time ? { hour: "2-digit", minute: "2-digit" } : {}),
    ...(time && studioZone !== viewerZone ? { timeZoneName: "short" } : {}),
  }).format(typeof at === "string" ? Date.parse(at) : at);
}
