import Link from "next/link";
import type { ReactNode } from "react";
import { Card } from "@/components/ui/card";
import { cn } from "@/components/ui/cn";
import { SpriteIcon } from "@/components/ui/sprite-icon";

/** A headline figure that links to the list behind it. */
export function Figure({ label, value, href, note, className }: { label: string; value: ReactNode; href: string; note?: ReactNode; className?: string }) {
  return (
    <Link href={href} className={cn("group block rounded-xl focus-visible:outline-offset-4", className)}>
      <Card className="h-full transition-colors group-hover:border-resin">
        <p className="text-sm text-muted">{label}</p>
        <p className="mt-1 flex items-baseline gap-1 font-display text-3xl font-semibold sm:text-4xl">
          {value}
          <SpriteIcon name="chevron-right" className="size-5 self-center text-muted group-hover:text-resin" />
        </p>
        {note ? <p className="mt-1 text-sm text-muted">{note}</p> : null}
      </Card>
    </Link>
  );
}

/**
 * A chart with its numbers as a table underneath (open the details), for screen readers and for reading exact values.
 * `figures` are the numbers that table holds: when none is other than 0 (a new studio) no table is offered, since a
 * table of noughts says nothing and the chart already says so in words. Without `figures` the table is always offered.
 */
export function ChartPanel({
  title,
  lead,
  children,
  table,
  figures,
  className,
  id,
}: {
  title: string;
  lead?: ReactNode;
  children: ReactNode;
  table: ReactNode;
  figures?: readonly number[];
  className?: string;
  id?: string;
}) {
  const headingId = `${id ?? title.toLowerCase().replace(/[^a-z0-9]+/g, "-")}-title`;
  return (
    <Card className={cn("flex flex-col gap-3", className)} id={id} role="region" aria-labelledby={headingId}>
      <div>
        <h2 id={headingId} className="font-semibold">
          {title}
        </h2>
        {lead ? <p className="text-sm text-muted">{lead}</p> : null}
      </div>
      {children}
      {figures && !figures.some((n) => n !== 0) ? null : (
        <details className="group rounded-lg border border-line bg-paper/60 px-3 py-2 text-sm">
          <summary className="flex min-h-11 cursor-pointer list-none items-center gap-2 font-medium text-resin">
            <SpriteIcon name="table-2" className="size-4" />
            <span className="group-open:hidden">Show as a table</span>
            <span className="hidden group-open:inline">Hide the table</span>
          </summary>
          <div className="pb-2">{table}</div>
        </details>
      )}
    </Card>
  );
}

export type FigureRow = { label: ReactNode; href: string; cells: ReactNode[] };

/** A small table of labelled figures, each row a link to its list. Stays readable at 375 px. */
export function FigureTable({ caption, columns, rows }: { caption: string; columns: string[]; rows: FigureRow[] }) {
  return (
    <table className="w-full border-collapse text-left">
      <caption className="sr-only">{caption}</caption>
      <thead>
        <tr className="border-b border-line text-muted">
          {columns.map((c, i) => (
            <th key={c} scope="col" className={cn("py-1.5 font-medium", i > 0 && "text-right")}>
              {c}
            </th>
          ))}
        </tr>
      </thead>
      <tbody>
        {rows.map((r, i) => (
          <tr key={i} className="border-b border-line/60 last:border-0">
            <th scope="row" className="py-1.5 pr-2 font-normal">
              <Link href={r.href} className="text-resin underline underline-offset-2">
                {r.label}
              </Link>
            </th>
            {r.cells.map((c, j) => (
              <td key={j} className="py-1.5 text-right tabular-nums">
                {c}
              </td>
            ))}
          </tr>
        ))}
      </tbody>
    </table>
  );
}
