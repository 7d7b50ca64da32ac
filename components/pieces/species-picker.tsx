"use client";

import { useId, useMemo, useState } from "react";
import { cn } from "@/components/ui/cn";
import { SPECIES } from "@/lib/care/species";
import { ErrorLine } from "@/components/ui/error-line";
import { SpriteIcon } from "@/components/ui/sprite-icon";

const key = (s: string) => s.toLowerCase().replace(/[\s_-]+/g, "");

/** A searchable pick from the care engine's species table (common name, botanical name, aliases). */
export function SpeciesPicker({
  label,
  value,
  onChange,
  onBlur,
  error,
  optional,
  ref,
}: {
  label: string;
  value: string | null | undefined;
  onChange: (id: string | null) => void;
  onBlur?: () => void;
  error?: string;
  optional?: boolean;
  /** The form's handle on the input (react-hook-form's `field.ref`): a failed submit focuses it. */
  ref?: React.Ref<HTMLInputElement>;
}) {
  const id = useId();
  const selected = SPECIES.find((s) => s.id === value);
  const [text, setText] = useState(selected?.commonName ?? "");
  const [open, setOpen] = useState(false);
  const [active, setActive] = useState(0);
  const matches = useMemo(() => {
    const k = key(text);
    if (!k || (selected && text === selected.commonName)) return SPECIES;
    return SPECIES.filter((s) => [s.commonName, s.botanicalName, s.id, ...s.aliases].some((n) => key(n).includes(k)));
  }, [text, selected]);

  const choose = (sid: string | null) => {
    onChange(sid);
    setText(sid ? (SPECIES.find((s) => s.id === sid)?.commonName ?? "") : "");
    setOpen(false);
  };

  return (
    <div className="relative space-y-1.5">
      <label htmlFor={id} className="block text-sm font-medium">
        {label}
        {optional ? <span className="font-normal text-muted"> (optional)</span> : null}
      </label>
      <input
        ref={ref}
        id={id}
        role="combobox"
        aria-expanded={open}
        aria-controls={`${id}-list`}
        aria-autocomplete="list"
        aria-activedescendant={open && matches[active] ? `${id}-${matches[active]!.id}` : undefined}
        aria-invalid={error ? true : undefined}
        autoComplete="off"
        value={text}
        placeholder="Search, e.g. walnut or Juglans"
        onFocus={() => setOpen(true)}
        onBlur={(e) => {
          // Closed a moment later (an option's press lands first), unless the field has focus again by
          // then: a stale close shut the list the person had just reopened by typing.
          const input = e.currentTarget;
          setTimeout(() => {
            if (document.activeElement !== input) setOpen(false);
          }, 150);
          if (!text.trim() && optional) onChange(null);
          else if (selected && text !== selected.commonName) setText(selected.commonName);
          onBlur?.();
        }}
        onChange={(e) => {
          setText(e.target.value);
          setActive(0);
          setOpen(true);
        }}
        onKeyDown={(e) => {
          if (e.key === "ArrowDown") {
            e.preventDefault();
            setOpen(true);
            setActive((a) => Math.min(a + 1, matches.length - 1));
          } else if (e.key === "ArrowUp") {
            e.preventDefault();
            setActive((a) => Math.max(a - 1, 0));
          } else if (e.key === "Enter" && open && matches[active]) {
            e.preventDefault();
            choose(matches[active]!.id);
          } else if (e.key === "Escape") setOpen(false);
        }}
        className="block min-h-11 w-full rounded-lg border border-line bg-white px-3 py-2 text-base focus:border-resin aria-[invalid=true]:border-danger"
      />
      {open ? (
        <ul id={`${id}-list`} role="listbox" aria-label={label} className="absolute z-20 mt-1 max-h-64 w-full overflow-y-auto rounded-lg border border-line bg-white shadow-lg">
          {optional ? (
            <li role="option" aria-selected={!value} onMouseDown={(e) => (e.preventDefault(), choose(null))} className="cursor-pointer px-3 py-2 text-sm text-muted hover:bg-resin-soft">
              None
            </li>
          ) : null}
          {matches.length === 0 ? <li className="px-3 py-2 text-sm text-muted">No species matches “{text}”.</li> : null}
          {matches.map((s, i) => (
            <li
              key={s.id}
              id={`${id}-${s.id}`}
              role="option"
              aria-selected={s.id === value}
              onMouseDown={(e) => (e.preventDefault(), choose(s.id))}
              className={cn("flex min-h-11 cursor-pointer items-center justify-between gap-2 px-3 py-2 text-sm", i === active ? "bg-resin-soft" : "hover:bg-resin-soft")}
            >
              <span>
                <span className="font-medium">{s.commonName}</span> <span className="italic text-muted">{s.botanicalName}</span>
                {s.aliases.length ? <span className="block text-xs text-muted">also {s.aliases.join(", ")}</span> : null}
              </span>
              {s.id === value ? (
                <span className="text-resin">
                  <SpriteIcon name="check" className="size-4" />
                  <span className="sr-only">selected</span>
                </span>
              ) : null}
            </li>
          ))}
        </ul>
      ) : null}
      <ErrorLine>{error}</ErrorLine>
    </div>
  );
}
