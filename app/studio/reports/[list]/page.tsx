import type { Metadata } from "next";
import Link from "next/link";
import { notFound } from "next/navigation";
import { z } from "zod";
import { DataTable, type Column, type Row } from "@/components/reports/data-table";
import { Card, PageHeader } from "@/components/ui/card";
import { Notice } from "@/components/ui/notice";
import { StatusBadge, type StatusTone } from "@/components/ui/status";
import { requireStaff } from "@/lib/auth/guards";
import { forPage } from "@/lib/auth/page";
import { formatDate, formatInstant, formatMoney, formatWait } from "@/lib/format";
import { REMINDER_STEPS } from "@/lib/care/vocabulary";
import { ACTED_WITHIN_DAYS, REMINDER_STEP_LABELS } from "@/lib/overview";
import { reportList } from "@/lib/reports";
import { REPORT_LISTS, reportListQuerySchema, type ReportList } from "@/lib/reports/query";

const TITLES: Record<ReportList, { title: string; lead: string }> = {
  reminders: { title: "Reminders and the care that followed", lead: `Care reminders sent in the last 12 months, and whether the owner logged that task within ${ACTED_WITHIN_DAYS} days after.` },
  offers: { title: "Refresh offers", lead: "Refresh offers sent with care reminders in the last 12 months, and what became of each." },
  revenue: { title: "Repair payments", lead: "Repairs paid online in the last 12 months, with refunds; net = paid − refunded." },
  answers: { title: "Time to first answer", lead: "Claims filed in the last 12 months and how long each waited for the studio's first answer." },
};

export async function generateMetadata({ params }: { params: Promise<{ list: string }> }): Promise<Metadata> {
  const { list } = await params;
  return { title: TITLES[list as ReportList]?.title ?? "Report" };
}

const OFFER_LOOK: Record<string, { label: string; tone: StatusTone }> = {
  offered: { label: "Waiting", tone: "waiting" },
  accepted: { label: "Accepted", tone: "ok" },
  declined: { label: "Declined", tone: "stopped" },
  expired: { label: "Expired", tone: "neutral" },
};

function Filters({ base, current, options }: { base: string; current: string | undefined; options: { value?: string; label: string }[] }) {
  return (
    <nav aria-label="Filter" className="mb-4 flex flex-wrap gap-2">
      {options.map((o) => {
        const active = (o.value ?? undefined) === current;
        const href = o.value ? `${base}${base.includes("?") ? "&" : "?"}${o.value}` : base;
        return (
          <Link
            key={o.label}
            href={href}
            aria-current={active ? "page" : undefined}
            className={`inline-flex min-h-11 items-center rounded-full border px-4 text-sm ${active ? "border-resin bg-resin-soft font-semibold text-resin-dark" : "border-line bg-card hover:border-resin"}`}
          >
            {o.label}
          </Link>
        );
      })}
    </nav>
  );
}

