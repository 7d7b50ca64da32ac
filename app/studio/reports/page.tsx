import type { Metadata } from "next";
import Link from "next/link";
import { OverviewBarChart } from "@/components/overview/bar-chart";
import { ChartPanel } from "@/components/overview/panel";
import { DataTable } from "@/components/reports/data-table";
import { Button } from "@/components/ui/button";
import { Card, PageHeader } from "@/components/ui/card";
import { SelectField, TextField } from "@/components/ui/field";
import { Notice } from "@/components/ui/notice";
import { SpriteIcon } from "@/components/ui/sprite-icon";
import { requireStaff } from "@/lib/auth/guards";
import { forPage } from "@/lib/auth/page";
import { CLAIM_CATEGORIES } from "@/lib/care/vocabulary";
import { CLAIM_CATEGORY_LABELS } from "@/lib/claims/labels";
import { claimRates, type RateRow } from "@/lib/reports";
import { claimRatesQuerySchema } from "@/lib/reports/query";
import { formatDate } from "@/lib/format";
import { z } from "zod";

export const metadata: Metadata = { title: "Reports" };

type Search = Promise<Record<string, string | string[] | undefined>>;

function flat(sp: Record<string, string | string[] | undefined>) {
  return Object.fromEntries(Object.entries(sp).map(([k, v]) => [k, Array.isArray(v) ? v[0] : v]));
}

export default async function ReportsPage({ searchParams }: { searchParams: Search }) {
  const ctx = await forPage(requireStaff);
  const raw = flat(await searchParams);
  const parsed = claimRatesQuerySchema.safeParse(raw);
  const errors = parsed.success ? null : z.flattenError(parsed.error).fieldErrors;
  const r = claimRates(ctx, parsed.success ? parsed.data : claimRatesQuerySchema.parse({}));
  const csvHref = `/api/studio/reports/claims.csv?${new URLSearchParams({ from: r.from, to: r.to, category: r.category }).toString()}`;
  const dims: { id: string; title: string; rows: RateRow[]; href?: (k: string) => string }[] = [
    { id: "species", title: "By species (primary)", rows: r.bySpecies, href: (k) => `/studio/pieces?species=${encodeURIComponent(k)}` },
    { id: "finish", title: "By finish class (every class in the stack)", rows: r.byFinishClass, href: (k) => (k === "none" ? "/studio/pieces" : `/studio/pieces?finishClass=${k}`) },
    { id: "resin", title: "By resin", rows: r.byResin },
  ];
  return (
    <>
      <PageHeader
        title="Reports"
        lead="Claims per 100 pieces: what the studio's own claims say about species, finishes and resin. Pieces delivered by the end of the period count; claims by the day they were filed."
        actions={
          // A plain link: a file download is not a page for the router to prefetch.
          <a href={csvHref} download className="inline-flex min-h-11 items-center justify-center gap-2 rounded-lg border border-line bg-card px-4 py-2 text-sm font-semibold text-ink hover:border-resin hover:text-resin">
            <SpriteIcon name="download" className="size-4" /> Download CSV
          </a>
        }
      />
      <Card className="mb-6">
        <form method="get" className="grid gap-4 sm:grid-cols-[1fr_1fr_1.4fr_auto] sm:items-start">
          <TextField label="From" name="from" type="date" defaultValue={r.from} error={errors?.from?.[0]} />
          <TextField label="To" name="to" type="date" defaultValue={r.to} error={errors?.to?.[0]} />
          <SelectField label="Kind of claim" name="category" defaultValue={r.category} error={errors?.category?.[0]}>
            <option value="all">All kinds</option>
            {CLAIM_CATEGORIES.map((c) => (
              <option key={c} value={c}>
                {CLAIM_CATEGORY_LABELS[c]}
              </option>
            ))}
          </SelectField>
          <Button type="submit" className="sm:mt-7">
            Show
          </Button>
        </form>
        {errors ? (
          <Notice tone="error" className="mt-3" title="Showing the last 12 months instead">
            The period you chose needs a second look.
          </Notice>
        ) : null}
      </Card>
      <p className="mb-4 text-sm text-muted">
        {formatDate(r.from)} to {formatDate(r.to)}: {r.totalClaims} claim{r.totalClaims === 1 ? "" : "s"} on {r.totalPieces} piece{r.totalPieces === 1 ? "" : "s"}
        {r.category === "all" ? "" : ` (${CLAIM_CATEGORY_LABELS[r.category]} only)`}. Groups with few pieces swing a lot; read them with care.
      </p>
      <div className="grid gap-6">
        {dims.map((d) => (
          <ChartPanel
            key={d.id}
            id={d.id}
            title={d.title}
            table={
              <DataTable
                caption={`Claims per 100 pieces, ${d.title.toLowerCase()}`}
                columns={[
                  { key: "group", label: "Group" },
                  { key: "pieces", label: "Pieces", align: "right" },
                  { key: "claims", label: "Claims", align: "right" },
                  { key: "rate", label: "Per 100 pieces", align: "right" },
                ]}
                rows={d.rows.map((x) => ({
                  id: x.key,
                  cells: {
                    group: d.href ? (
                      <Link className="text-resin underline underline-offset-2" href={d.href(x.key)}>
                        {x.label}
                      </Link>
                    ) : (
                      x.label
                    ),
                    pieces: x.pieces,
                    claims: x.claims,
                    rate: x.per100 === null ? "—" : x.per100.toFixed(1),
                  },
                }))}
                empty="No pieces delivered by the end of this period."
              />
            }
          >
            {d.rows.length ? (
              <OverviewBarChart
                title={`Claims per 100 pieces, ${d.title.toLowerCase()}`}
                data={d.rows.map((x) => ({ label: x.label, rate: x.per100 ?? 0, ...(d.href ? { href: d.href(x.key) } : {}) }))}
                series={[{ key: "rate", name: "Claims per 100 pieces" }]}
              />
            ) : (
              <p className="text-sm text-muted">No pieces delivered by the end of this period.</p>
            )}
          </ChartPanel>
        ))}
      </div>
      <Card className="mt-6">
        <h2 className="mb-2 font-semibold">The lists behind the overview</h2>
        <ul className="grid gap-1 text-sm sm:grid-cols-2">
          <li><Link className="text-resin underline underline-offset-2" href="/studio/reports/reminders">Reminders sent and the care that followed</Link></li>
          <li><Link className="text-resin underline underline-offset-2" href="/studio/reports/answers">Claims and the time to their first answer</Link></li>
          <li><Link className="text-resin underline underline-offset-2" href="/studio/reports/offers">Refresh offers and their outcome</Link></li>
          <li><Link className="text-resin underline underline-offset-2" href="/studio/reports/revenue">Repair payments and refunds</Link></li>
        </ul>
      </Card>
    </>
  );
}
