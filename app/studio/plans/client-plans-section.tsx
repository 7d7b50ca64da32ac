// The care plans card of a client's page (staff): each piece's plan, or a form to start one paid by other means.
import { StartPlanForm } from "@/components/plans/start-plan-form";
import { Card } from "@/components/ui/card";
import type { StudioActor } from "@/lib/auth/actor";
import { formatInstant, formatMoney } from "@/lib/format";
import { clientPiecePlans } from "@/lib/plans/staff";

export function ClientPlansSection({ ctx, pieceIds }: { ctx: StudioActor; pieceIds: string[] }) {
  const rows = clientPiecePlans(ctx, pieceIds);
  if (rows.length === 0) return null;
  return (
    <Card className="space-y-3">
      <h2 id="client-plans-title" className="font-display text-xl font-semibold">
        Care plans
      </h2>
      <ul className="divide-y divide-line">
        {rows.map((r) => (
          <li key={r.pieceId} className="space-y-2 py-2">
            <p className="font-medium">{r.title}</p>
            {r.plan ? (
              <p className="text-sm" data-testid="client-piece-plan">
                {r.plan.name} (version {r.plan.version}) · {r.plan.stateLabel}
                {r.plan.periodEnd ? ` · paid to ${formatInstant(r.plan.periodEnd, ctx.studio.timeZone)}` : ""} · {r.plan.paidBy === "card" ? "paid by card" : "paid by other means"}
              </p>
            ) : !r.hasOwner ? (
              <p className="text-sm text-muted">A plan can start once the piece is registered to its owner.</p>
            ) : r.fitting.length ? (
              <StartPlanForm
                pieceId={r.pieceId}
                pieceTitle={r.title}
                options={r.fitting.map((f) => ({ id: f.id, label: `${f.name} — ${formatMoney(f.priceMinor, f.currency, ctx.studio.country)} ${f.interval === "year" ? "a year" : "a month"}` }))}
              />
            ) : (
              <p className="text-sm text-muted">No plan fits this piece.</p>
            )}
          </li>
        ))}
      </ul>
    </Card>
  );
}
