"use client";

import { forwardRef, type ReactNode, type SelectHTMLAttributes } from "react";
import { hasZone, zoneOption, type ZoneChoices } from "@/lib/format";
import { SelectField } from "./field";

type Props = SelectHTMLAttributes<HTMLSelectElement> & {
  label: string;
  error?: string;
  hint?: ReactNode;
  /** The zones in words, named by the page on the server (lib/format zoneChoices). */
  choices: ZoneChoices;
  /**
   * A zone known only in the browser (its own, guessed after hydration) to offer when the choices lack
   * it; named here, which is safe as it never appears in the server's render.
   */
  browserZone?: string | null;
  /** Options before the zones (e.g. "The studio's"). */
  children?: ReactNode;
};

/**
 * The choices' own id for `zone`: `zone` itself when listed, else the listed zone named the same
 * (one zone under an old and a new id, e.g. a browser's Asia/Kolkata against a server list that has
 * Asia/Calcutta: both read "India Time, Kolkata"), else `zone` unchanged. Null stays null.
 */
export function listedZone(choices: ZoneChoices, zone: string | null): string | null {
  if (!zone || hasZone(choices, zone)) return zone;
  const label = zoneOption(zone).label;
  for (const g of choices.groups) for (const z of g.zones) if (z.label === label) return z.value;
  return zone;
}

/**
 * The one time-zone picker: a native select (keyboard and type-ahead by the zone's name work as
 * everywhere), each zone in words and grouped by region; the IANA id is the value saved.
 */
export const ZoneSelect = forwardRef<HTMLSelectElement, Props>(function ZoneSelect({ choices, browserZone, children, ...props }, ref) {
  const own = listedZone(choices, browserZone ?? null);
  const extra = own && !hasZone(choices, own) ? zoneOption(own) : null;
  return (
    <SelectField ref={ref} {...props}>
      {children}
      <option value={choices.utc.value}>{choices.utc.label}</option>
      {extra ? <option value={extra.value}>{extra.label} (this device)</option> : null}
      {choices.groups.map((g) => (
        <optgroup key={g.region} label={g.region}>
          {g.zones.map((z) => (
            <option key={z.value} value={z.value}>
              {z.label}
            </option>
          ))}
        </optgroup>
      ))}
    </SelectField>
  );
});