export default async function ReportListPage({ params, searchParams }: { params: Promise<{ list: string }>; searchParams: Promise<Record<string, string | string[] | undefined>> }) {
  const ctx = await forPage(requireStaff);
  const { list } = await params;
  if (!(REPORT_LISTS as readonly string[]).includes(list)) notFound();
  const raw = Object.fromEntries(Object.entries(await searchParams).map(([k, v]) => [k, Array.isArray(v) ? v[0] : v]));
  const parsed = reportListQuerySchema.safeParse(raw);
  const q = parsed.success ? parsed.data : reportListQuerySchema.parse({});
  const result = reportList(ctx, list, q);
  const t = TITLES[list as ReportList];
  const money = (m: number, c: string) => formatMoney(m, c, ctx.studio.country);
  const pieceLink = (id: string, title: string) => (
    <Link className="text-resin underline underline-offset-2" href={`/studio/pieces/${id}`}>
      {title}
    </Link>
  );

  let columns: Column[] = [];
  let rows: Row[] = [];
  let filters: React.ReactNode = null;
  let summary = "";
  switch (result.list) {
    case "reminders": {
      const current = "step" in q && q.step ? `step=${q.step}` : "acted" in q && q.acted ? `acted=${q.acted}` : undefined;
      filters = (
        <Filters
          base={`/studio/reports/reminders`}
          current={current}
          options={[{ label: "All" }, ...REMINDER_STEPS.map((s) => ({ value: `step=${s}`, label: REMINDER_STEP_LABELS[s] })), { value: "acted=yes", label: "Followed by care" }, { value: "acted=no", label: "Not followed" }]}
        />
      );
      columns = [
        { key: "piece", label: "Piece" },
        { key: "owner", label: "Owner" },
        { key: "task", label: "Task" },
        { key: "step", label: "Reminder" },
        { key: "sent", label: "Sent" },
        { key: "cared", label: "Care logged" },
      ];
      rows = result.rows.map((r) => ({
        id: r.id,
        cells: {
          piece: pieceLink(r.pieceId, r.pieceTitle),
          owner: r.ownerName,
          task: r.task,
          step: r.step,
          sent: formatDate(r.sentOn, { short: true }),
          cared: r.caredOn ? <StatusBadge tone="ok" label={`Yes, ${formatDate(r.caredOn, { short: true })}`} /> : <StatusBadge tone="stopped" label="Not yet" />,
        },
      }));
      const acted = result.rows.filter((r) => r.caredOn).length;
      summary = `${result.rows.length} reminder${result.rows.length === 1 ? "" : "s"}, ${acted} followed by care within ${ACTED_WITHIN_DAYS} days.`;
      break;
    }
    case "offers": {
      const current = "status" in q && q.status ? `status=${q.status}` : undefined;
      filters = <Filters base="/studio/reports/offers" current={current} options={[{ label: "All" }, ...Object.entries(OFFER_LOOK).map(([v, l]) => ({ value: `status=${v}`, label: l.label }))]} />;
      columns = [
        { key: "piece", label: "Piece" },
        { key: "owner", label: "Owner" },
        { key: "sent", label: "Sent" },
        { key: "price", label: "Price", align: "right" },
        { key: "status", label: "Outcome" },
      ];
      rows = result.rows.map((r) => ({
        id: r.id,
        cells: {
          piece: pieceLink(r.pieceId, r.pieceTitle),
          owner: r.ownerName,
          sent: formatDate(r.sentOn, { short: true }),
          price: money(r.priceMinor, r.currency),
          status: <StatusBadge tone={OFFER_LOOK[r.status]?.tone ?? "neutral"} label={`${OFFER_LOOK[r.status]?.label ?? r.status}${r.acceptedOn ? `, ${formatDate(r.acceptedOn, { short: true })}` : ""}`} />,
        },
      }));
      summary = `${result.rows.length} offer${result.rows.length === 1 ? "" : "s"}.`;
      break;
    }
    case "revenue": {
      const month = "month" in q ? q.month : undefined;
      filters = month ? (
        <p className="mb-4 text-sm">
          Paid in {month}. <Link className="text-resin underline underline-offset-2" href="/studio/reports/revenue">Show every month</Link>
        </p>
      ) : null;
      columns = [
        { key: "job", label: "Repair job" },
        { key: "paid", label: "Paid on" },
        { key: "amount", label: "Paid", align: "right" },
        { key: "refunded", label: "Refunded", align: "right" },
        { key: "net", label: "Net", align: "right" },
      ];
      rows = result.rows.map((r) => ({
        id: r.id,
        cells: {
          job: (
            <Link className="text-resin underline underline-offset-2" href={`/studio/jobs/${r.jobId}`}>
              {r.jobTitle} <span className="text-muted">· {r.pieceTitle}</span>
            </Link>
          ),
          paid: formatDate(r.paidOn, { short: true }),
          amount: money(r.amountMinor, r.currency),
          refunded: r.refundedMinor ? money(r.refundedMinor, r.currency) : "—",
          net: money(r.netMinor, r.currency),
        },
      }));
      const cur = ctx.studio.currency;
      summary = `${result.rows.length} payment${result.rows.length === 1 ? "" : "s"}, net ${money(result.rows.filter((r) => r.currency === cur).reduce((a, r) => a + r.netMinor, 0), cur)}.`;
      break;
    }
    case "answers": {
      const current = "answered" in q && q.answered ? `answered=${q.answered}` : undefined;
      filters = <Filters base="/studio/reports/answers" current={current} options={[{ label: "All" }, { value: "answered=yes", label: "Answered" }, { value: "answered=no", label: "Waiting for a first answer" }]} />;
      columns = [
        { key: "claim", label: "Claim" },
        { key: "owner", label: "Owner" },
        { key: "state", label: "State" },
        { key: "filed", label: "Filed" },
        { key: "wait", label: "First answer after", align: "right" },
      ];
      rows = result.rows.map((r) => ({
        id: r.id,
        cells: {
          claim: (
            <Link className="text-resin underline underline-offset-2" href={`/studio/claims/${r.id}`}>
              {r.category} <span className="text-muted">· {r.pieceTitle}</span>
            </Link>
          ),
          owner: r.ownerName,
          state: r.state,
          filed: formatInstant(r.filedAt, ctx.studio.timeZone),
          wait: r.answeredAt ? formatWait(r.waitMs) : <StatusBadge tone="waiting" label={`Waiting ${formatWait(r.waitMs)}`} />,
        },
      }));
      summary = `${result.rows.length} claim${result.rows.length === 1 ? "" : "s"}.`;
      break;
    }
  }

  return (
    <>
      <PageHeader title={t.title} lead={`${t.lead} Since ${formatDate(result.since)}.`} />
      <p className="mb-4 text-sm">
        <Link className="text-resin underline underline-offset-2" href="/studio">
          ← Overview
        </Link>{" "}
        ·{" "}
        <Link className="text-resin underline underline-offset-2" href="/studio/reports">
          Reports
        </Link>
      </p>
      {!parsed.success ? (
        <Notice tone="error" className="mb-4" title="That filter isn't one we know">
          {z.flattenError(parsed.error).formErrors[0] ?? Object.values(z.flattenError(parsed.error).fieldErrors).flat()[0]} Showing everything instead.
        </Notice>
      ) : null}
      {filters}
      <Card>
        <p className="mb-3 text-sm text-muted">{summary}</p>
        <DataTable caption={t.title} columns={columns} rows={rows} />
      </Card>
    </>
  );
}
