// The overview's care plan figures (lib/plans/overview): running, renewals due, lapsed, and plan revenue by month.
import { OverviewBarChart } from "@/components/overview/bar-chart";
import { ChartPanel, Figure, FigureTable } from "@/components/overview/panel";
import type { StudioActor } from "@/lib/auth/actor";
import { formatMoney, formatMonth } from "@/lib/format";
import { planOverview, RENEWAL_WINDOW_DAYS } from "@/lib/plans/overview";

export function PlanOverviewSection({ ctx }: { ctx: StudioActor }) {
  const p = planOverview(ctx);
  const money = (minor: number) => formatMoney(minor, p.currency, ctx.studio.country);
  return (
    <section aria-labelledby="plans-h" className="my-8 space-y-4">
      <h2 id="plans-h" className="font-display text-xl font-semibold">
        Care plans
      </h2>
      <div className="grid grid-cols-2 gap-3 sm:gap-4 lg:grid-cols-4">
        <Figure label="Plans running" value={p.running} href="/studio/plans" note={p.inGrace ? `${p.inGrace} with a payment overdue` : "all paid up"} />
        <Figure label="Renewals due" value={p.renewalsDue} href="/studio/plans?renewals=due" note={`in the next ${RENEWAL_WINDOW_DAYS} days`} />
        <Figure label="Plans lapsed" value={p.lapsed} href="/studio/plans" note="in the last 12 months" />
        <Figure label="Plan revenue" value={money(p.totalMinor)} href="/studio/plans" note="in the last 12 months" />
      </div>
      <ChartPanel
        title="Plan revenue by month"
        lead="Plan payments that count (the plan's amount and version), by the month paid."
        figures={p.revenue.map((r) => r.amountMinor)}
        table={<FigureTable caption="Plan revenue by month" columns={["Month", "Revenue"]} rows={p.revenue.map((r) => ({ label: formatMonth(r.month), href: "/studio/plans", cells: [money(r.amountMinor)] }))} />}
      >
        <OverviewBarChart title="Plan revenue by month" layout="vertical" format="money" currency={p.currency} country={ctx.studio.country} data={p.revenue.map((r) => ({ label: formatMonth(r.month, { short: true }), amount: r.amountMinor, href: "/studio/plans" }))} series={[{ key: "amount", name: "Plan revenue" }]} />
      </ChartPanel>
    </section>
  );
}
