"use client";

import { useRouter } from "next/navigation";
import { Bar, BarChart, CartesianGrid, LabelList, Legend, pattern, patterns, ResponsiveContainer, Tooltip, XAxis, YAxis, type LabelProps } from "recharts";
import { formatMoney } from "@/lib/format";

// Our palette (app/globals.css). Series are told apart by pattern and by their labels too, never by
// colour alone; every bar carries its value as a label.
const SERIES_LOOK = [
  { color: "#0f5e5e", definition: undefined },
  { color: "#8a4b00", definition: pattern(patterns.diagonal) },
  { color: "#23633a", definition: pattern(patterns.dots) },
] as const;

export type BarDatum = { label: string; href?: string } & Record<string, string | number | undefined>;
export type BarSeries = { key: string; name: string };

type Props = {
  data: BarDatum[];
  series: BarSeries[];
  /** "horizontal": one bar per row, labels on the left (long category names); "vertical": columns. */
  layout?: "horizontal" | "vertical";
  format?: "count" | "money";
  currency?: string;
  /** ISO 3166-1 alpha-2 of the studio: money is written its way. */
  country?: string;
  /** Accessible name of the chart image (the table below carries the numbers). */
  title: string;
  height?: number;
};

/** Whether any bar would be drawn: a chart of nothing but zeros says so in words instead (a new studio's overview). */
export function hasBars(data: readonly BarDatum[], series: readonly BarSeries[]): boolean {
  return data.some((d) => series.some((s) => Number(d[s.key] ?? 0) !== 0));
}

type Props_ = LabelProps;
const LABEL_FONT = 12;

/**
 * A column's value, above it. Where the column is narrower than its label (twelve months of money on a
 * phone), the label stands on end instead, so neighbours never write over each other: inside the column,
 * reading upwards, when the column is tall enough and plain (`onColumn`, a colour that reads on it), else
 * above it. The width is estimated from the characters (tabular digits of a 12 px sans are about 7 px).
 */
function ColumnLabel({ viewBox, text, onColumn }: Props_ & { text: string; onColumn: string | null }) {
  const box = viewBox as { x?: number; y?: number; width?: number; height?: number } | undefined;
  if (!text || !box || box.x == null || box.y == null || box.width == null || box.height == null) return null;
  const { x, y, width, height } = box;
  const cx = x + width / 2;
  const textWidth = text.length * LABEL_FONT * 0.6;
  if (textWidth <= width + 4) {
    return (
      <text x={cx} y={y - 6} textAnchor="middle" fill="#1f2328" fontSize={LABEL_FONT}>
        {text}
      </text>
    );
  }
  const inside = onColumn !== null && Math.abs(height) >= textWidth + 8;
  // Rotated a quarter turn back about its anchor: "start" runs upwards from it, "end" ends at it.
  const ay = inside ? y + 4 : y - 4;
  return (
    <text x={cx} y={ay} transform={`rotate(-90 ${cx} ${ay})`} textAnchor={inside ? "end" : "start"} dominantBaseline="central" fill={inside ? onColumn : "#1f2328"} fontSize={LABEL_FONT}>
      {text}
    </text>
  );
}

export function OverviewBarChart({ data, series, layout = "horizontal", format = "count", currency = "USD", country = "US", title, height }: Props) {
  const router = useRouter();
  const fmt = (v: unknown) => {
    const n = typeof v === "number" ? v : Number(v ?? 0);
    return format === "money" ? formatMoney(Math.round(n), currency, country) : String(n);
  };
  const rows = layout === "horizontal";
  const h = height ?? (rows ? Math.max(120, data.length * (series.length > 1 ? 48 : 40) + 40) : 240);
  const open = (d: unknown) => {
    const href = (d as { payload?: BarDatum } | undefined)?.payload?.href;
    if (href) router.push(href);
  };
  if (!hasBars(data, series)) return <p className="text-sm text-muted">Nothing to draw yet: every figure here is 0.</p>;
  return (
    <div role="img" aria-label={title} className="w-full" style={{ height: h }}>
      <ResponsiveContainer width="100%" height="100%">
        <BarChart data={data} layout={rows ? "vertical" : "horizontal"} margin={{ top: 8, right: 36, bottom: 4, left: 4 }} accessibilityLayer={false}>
          <CartesianGrid stroke="#e4dccf" strokeDasharray="3 3" horizontal={!rows} vertical={rows} />
          {rows ? (
            <>
              <XAxis type="number" allowDecimals={false} tick={{ fill: "#625b50", fontSize: 12 }} tickFormatter={fmt} />
              <YAxis type="category" dataKey="label" width={128} tick={{ fill: "#1f2328", fontSize: 12 }} interval={0} />
            </>
          ) : (
            <>
              <XAxis dataKey="label" tick={{ fill: "#1f2328", fontSize: 12 }} interval="preserveStartEnd" />
              <YAxis allowDecimals={false} width={format === "money" ? 64 : 32} tick={{ fill: "#625b50", fontSize: 12 }} tickFormatter={fmt} />
            </>
          )}
          <Tooltip formatter={(v) => fmt(v)} cursor={{ fill: "#e3efed" }} />
          {series.length > 1 ? <Legend wrapperStyle={{ fontSize: 12 }} /> : null}
          {series.map((s, i) => {
            const look = SERIES_LOOK[i % SERIES_LOOK.length]!;
            return (
              <Bar
                key={s.key}
                dataKey={s.key}
                name={s.name}
                fill={look.definition ? { color: look.color, definition: look.definition } : look.color}
                stroke={look.color}
                radius={rows ? [0, 4, 4, 0] : [4, 4, 0, 0]}
                isAnimationActive={false}
                onClick={open}
                style={{ cursor: "pointer" }}
              >
                {rows ? (
                  <LabelList dataKey={s.key} position="right" formatter={(v: unknown) => (format === "money" && !v ? "" : fmt(v))} style={{ fill: "#1f2328", fontSize: 12 }} />
                ) : (
                  <LabelList dataKey={s.key} content={(p: Props_) => <ColumnLabel {...p} text={format === "money" && !p.value ? "" : fmt(p.value)} onColumn={look.definition ? null : "#ffffff"} />} />
                )}
              </Bar>
            );
          })}
        </BarChart>
      </ResponsiveContainer>
    </div>
  );
}
