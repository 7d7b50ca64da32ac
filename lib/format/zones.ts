// Time zones as a person picks one: each IANA zone named in words (formatZone: "Pacific Time, Los
// Angeles"), grouped by region and sorted by that name, so the zones sharing a clock sit together.
// The IANA id stays the value that is saved. Pages name the zones on the server (zoneChoices) and hand
// the words to the form: the browser's time-zone names can differ from the server's, and a label
// worked out on both sides would not match when the page hydrates.
import { formatZone } from "./dates";

export type ZoneOption = { value: string; label: string };
export type ZoneGroup = { region: string; zones: ZoneOption[] };
export type ZoneChoices = { utc: ZoneOption; groups: ZoneGroup[] };

const REGION_WORDS: Record<string, string> = {
  Africa: "Africa",
  America: "The Americas",
  Antarctica: "Antarctica",
  Arctic: "Arctic",
  Asia: "Asia",
  Atlantic: "Atlantic islands",
  Australia: "Australia",
  Europe: "Europe",
  Indian: "Indian Ocean islands",
  Pacific: "Pacific",
};

/** One zone in words; a zone with a middle part names it too ("Central Time, Knox (Indiana)"). */
export function zoneOption(value: string): ZoneOption {
  if (value === "UTC" || value === "Etc/UTC") return { value, label: "UTC (Coordinated Universal Time)" };
  const parts = value.split("/");
  const sub = parts.length > 2 ? parts[1]!.replace(/_/g, " ") : null;
  return { value, label: sub ? `${formatZone(value)} (${sub})` : formatZone(value) };
}

/**
 * The zones in groups by region (regions in alphabetical order, "Other" last), each sorted by its name
 * in words; UTC first on its own. `include` adds zones the list lacks (a saved zone the runtime names
 * differently), so the current choice is always an option.
 */
export function zoneGroups(zones: readonly string[], include: readonly (string | null | undefined)[] = []): ZoneChoices {
  const all = new Set(zones);
  for (const z of include) {
    if (!z) continue;
    // A saved zone under another name of one listed (Asia/Kolkata where the runtime lists Asia/Calcutta)
    // takes that one's place, so the zone is offered once, under the name that is saved.
    const runtimeId = runtimeZoneId(z);
    if (runtimeId !== z) all.delete(runtimeId);
    all.add(z);
  }
  all.delete("UTC");
  all.delete("Etc/UTC");
  const byRegion = new Map<string, ZoneOption[]>();
  for (const value of all) {
    const region = REGION_WORDS[value.split("/")[0]!] ?? "Other";
    byRegion.set(region, [...(byRegion.get(region) ?? []), zoneOption(value)]);
  }
  const groups = [...byRegion.entries()]
    .sort(([a], [b]) => (a === "Other" ? 1 : b === "Other" ? -1 : a.localeCompare(b, "en")))
    .map(([region, list]) => ({ region, zones: list.sort((a, b) => a.label.localeCompare(b.label, "en")) }));
  return { utc: zoneOption("UTC"), groups };
}

/** The runtime's own id for a zone ("Asia/Kolkata" → "Asia/Calcutta" where its ICU lists the old name); an unknown zone as it is. */
function runtimeZoneId(zone: string): string {
  try {
    return new Intl.DateTimeFormat("en", { timeZone: zone }).resolvedOptions().timeZone;
  } catch {
    return zone;
  }
}

let every: ZoneChoices | null = null;

/** For a page (server): every zone this runtime knows, in words, plus `include`d ones it lacks. */
export function zoneChoices(include: readonly (string | null | undefined)[] = []): ZoneChoices {
  every ??= zoneGroups(Intl.supportedValuesOf("timeZone"));
  const missing = include.filter((z): z is string => Boolean(z) && !hasZone(every!, z!));
  return missing.length ? zoneGroups(Intl.supportedValuesOf("timeZone"), missing) : every;
}

/** Whether the choices offer `zone`. */
export function hasZone(c: ZoneChoices, zone: string): boolean {
  return zone === c.utc.value || c.groups.some((g) => g.zones.some((z) => z.value === zone));
}

/** The words for `zone` among the choices (the zone's id with spaces if it is not among them). */
export function zoneLabel(c: ZoneChoices, zone: string): string {
  if (zone === c.utc.value) return c.utc.label;
  for (const g of c.groups) for (const z of g.zones) if (z.value === zone) return z.label;
  return zone.replace(/_/g, " ");
}
