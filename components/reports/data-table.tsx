import type { ReactNode } from "react";
import { cn } from "@/components/ui/cn";

export type Column = { key: string; label: string; align?: "left" | "right" };
export type Row = { id: string; cells: Record<string, ReactNode> };

/** A table at sm and up; below it, one card per row with each value labelled (readable on a phone). */
export function DataTable({ caption, columns, rows, empty }: { caption: string; columns: Column[]; rows: Row[]; empty?: ReactNode }) {
  if (!rows.length) return <p className="text-sm text-muted">{empty ?? "Nothing here for this choice."}</p>;
  const [first, ...rest] = columns;
  return (
    <>
      <table className="hidden w-full border-collapse text-left text-sm sm:table">
        <caption className="sr-only">{caption}</caption>
        <thead>
          <tr className="border-b border-line text-muted">
            {columns.map((c) => (
              <th key={c.key} scope="col" className={cn("px-2 py-2 font-medium", c.align === "right" && "text-right")}>
                {c.label}
              </th>
            ))}
          </tr>
        </thead>
        <tbody>
          {rows.map((r) => (
            <tr key={r.id} className="border-b border-line/60 last:border-0">
              {columns.map((c, i) =>
                i === 0 ? (
                  <th key={c.key} scope="row" className="px-2 py-2 font-normal">
                    {r.cells[c.key]}
                  </th>
                ) : (
                  <td key={c.key} className={cn("px-2 py-2", c.align === "right" && "text-right tabular-nums")}>
                    {r.cells[c.key]}
                  </td>
                ),
              )}
            </tr>
          ))}
        </tbody>
      </table>
      <ul className="space-y-2 sm:hidden" aria-label={caption}>
        {rows.map((r) => (
          <li key={r.id} className="rounded-lg border border-line bg-card p-3 text-sm">
            <p className="font-medium">{first ? r.cells[first.key] : null}</p>
            <dl className="mt-1 grid grid-cols-[auto_1fr] gap-x-3 gap-y-0.5">
              {rest.map((c) => (
                <div key={c.key} className="contents">
                  <dt className="text-muted">{c.label}</dt>
                  <dd className="text-right tabular-nums">{r.cells[c.key]}</dd>
                </div>
              ))}
            </dl>
          </li>
        ))}
      </ul>
    </>
  );
}
