"use client";

import { useId, useState } from "react";
import { cn } from "@/components/ui/cn";
import { ErrorLine } from "@/components/ui/error-line";

export type UnitSystem = "metric" | "imperial";

const MM_PER_INCH = 25.4; // exact (NIST Handbook 44 App. C)
const M2_PER_FT2 = 0.09290304; // exact
const ML_PER_US_GALLON = 3785.411784; // exact

type Unit = { suffix: string; toDisplay: (stored: number) => number; fromDisplay: (shown: number) => number; digits: number };

export const UNITS = {
  length: {
    metric: { suffix: "mm", toDisplay: (mm: number) => mm, fromDisplay: (x: number) => Math.round(x), digits: 0 },
    imperial: { suffix: "in", toDisplay: (mm: number) => mm / MM_PER_INCH, fromDisplay: (x: number) => Math.round(x * MM_PER_INCH), digits: 2 },
  },
  area: {
    metric: { suffix: "m²", toDisplay: (m2: number) => m2, fromDisplay: (x: number) => Math.round(x * 10000) / 10000, digits: 3 },
    imperial: { suffix: "ft²", toDisplay: (m2: number) => m2 / M2_PER_FT2, fromDisplay: (x: number) => Math.round(x * M2_PER_FT2 * 10000) / 10000, digits: 2 },
  },
  volume: {
    metric: { suffix: "L", toDisplay: (ml: number) => ml / 1000, fromDisplay: (x: number) => Math.round(x * 1000), digits: 2 },
    imperial: { suffix: "US gal", toDisplay: (ml: number) => ml / ML_PER_US_GALLON, fromDisplay: (x: number) => Math.round(x * ML_PER_US_GALLON), digits: 2 },
  },
} satisfies Record<string, Record<UnitSystem, Unit>>;

function format(n: number, digits: number): string {
  return String(Number(n.toFixed(digits)));
}

/**
 * A number shown in the chosen unit system and stored in base units (mm, m², mL). The typed text
 * is kept as typed; only a unit switch rewrites it from the stored value.
 */
export function UnitNumberField({
  label,
  kind,
  system,
  value,
  onChange,
  onBlur,
  error,
  hint,
  name,
  ref,
}: {
  label: string;
  kind: keyof typeof UNITS;
  system: UnitSystem;
  value: number | null | undefined;
  onChange: (v: number | null) => void;
  onBlur?: () => void;
  error?: string;
  hint?: string;
  name?: string;
  /** The form's handle on the input (react-hook-form's `field.ref`): a failed submit focuses it. */
  ref?: React.Ref<HTMLInputElement>;
}) {
  const unit: Unit = UNITS[kind][system];
  const id = useId();
  const [text, setText] = useState(value == null || Number.isNaN(value) ? "" : format(unit.toDisplay(value), unit.digits));
  const [shownSystem, setShownSystem] = useState(system);
  // A unit switch rewrites the text from the stored value (state adjusted during render, not in an effect).
  if (shownSystem !== system) {
    setShownSystem(system);
    setText(value == null || Number.isNaN(value) ? text : format(unit.toDisplay(value), unit.digits));
  }
  return (
    <div className="space-y-1.5">
      <label htmlFor={id} className="block text-sm font-medium">
        {label} <span className="font-normal text-muted">({unit.suffix})</span>
      </label>
      <input
        ref={ref}
        id={id}
        name={name}
        inputMode="decimal"
        autoComplete="off"
        value={text}
        onBlur={onBlur}
        aria-invalid={error ? true : undefined}
        aria-describedby={error ? `${id}-e` : hint ? `${id}-h` : undefined}
        onChange={(e) => {
          const t = e.target.value;
          setText(t);
          const trimmed = t.trim().replace(",", ".");
          if (!trimmed) return onChange(null);
          const n = Number(trimmed);
          onChange(Number.isFinite(n) ? unit.fromDisplay(n) : Number.NaN);
        }}
        className={cn(
          "block min-h-11 w-full rounded-lg border border-line bg-white px-3 py-2 text-base text-ink focus:border-resin aria-[invalid=true]:border-danger",
        )}
      />
      {hint && !error ? (
        <p id={`${id}-h`} className="text-sm text-muted">
          {hint}
        </p>
      ) : null}
      <ErrorLine id={`${id}-e`}>{error}</ErrorLine>
    </div>
  );
}

export function UnitToggle({ system, onChange }: { system: UnitSystem; onChange: (s: UnitSystem) => void }) {
  return (
    <div role="radiogroup" aria-label="Units" className="inline-flex rounded-lg border border-line bg-white p-1">
      {(["metric", "imperial"] as const).map((s) => (
        <button
          key={s}
          type="button"
          role="radio"
          aria-checked={system === s}
          onClick={() => onChange(s)}
          className={cn("min-h-9 rounded-md px-3 text-sm font-semibold", system === s ? "bg-resin text-white" : "text-ink hover:bg-resin-soft")}
        >
          {s === "metric" ? "Metric (mm)" : "Imperial (in)"}
        </button>
      ))}
    </div>
  );
}
