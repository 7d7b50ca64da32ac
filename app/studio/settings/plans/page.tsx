import type { Metadata } from "next";
import { PlanTemplateForm } from "@/components/plans/template-form";
import { Card } from "@/components/ui/card";
import { requireAdmin } from "@/lib/auth/guards";
import { forPage } from "@/lib/auth/page";
import { currencyExponent } from "@/lib/care/quote";
import { CARE_TASK_LABELS } from "@/lib/care/vocabulary";
import { CLAIM_CATEGORY_LABELS } from "@/lib/claims/labels";
import { formatInstant, formatMoney } from "@/lib/format";
import { planPrice } from "@/lib/plans/price";
import { listTemplates } from "@/lib/plans/templates";

export const metadata: Metadata = { title: "Care plans" };

export default async function PlanSettingsPage() {
  const ctx = await forPage(requireAdmin);
  const templates = listTemplates(ctx.studio.id);
  return (
    <div className="space-y-6">
      <Card className="space-y-4">
        <div>
          <h2 className="font-display text-xl font-semibold">Care plans</h2>
          <p className="text-sm text-muted">
            A yearly (or monthly) plan owners can buy for a piece: the care tasks you do for them, studio visits, a longer warranty on some lines and a discount on repairs. Changing a plan makes a new version; plans already running keep the version they were bought under.
          </p>
        </div>
        {templates.length ? (
          <ul className="divide-y divide-line">
            {templates.map((t) => {
              const price = planPrice(ctx.studio, t);
              return (
                <li key={t.id} className="space-y-1 py-3">
                  <p className="font-semibold">
                    {t.name} <span className="text-sm font-normal text-muted">· version {t.version}{t.offered ? "" : " · not offered"}</span>
                  </p>
                  <p className="text-sm">
                    {formatMoney(price.totalMinor, t.currency, ctx.studio.country)} {t.interval === "year" ? "a year" : "a month"}
                    {price.taxMinor ? ` (tax ${formatMoney(price.taxMinor, t.currency, ctx.studio.country)})` : ""} · {t.included.visitsPerYear} visit{t.included.visitsPerYear === 1 ? "" : "s"} a year
                    {t.included.tasks.length ? ` · ${t.included.tasks.map((k) => CARE_TASK_LABELS[k].toLowerCase()).join(", ")}` : ""}
                    {t.included.extendedLines.map((l) => ` · ${CLAIM_CATEGORY_LABELS[l.category].toLowerCase()} +${l.extraMonths} months`).join("")}
                  </p>
                  <p className="text-sm text-muted">Saved {formatInstant(t.createdAt, ctx.studio.timeZone)}</p>
                </li>
              );
            })}
          </ul>
        ) : (
          <p className="text-sm text-muted">No plans yet. Plans you add here appear on the pages of the pieces they fit, for owners to buy.</p>
        )}
      </Card>
      <Card className="space-y-3">
        <h2 className="font-semibold">Add a plan</h2>
        <PlanTemplateForm currency={ctx.studio.currency} exponent={currencyExponent(ctx.studio.currency)} categoryLabels={CLAIM_CATEGORY_LABELS} />
      </Card>
    </div>
  );
}
