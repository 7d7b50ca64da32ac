// The care plans that fit a piece, in the words the hand-over and refresh mails print: price with
// tax, what is included, and — only when the owner's own care log gives one — what it would have
// saved over the last year (lib/plans/savings). Pure: no database.
import { CARE_TASK_LABELS } from "@/lib/care/vocabulary";
import { CLAIM_CATEGORY_LABELS } from "@/lib/claims/labels";
import { formatMoney } from "@/lib/format";
import type { PlanOfferLine } from "@/emails/components/plan-offers";
import type { PlanOffer } from "./offers";
import { formatPlanPrice } from "./price-words";

export type { PlanOfferLine };

const plural = (n: number, one: string, many: string) =>
  `${n} ${n === 1 ? one : many}`;

export function planOfferLines(
  offers: readonly Pick<
    PlanOffer,
    | "name"
    | "interval"
    | "currency"
    | "priceMinor"
    | "taxMinor"
    | "included"
    | "lastYear"
  >[],
  country: string,
  studioName: string,
): PlanOfferLine[] {
  return offers.map((o) => {
    const money = (minor: number) => formatMoney(minor, o.currency, country);
    const i = o.included;
    const includes = [
      ...(i.tasks.length
        ? [
            `${i.tasks.map((t, n) => (n === 0 ? CARE_TASK_LABELS[t] : CARE_TASK_LABELS[t].toLowerCase())).join(", ")} done by the studio, no reminders to act on`,
          ]
        : []),
      ...(i.visitsPerYear
        ? [
            `${plural(i.visitsPerYear, "studio visit", "studio visits")} a year${i.visitSharePct ? `, you pay ${i.visitSharePct} % of each` : ""}`,
          ]
        : []),
      ...i.extendedLines.map(
        (l) =>
          `${CLAIM_CATEGORY_LABELS[l.category]}: covered ${plural(l.extraMonths, "month", "months")} longer while the plan runs`,
      ),
      ...(i.repairDiscountPct
        ? [`${i.repairDiscountPct} % off paid repairs`]
        : []),
    ];
    const y = o.lastYear;
    const lastYear = y
      ? `The care you logged over the last year (${plural(y.entries, "task", "tasks")}) would have cost ${money(y.wouldHaveCostMinor)} from ${studioName}; a year of this plan is ${money(y.planYearMinor)}` +
        (y.savedMinor > 0
          ? `, so it would have saved you ${money(y.savedMinor)}.`
          : ", so it would not have saved you money on that care alone.")
      : null;
    return {
      name: o.name,
      price: `${formatPlanPrice(o.priceMinor, o.currency, o.interval, country)}${o.taxMinor ? `, including ${money(o.taxMinor)} tax` : ""}`,
      includes,
      lastYear,
    };
  });
}
