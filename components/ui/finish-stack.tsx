import { formatDate } from "@/lib/format";

const CLASS_FILL: Record<string, string> = {
  hardwax_oil: "bg-[#e9dcc3]",
  ceramic_topcoat: "bg-[#dfe9e7]",
  paste_wax: "bg-[#f1e6cf]",
  film_finish: "bg-[#e6e3dc]",
  epoxy_surface: "bg-[#d5e7ea]",
  charred_oiled: "bg-[#d6d0c8]",
};

const SURFACE_TITLES: Record<string, string> = { top: "Top", edges: "Edges", base: "Base" };

export type StackLayer = { id: string; surface: string; position: number; finishClass: string; classLabel: string; productLabel: string | null; coats: number; appliedOn: string; notes?: string | null };

/**
 * A piece's finish stack drawn as layers, per surface: the outermost (newest) layer on top and the wood
 * at the bottom. `compact` sets the surfaces side by side in smaller rows (the technician's day).
 */
export function FinishStack({ layers, wood, empty, compact = false }: { layers: StackLayer[]; wood: string; empty: string; compact?: boolean }) {
  const surfaces = ["top", "edges", "base"].filter((s) => layers.some((l) => l.surface === s));
  if (surfaces.length === 0) return <p className="text-sm text-muted">{empty}</p>;
  return (
    <div className={compact ? "grid gap-3 sm:grid-cols-2" : "space-y-5"}>
      {surfaces.map((s) => {
        const stack = layers.filter((l) => l.surface === s).sort((a, b) => b.position - a.position);
        return (
          <figure key={s}>
            <figcaption className={`${compact ? "mb-1" : "mb-2"} text-sm font-semibold`}>{SURFACE_TITLES[s]}</figcaption>
            <ol className="overflow-hidden rounded-lg border border-line" aria-label={`${SURFACE_TITLES[s]} finish layers, outermost first`}>
              {stack.map((l, i) => (
                <li key={l.id} className={`${CLASS_FILL[l.finishClass] ?? "bg-card"} border-b border-line/80 px-3 ${compact ? "py-2" : "py-2.5"} text-sm`}>
                  <p className="font-semibold">
                    <span className="sr-only">{`Layer ${stack.length - i}: `}</span>
                    {l.classLabel}
                  </p>
                  <p className="text-ink/80">
                    {`${l.productLabel ? `${l.productLabel} · ` : ""}${l.coats} coat${l.coats === 1 ? "" : "s"} · applied ${formatDate(l.appliedOn)}`}
                  </p>
                  {l.notes && !compact ? <p className="text-ink/70">{l.notes}</p> : null}
                </li>
              ))}
              <li className={`bg-[repeating-linear-gradient(90deg,#7a5532_0_6px,#86603b_6px_14px)] px-3 ${compact ? "py-1.5" : "py-2"} text-sm font-semibold text-white`}>
                <span className="rounded bg-black/35 px-1">{wood}</span>
              </li>
            </ol>
          </figure>
        );
      })}
    </div>
  );
}
