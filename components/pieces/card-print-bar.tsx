"use client";

import { useId, useState } from "react";
import { Button } from "@/components/ui/button";
import { cn } from "@/components/ui/cn";
import { SpriteIcon } from "@/components/ui/sprite-icon";

/** Kept in step with CARD_LAYOUTS and MAX_CARDS_PER_PDF in lib/pieces/card.tsx (a server module). */
// The option names stay short enough to read whole in the select on a 375 px phone (tests/e2e/narrow.spec.ts);
// what each prints is said under it.
const LAYOUTS = [
  { value: "letter", label: "Letter sheets", detail: "Two cards on each Letter sheet, with cut marks." },
  { value: "a4", label: "A4 sheets", detail: "Four A6 cards on each A4 sheet, with cut marks." },
  { value: "4x6", label: "Card printer, 4×6 in", detail: "One 4×6 in card a page, for a card printer." },
  { value: "a6", label: "Card printer, A6", detail: "One A6 card a page, for a card printer." },
] as const;
const MAX_CARDS = 200;

const linkCls = "inline-flex min-h-11 items-center gap-2 rounded-lg px-4 text-sm font-semibold";

/** Drawer cards for the pieces chosen in the registry, or for every piece not yet registered, as one PDF. */
export function CardPrintBar({ selected, onClear }: { selected: string[]; onClear: () => void }) {
  const [layout, setLayout] = useState<(typeof LAYOUTS)[number]["value"]>("letter");
  const id = useId();
  const n = selected.length;
  const tooMany = n > MAX_CARDS;
  return (
    <section aria-label="Print drawer cards" className="flex flex-wrap items-end gap-3 rounded-xl border border-line bg-card p-4">
      <div className="w-full min-w-0 space-y-1 sm:w-auto">
        <label htmlFor={`${id}-layout`} className="block text-sm font-medium">
          Print drawer cards on
        </label>
        <select
          id={`${id}-layout`}
          value={layout}
          onChange={(e) => setLayout(e.target.value as typeof layout)}
          aria-describedby={`${id}-layout-detail`}
          className="min-h-11 w-full rounded-lg border border-line bg-white px-3 py-2 text-sm text-ink focus:border-resin sm:w-auto"
        >
          {LAYOUTS.map((l) => (
            <option key={l.value} value={l.value}>
              {l.label}
            </option>
          ))}
        </select>
      </div>
      {n > 0 && !tooMany ? (
        <a href={`/api/pieces/cards?layout=${layout}&ids=${selected.map(encodeURIComponent).join(",")}`} download className={cn(linkCls, "bg-resin text-white hover:bg-resin-dark")}>
          <SpriteIcon name="printer" className="size-4" /> Cards for the {n} chosen piece{n === 1 ? "" : "s"} (PDF)
        </a>
      ) : null}
      <a href={`/api/pieces/cards?layout=${layout}&all=unregistered`} download className={cn(linkCls, "border border-line bg-card hover:border-resin hover:text-resin")}>
        <SpriteIcon name="printer" className="size-4" /> Cards for all pieces not yet registered (PDF)
      </a>
      {n > 0 ? (
        <Button variant="ghost" onClick={onClear}>
          <SpriteIcon name="x" className="size-4" /> Clear the {n} chosen
        </Button>
      ) : null}
      <p id={`${id}-layout-detail`} className="w-full text-sm text-muted">
        {LAYOUTS.find((l) => l.value === layout)!.detail}
      </p>
      <p className="-mt-2 w-full text-sm text-muted" aria-live="polite">
        {tooMany ? `${n} pieces chosen: print at most ${MAX_CARDS} cards at a time.` : n ? `${n} piece${n === 1 ? "" : "s"} chosen for printing.` : "Tick pieces in the list to print their cards together."}
      </p>
    </section>
  );
}
