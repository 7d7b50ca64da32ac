import type { Metadata } from "next";
import { PlanTemplateForm } from "@/components/plans/template-form";
import { Card } from "@/components/ui/card";
import { requireAdmin } from "@/lib/auth/guards";
import { forPage } from "@/lib/auth/page";
import { currencyExponent } from "@/lib/care/quote";
import { CARE_TASK_LABELS } from "@/lib/care/vocabulary";
import { CLAIM_CATEGORY_LABELS } from "@/lib/claims/labels";
import { FINISH_CLASS_LABELS, PIECE_KIND_LABELS } from "@/lib/care/vocabulary";
import { formatMoney, formatPercentBp } from "@/lib/format";
import { planPrice } from "@/lib/plans/price";
import { listTemplates } from "@/lib/plans/templates";
import { taxRateFor } from "@/lib/repairs/lines";
import { studioTax } from "@/lib/repairs/pricing";
import { termsAsOf, termsChangedNote } from "./template-words";

export const metadata: Metadata = { title: "Care plans" };

/** How the studio's tax settings treat a plan's price (one "other work" line), in words. */
function taxNoteOf(studio: Parameters<typeof studioTax>[0]): string {
  const tax = studioTax(studio);
  const rate = taxRateFor(tax, "other");
  if (rate === 0) return "No tax is added, as your tax settings say.";
  return tax.inclusive ? `Your prices include tax (${formatPercentBp(rate)}): owners pay the price as typed.` : `Owners pay this plus ${formatPercentBp(rate)} tax, as your tax settings say.`;
}

const list = (items: string[]) => items.map((i) => i.toLowerCase()).join(", ");

export default async function PlanSettingsPage() {
  const ctx = await forPage(requireAdmin);
  const templates = listTemplates(ctx.studio.id);
  const exponent = currencyExponent(ctx.studio.currency);
  const taxNote = taxNoteOf(ctx.studio);
  return (
    <div className="space-y-6">
      <Card className="space-y-4">
        <div>
          <h2 className="font-display text-xl font-semibold">Care plans</h2>
          <p className="text-sm text-muted">
            A yearly (or monthly) plan owners can buy for a piece: the care tasks you do for them, studio visits, a longer warranty on some lines and a discount on repairs. Changing a plan saves new terms from that day; plans already running keep the terms they were bought under.
          </p>
        </div>
        {templates.length ? (
          <ul className="divide-y divide-line">
            {templates.map((t) => {
              const price = planPrice(ctx.studio, t);
              return (
                <li key={t.id} className="space-y-1 py-3">
                  <p className="font-semibold">
                    {t.name} <span className="text-sm font-normal text-muted">· {termsAsOf(t.createdAt, ctx.studio.timeZone)}{t.offered ? "" : " · not offered"}</span>
                  </p>
                  <p className="text-sm">
                    {formatMoney(price.totalMinor, t.currency, ctx.studio.country)} {t.interval === "year" ? "a year" : "a month"}
                    {price.taxMinor ? ` (tax ${formatMoney(price.taxMinor, t.currency, ctx.studio.country)})` : ""} · {t.included.visitsPerYear} visit{t.included.visitsPerYear === 1 ? "" : "s"} a year
                    {t.included.tasks.length ? ` · ${t.included.tasks.map((k) => CARE_TASK_LABELS[k].toLowerCase()).join(", ")}` : ""}
                    {t.included.extendedLines.map((l) => ` · ${CLAIM_CATEGORY_LABELS[l.category].toLowerCase()} +${l.extraMonths} months`).join("")}
                  </p>
                  <p className="text-sm">
                    Fits {t.fits.pieceKinds.length ? list(t.fits.pieceKinds.map((k) => PIECE_KIND_LABELS[k])) : "any piece"}
                    {t.fits.finishClasses.length ? ` finished with ${list(t.fits.finishClasses.map((c) => FINISH_CLASS_LABELS[c]))}` : ""}
                    {t.fits.minTopAreaM2 != null ? ` · tops from ${t.fits.minTopAreaM2} m²` : ""}
                    {t.fits.maxTopAreaM2 != null ? ` · tops up to ${t.fits.maxTopAreaM2} m²` : ""}
                    {t.included.repairDiscountPct ? ` · ${t.included.repairDiscountPct} % off paid repairs` : ""}
                  </p>
                  {termsChangedNote(t.version) ? <p className="text-sm text-muted">{termsChangedNote(t.version)}</p> : null}
                  <details className="pt-1">
                    <summary className="min-h-11 cursor-pointer py-2 font-medium text-resin underline underline-offset-2">Change this plan</summary>
                    <PlanTemplateForm template={t} currency={ctx.studio.currency} exponent={exponent} taxNote={taxNote} categoryLabels={CLAIM_CATEGORY_LABELS} />
                  </details>
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
        <PlanTemplateForm currency={ctx.studio.currency} exponent={exponent} taxNote={taxNote} categoryLabels={CLAIM_CATEGORY_LABELS} />
      </Card>
    </div>
  );
}
