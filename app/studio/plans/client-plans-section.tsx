// The care plans card of a client's page (staff): each piece's plan, or a form to start one paid by other means.
import { StartPlanForm } from "@/components/plans/start-plan-form";
import { Card } from "@/components/ui/card";
import type { StudioActor } from "@/lib/auth/actor";
import { formatInstant } from "@/lib/format";
import { formatPlanPrice, planPriceWords } from "@/lib/plans/price-words";
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
                {r.plan.name} · {planPriceWords(r.plan, ctx.studio.country, ctx.studio.timeZone)} · {r.plan.stateLabel}
                {r.plan.periodEnd ? ` · paid to ${formatInstant(r.plan.periodEnd, ctx.studio.timeZone)}` : ""} · {r.plan.paidBy === "card" ? "paid by card" : "paid by other means"}
              </p>
            ) : !r.hasOwner ? (
              <p className="text-sm text-muted">A plan can start once the piece is registered to its owner.</p>
            ) : r.fitting.length ? (
              <StartPlanForm
                pieceId={r.pieceId}
                pieceTitle={r.title}
                options={r.fitting.map((f) => ({ id: f.id, label: `${f.name} — ${formatPlanPrice(f.priceMinor, f.currency, f.interval, ctx.studio.country)}` }))}
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
