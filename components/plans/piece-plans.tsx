// The owner's piece page (data from lib/plans/offers plansForMyPiece, loaded by care-plan-section.tsx): the care plan the piece is under, or the plans that fit it with what each
// would have saved over their last year of care (computed from their log and the studio's prices).
import { Card } from "@/components/ui/card";
import { CARE_TASK_LABELS } from "@/lib/care/vocabulary";
import { CLAIM_CATEGORY_LABELS } from "@/lib/claims/labels";
import { formatInstant, formatMoney } from "@/lib/format";
import type { PiecePlan, PlanOffer } from "@/lib/plans/offers";
import { formatPlanPrice, planPriceWords } from "@/lib/plans/price-words";
import type { PlanIncluded } from "@/lib/plans/terms";
import { BuyPlanButton } from "./buy-plan-button";

/** What a plan gives, one line each: on an offer, and on the plan the piece is under (what the owner is paying for). */
function included(i: PlanIncluded): string[] {
  const out: string[] = [];
  if (i.visitsPerYear > 0) {
    const visits = i.visitsPerYear === 1 ? "One studio visit a year" : `${i.visitsPerYear} studio visits a year`;
    out.push(i.visitSharePct === 0 ? `${visits}, included` : `${visits}, you pay ${i.visitSharePct} % of each`);
  }
  if (i.tasks.length) out.push(`Done for you: ${i.tasks.map((t) => CARE_TASK_LABELS[t].toLowerCase()).join(", ")}`);
  for (const l of i.extendedLines) out.push(`${CLAIM_CATEGORY_LABELS[l.category]}: warranty ${l.extraMonths} months longer while the plan runs`);
  if (i.repairDiscountPct > 0) out.push(`${i.repairDiscountPct} % off paid repairs`);
  return out;
}

function IncludedList({ lines }: { lines: string[] }) {
  return (
    <ul className="list-disc space-y-1 pl-5 text-sm">
      {lines.map((line) => (
        <li key={line}>{line}</li>
      ))}
    </ul>
  );
}

export function PiecePlans({ pieceId, timeZone, current, offers, country }: { pieceId: string; timeZone: string; current: PiecePlan | null; offers: PlanOffer[]; country: string }) {
  if (!current && offers.length === 0) return null;
  return (
    <section id="care-plan" aria-labelledby="care-plan-title" className="scroll-mt-4 space-y-3">
      <h2 id="care-plan-title" className="font-display text-2xl font-semibold">
        Care plan
      </h2>
      {current ? (
        <Card className="space-y-2 p-4" data-testid="current-plan">
          <p className="font-semibold">{current.name}</p>
          <p>
            {current.stateLabel}
            {current.periodEnd ? ` · ${current.state === "ending" ? "ends" : "renews"} on ${formatInstant(current.periodEnd, timeZone)}` : ""}
          </p>
          <p className="text-sm">{planPriceWords(current, country, timeZone)}</p>
          <IncludedList lines={included(current.included)} />
        </Card>
      ) : (
        <ul className="space-y-3">
          {offers.map((o) => (
            <li key={o.id}>
              <Card className="space-y-2 p-4">
                <p className="font-semibold">{o.name}</p>
                <p>
                  {formatPlanPrice(o.priceMinor, o.currency, o.interval, country)}
                  {o.taxMinor > 0 ? ` (including ${formatMoney(o.taxMinor, o.currency, country)} tax)` : ""}
                </p>
                {o.summary ? <p className="text-sm text-muted">{o.summary}</p> : null}
                <IncludedList lines={included(o.included)} />
                {o.lastYear ? (
                  <p className="text-sm">
                    Over the last year you logged {o.lastYear.entries === 1 ? "one task" : `${o.lastYear.entries} tasks`} this plan includes. As studio visits
                    they would have cost {formatMoney(o.lastYear.wouldHaveCostMinor, o.currency, country)}; a year of the plan is {formatMoney(o.lastYear.planYearMinor, o.currency, country)}
                    {o.lastYear.savedMinor > 0 ? `, so it would have saved you ${formatMoney(o.lastYear.savedMinor, o.currency, country)}.` : ", so it would not have saved you money on that care alone."}
                  </p>
                ) : null}
                <BuyPlanButton pieceId={pieceId} templateId={o.id} planName={o.name} />
              </Card>
            </li>
          ))}
        </ul>
      )}
    </section>
  );
}
