import type { Metadata } from "next";
import { formatZone } from "@/lib/format";
import Link from "next/link";
import { redirect } from "next/navigation";
import { z } from "zod";
import { Button } from "@/components/ui/button";
import { Card, PageHeader } from "@/components/ui/card";
import { SelectField, TextField } from "@/components/ui/field";
import { Notice } from "@/components/ui/notice";
import { requireStaff } from "@/lib/auth/guards";
import { forPage } from "@/lib/auth/page";
import { listAudit } from "@/lib/studio/audit";
import { AUDIT_GROUPS, auditQuerySchema } from "@/lib/studio/audit-query";

export const metadata: Metadata = { title: "Audit log" };

export default async function AuditPage({ searchParams }: { searchParams: Promise<Record<string, string | string[] | undefined>> }) {
  const ctx = await forPage(requireStaff);
  const raw = Object.fromEntries(Object.entries(await searchParams).map(([k, v]) => [k, Array.isArray(v) ? v[0] : v]));
  const parsed = auditQuerySchema.safeParse(raw);
  const errors = parsed.success ? null : z.flattenError(parsed.error).fieldErrors;
  const log = listAudit(ctx, parsed.success ? parsed.data : auditQuerySchema.parse({}));
  const q = log.query;
  const pages = Math.max(1, Math.ceil(log.total / log.pageSize));
  const pageHref = (page: number) => {
    const p = new URLSearchParams(Object.entries({ group: q.group, actor: q.actor, from: q.from, to: q.to }).filter((e): e is [string, string] => Boolean(e[1])));
    if (page > 1) p.set("page", String(page));
    const s = p.toString();
    return `/studio/audit${s ? `?${s}` : ""}`;
  };
  // An old link or a page past the end (entries moved on): the last page, not an empty one.
  if (q.page > pages) redirect(pageHref(pages));
  return (
    <>
      <PageHeader title="Audit log" lead={`Who did what and when in ${ctx.studio.name}: decisions, finish-layer edits, role changes, refunds and settings. Times in ${formatZone(ctx.studio.timeZone)}.`} />
      <Card className="mb-6">
        <form method="get" className="grid gap-4 sm:grid-cols-2 lg:grid-cols-[1.3fr_1.3fr_1fr_1fr_auto] lg:items-start">
          <SelectField label="Kind of change" name="group" defaultValue={parsed.success ? (q.group ?? "") : ""} error={errors?.group?.[0]}>
            <option value="">Everything</option>
            {Object.entries(AUDIT_GROUPS).map(([k, g]) => (
              <option key={k} value={k}>
                {g.label}
              </option>
            ))}
          </SelectField>
          <SelectField label="Who" name="actor" defaultValue={q.actor ?? ""}>
            <option value="">Anyone</option>
            {log.people.map((p) => (
              <option key={p.id} value={p.id}>
                {p.name}
                {p.member ? "" : " (owner or former member)"}
              </option>
            ))}
          </SelectField>
          <TextField label="From" name="from" type="date" defaultValue={q.from ?? ""} error={errors?.from?.[0]} />
          <TextField label="To" name="to" type="date" defaultValue={q.to ?? ""} error={errors?.to?.[0]} />
          <Button type="submit" className="lg:mt-7">
            Filter
          </Button>
        </form>
        {errors ? (
          <Notice tone="error" className="mt-3" title="Showing everything instead">
            A filter needs a second look.
          </Notice>
        ) : null}
      </Card>
      <Card>
        <p className="mb-3 text-sm text-muted">
          {log.total} entr{log.total === 1 ? "y" : "ies"}
          {pages > 1 ? `, page ${q.page} of ${pages}` : ""}.
        </p>
        {log.rows.length ? (
          <ol className="divide-y divide-line">
            {log.rows.map((r) => (
              <li key={r.id} className="grid gap-1 py-3 sm:grid-cols-[12rem_1fr] sm:gap-3">
                <time dateTime={r.at.toISOString()} className="text-sm tabular-nums text-muted">
                  {r.local}
                </time>
                <div>
                  <p>
                    <strong className="font-semibold">{r.label}</strong>
                    <span className="text-muted"> by {r.actor ?? "the system"}</span>
                    {r.href ? (
                      <>
                        {" · "}
                        <Link href={r.href} className="text-resin underline underline-offset-2">
                          open the {r.subjectType.replace("_", " ")}
                        </Link>
                      </>
                    ) : null}
                  </p>
                  {r.details.length ? (
                    <ul className="mt-1 space-y-0.5 text-sm text-muted">
                      {r.details.map((d, i) => (
                        <li key={i} className="break-words">
                          {d}
                        </li>
                      ))}
                    </ul>
                  ) : null}
                </div>
              </li>
            ))}
          </ol>
        ) : (
          <p className="text-sm text-muted">Nothing recorded for this choice.</p>
        )}
        {pages > 1 ? (
          <nav aria-label="Pages" className="mt-4 flex justify-between text-sm">
            {q.page > 1 ? <Link className="inline-flex min-h-11 items-center text-resin underline underline-offset-2" href={pageHref(q.page - 1)}>← Newer</Link> : <span />}
            {q.page < pages ? <Link className="inline-flex min-h-11 items-center text-resin underline underline-offset-2" href={pageHref(q.page + 1)}>Older →</Link> : <span />}
          </nav>
        ) : null}
      </Card>
    </>
  );
}
