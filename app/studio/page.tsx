import type { Metadata } from "next";
import Link from "next/link";
import { OverviewBarChart } from "@/components/overview/bar-chart";
import { ChartPanel, Figure, FigureTable } from "@/components/overview/panel";
import { SetupChecklist } from "@/components/setup/setup-checklist";
import { PageHeader } from "@/components/ui/card";
import { Notice } from "@/components/ui/notice";
import { requireStaff } from "@/lib/auth/guards";
import { forPage } from "@/lib/auth/page";
import { addDays } from "@/lib/care/dates";
import { formatDate, formatMoney, formatMonth, formatZone, formatWait } from "@/lib/format";
import { getOverview } from "@/lib/overview";
import { setupChecklist } from "@/lib/studio/setup";
import { PlanOverviewSection } from "./plans/overview-section";

export const metadata: Metadata = { title: "Studio overview" };

const OFFER_WORDS = { offered: "Waiting for an answer", accepted: "Accepted", declined: "Declined", expired: "Expired" } as const;

function pct(part: number, whole: number): string {
  return whole ? `${Math.round((part / whole) * 100)} %` : "—";
}

export default async function StudioOverviewPage() {
  const ctx = await forPage(requireStaff);
  const o = getOverview(ctx);
  const money = (minor: number) => formatMoney(minor, o.revenue.currency, ctx.studio.country);
  const sinceWords = `since ${formatDate(o.since)}`;
  const yesterday = addDays(o.today, -1);

  return (
    <>
      <PageHeader
        title={ctx.studio.name}
        lead={`Your studio's aftercare at a glance. Today is ${formatDate(o.today, { weekday: "long" })} (${formatZone(o.timeZone)}); flows cover the last 12 months, ${sinceWords}.`}
        actions={
          <Link href="/studio/reports" className="inline-flex min-h-11 items-center rounded-lg border border-line bg-card px-4 text-sm font-semibold hover:border-resin hover:text-resin">
            Reports
          </Link>
        }
      />
      <SetupChecklist items={setupChecklist(ctx)} />

      <section aria-labelledby="pieces-h" className="mb-8">
        <h2 id="pieces-h" className="sr-only">
          Pieces and care
        </h2>
        <div className="grid grid-cols-2 gap-3 sm:gap-4 lg:grid-cols-4">
          <Figure label="Pieces delivered" value={o.pieces.delivered} href="/studio/pieces?sort=delivered&dir=desc" note={`${o.pieces.registered} registered by their owners`} />
          <Figure label="Under warranty today" value={o.pieces.underWarranty} href="/studio/pieces?warranty=active" note={`of ${o.pieces.delivered} delivered`} />
          <Figure
            label={`Care tasks due in the next ${o.care.days} days`}
            value={o.care.due}
            href={`/studio/pieces?dueBefore=${o.care.until}&sort=next_due`}
            note={`on ${o.care.piecesDue} piece${o.care.piecesDue === 1 ? "" : "s"}, up to ${formatDate(o.care.until)}`}
          />
          <Figure
            label="Care overdue"
            value={o.care.overdue}
            href={`/studio/pieces?dueBefore=${yesterday}&sort=next_due`}
            note={`task${o.care.overdue === 1 ? "" : "s"} on ${o.care.piecesOverdue} piece${o.care.piecesOverdue === 1 ? "" : "s"}`}
          />
        </div>
        {o.care.skipped ? (
          <Notice tone="warn" className="mt-3">
            {o.care.skipped} piece record{o.care.skipped === 1 ? "" : "s"} could not be scheduled (missing sizes or layers); open the registry to complete them.
          </Notice>
        ) : null}
      </section>

      <div className="grid gap-6 lg:grid-cols-2">
        <ChartPanel
          title="Care coming due and overdue, by task"
          lead={<>From each piece&apos;s finish stack and care log: due from today to {formatDate(o.care.until)}, and past due.</>}
          figures={o.care.byKind.flatMap((k) => [k.count, k.overdue])}
          table={
            <FigureTable
              caption="Care tasks due in the next 30 days and overdue, by task"
              columns={["Task", `Due by ${formatDate(o.care.until, { short: true })}`, "Overdue"]}
              rows={o.care.byKind.map((k) => ({ label: k.label, href: `/studio/pieces?dueBefore=${o.care.until}&sort=next_due`, cells: [k.count, k.overdue] }))}
            />
          }
        >
          {o.care.byKind.length ? (
            <OverviewBarChart
              title="Care tasks due in the next 30 days and overdue, by task"
              data={o.care.byKind.map((k) => ({ label: k.label, due: k.count, overdue: k.overdue, href: `/studio/pieces?dueBefore=${o.care.until}&sort=next_due` }))}
              series={[
                { key: "due", name: `Due in the next ${o.care.days} days` },
                { key: "overdue", name: "Overdue" },
              ]}
            />
          ) : (
            <p className="text-sm text-muted">No care is due in the next {o.care.days} days and none is overdue.</p>
          )}
        </ChartPanel>

        <ChartPanel
          title="Reminders sent, and care logged in return"
          figures={[o.reminders.sent, o.reminders.acted, ...o.reminders.byStep.flatMap((s) => [s.sent, s.acted])]}
          lead={
            o.reminders.sent === 0 ? (
              // A sentence of noughts ("0 of 0 … (—)") says nothing to a studio that has sent none yet.
              <>No care reminders sent {sinceWords}. Owners get them before, on and after each care task&apos;s due date; this shows how many then logged the care.</>
            ) : (
              <>
                <strong className="text-ink">
                  {o.reminders.ownersActed} of {o.reminders.owners}
                </strong>{" "}
                owners reminded logged the task within {o.reminders.withinDays} days; {o.reminders.acted} of {o.reminders.sent} reminders ({pct(o.reminders.acted, o.reminders.sent)}) were followed by care, {sinceWords}.
              </>
            )
          }
          table={
            <FigureTable
              caption="Reminders sent and followed by care, by step"
              columns={["Reminder", "Sent", `Care within ${o.reminders.withinDays} d`]}
              rows={[
                ...o.reminders.byStep.map((s) => ({ label: s.label, href: `/studio/reports/reminders?step=${s.step}`, cells: [s.sent, s.acted] })),
                { label: "All reminders", href: "/studio/reports/reminders", cells: [o.reminders.sent, o.reminders.acted] },
              ]}
            />
          }
        >
          <OverviewBarChart
            title="Reminders sent and followed by care, by step"
            data={o.reminders.byStep.map((s) => ({ label: s.label, sent: s.sent, acted: s.acted, href: `/studio/reports/reminders?step=${s.step}` }))}
            series={[
              { key: "sent", name: "Sent" },
              { key: "acted", name: `Care logged within ${o.reminders.withinDays} days` },
            ]}
          />
          <p className="text-sm">
            <Link className="text-resin underline underline-offset-2" href="/studio/reports/reminders?acted=yes">
              Reminders followed by care
            </Link>{" "}
            ·{" "}
            <Link className="text-resin underline underline-offset-2" href="/studio/reports/reminders?acted=no">
              not followed
            </Link>{" "}
            ·{" "}
            <Link className="text-resin underline underline-offset-2" href="/studio/reminders?view=ledger&status=sent">
              send ledger
            </Link>
          </p>
        </ChartPanel>

        <ChartPanel
          title="Claims by state"
          figures={o.claims.byState.map((s) => s.count)}
          lead={
            <>
              {o.claims.total} claim{o.claims.total === 1 ? "" : "s"} in all, <Link className="text-resin underline underline-offset-2" href="/studio/claims?state=open">{o.claims.open} open</Link>.
            </>
          }
          table={
            <FigureTable
              caption="Claims by state"
              columns={["State", "Claims"]}
              rows={o.claims.byState.map((s) => ({ label: s.label, href: `/studio/claims?state=${s.state}`, cells: [s.count] }))}
            />
          }
        >
          <OverviewBarChart title="Claims by state" data={o.claims.byState.map((s) => ({ label: s.label, count: s.count, href: `/studio/claims?state=${s.state}` }))} series={[{ key: "count", name: "Claims" }]} />
        </ChartPanel>

        <ChartPanel
          title="Claims by kind of damage"
          figures={o.claims.byCategory.map((c) => c.count)}
          lead={<>Every claim filed, by the category the owner chose. The <Link className="text-resin underline underline-offset-2" href="/studio/reports">claims report</Link> relates them to species, finish and resin.</>}
          table={
            <FigureTable
              caption="Claims by kind of damage"
              columns={["Kind", "Claims"]}
              rows={o.claims.byCategory.map((c) => ({ label: c.label, href: `/studio/claims?state=all&category=${c.category}`, cells: [c.count] }))}
            />
          }
        >
          <OverviewBarChart
            title="Claims by kind of damage"
            data={o.claims.byCategory.map((c) => ({ label: c.label, count: c.count, href: `/studio/claims?state=all&category=${c.category}` }))}
            series={[{ key: "count", name: "Claims" }]}
          />
        </ChartPanel>
      </div>

      <PlanOverviewSection ctx={ctx} />

      <section aria-labelledby="flows-h" className="my-8">
        <h2 id="flows-h" className="sr-only">
          Answers and offers
        </h2>
        <div className="grid grid-cols-2 gap-3 sm:gap-4 lg:grid-cols-4">
          <Figure
            label="Median time to first answer"
            value={o.firstAnswer.medianMs === null ? "—" : formatWait(o.firstAnswer.medianMs)}
            href="/studio/reports/answers?answered=yes"
            note={`over ${o.firstAnswer.answered} answered claim${o.firstAnswer.answered === 1 ? "" : "s"} filed ${sinceWords}`}
          />
          <Figure label="Claims waiting for a first answer" value={o.firstAnswer.waiting} href="/studio/reports/answers?answered=no" note="filed in the last 12 months" />
          <Figure label="Refresh offers sent" value={o.offers.sent} href="/studio/reports/offers" note={sinceWords} />
          <Figure label="Refresh offers accepted" value={o.offers.accepted} href="/studio/reports/offers?status=accepted" note={`${pct(o.offers.accepted, o.offers.sent)} of those sent`} />
        </div>
      </section>

      <div className="grid gap-6 lg:grid-cols-2">
        <ChartPanel
          title="Repair revenue by month"
          lead={
            <>
              Paid online minus refunds, by the month paid ({formatZone(o.timeZone)}): <strong className="text-ink">{money(o.revenue.totalNetMinor)}</strong> {sinceWords}.
            </>
          }
          className="lg:col-span-2"
          figures={o.revenue.months.flatMap((m) => [m.paidMinor, m.refundedMinor, m.netMinor])}
          table={
            <FigureTable
              caption="Repair revenue by month"
              columns={["Month", "Paid", "Refunded", "Net"]}
              rows={o.revenue.months.map((m) => ({ label: formatMonth(m.month), href: `/studio/reports/revenue?month=${m.month}`, cells: [money(m.paidMinor), money(m.refundedMinor), money(m.netMinor)] }))}
            />
          }
        >
          <OverviewBarChart
            title="Repair revenue by month"
            layout="vertical"
            format="money"
            currency={o.revenue.currency}
            country={ctx.studio.country}
            data={o.revenue.months.map((m) => ({ label: formatMonth(m.month, { short: true }), net: m.netMinor, href: `/studio/reports/revenue?month=${m.month}` }))}
            series={[{ key: "net", name: `Net revenue (${o.revenue.currency})` }]}
          />
          {o.revenue.otherCurrencies.length ? (
            <Notice tone="info">Payments in {o.revenue.otherCurrencies.join(", ")} are not added in; see the revenue report.</Notice>
          ) : null}
        </ChartPanel>

        <ChartPanel
          title="What became of the refresh offers"
          lead={sinceWords}
          figures={o.offers.byStatus.map((s) => s.count)}
          table={
            <FigureTable
              caption="Refresh offers by outcome"
              columns={["Outcome", "Offers"]}
              rows={o.offers.byStatus.map((s) => ({ label: OFFER_WORDS[s.status], href: `/studio/reports/offers?status=${s.status}`, cells: [s.count] }))}
            />
          }
        >
          <OverviewBarChart
            title="Refresh offers by outcome"
            data={o.offers.byStatus.map((s) => ({ label: OFFER_WORDS[s.status], count: s.count, href: `/studio/reports/offers?status=${s.status}` }))}
            series={[{ key: "count", name: "Offers" }]}
          />
        </ChartPanel>

        <ChartPanel
          title="Visits this week"
          figures={o.visits.byDay.flatMap((d) => [d.booked, d.done])}
          lead={
            <>
              <Link className="text-resin underline underline-offset-2" href="/studio/visits">
                {o.visits.total} visit{o.visits.total === 1 ? "" : "s"}
              </Link>{" "}
              from {formatDate(o.visits.weekFrom, { weekday: "short", short: true, year: false })} to {formatDate(o.visits.weekTo, { weekday: "short", short: true })}: {o.visits.done} done, {o.visits.booked} booked (cancelled ones left out).
            </>
          }
          table={
            <FigureTable
              caption="Visits this week by day"
              columns={["Day", "Booked", "Done"]}
              rows={o.visits.byDay.map((d) => ({ label: formatDate(d.date, { weekday: "short", short: true }), href: "/studio/visits", cells: [d.booked, d.done] }))}
            />
          }
        >
          <OverviewBarChart
            title="Visits this week by day"
            layout="vertical"
            data={o.visits.byDay.map((d) => ({ label: formatDate(d.date, { weekday: "short", short: true, year: false }), booked: d.booked, done: d.done, href: "/studio/visits" }))}
            series={[
              { key: "booked", name: "Booked" },
              { key: "done", name: "Done" },
            ]}
          />
        </ChartPanel>
      </div>
    </>
  );
}
