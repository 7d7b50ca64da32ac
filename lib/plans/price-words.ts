// A care plan's price as people read it: the amount with its period ("$151.90 a year"), and — only
// where a newer version of the plan has since been saved, so staff may compare — the day that price
// was set ("price as of 3 March 2026"), never a version number. Pure: pages, e-mails and tests use it.
import { formatInstant, formatMoney } from "@/lib/format";
import type { PlanInterval } from "./terms";

export const PERIOD_WORDS: Record<PlanInterval, string> = { year: "a year", month: "a month" };

/** "$151.90 a year", "$14.50 a month". */
export function formatPlanPrice(minor: number, currency: string, interval: PlanInterval, country: string): string {
  return `${formatMoney(minor, currency, country)} ${PERIOD_WORDS[interval]}`;
}

/** A plan bought under one version of its template: what it costs a period, and since when if the plan has changed since. */
export type PricedPlan = { amountMinor: number; currency: string; interval: PlanInterval; pricedAt: Date | number; superseded: boolean };

/** "$151.90 a year", or "$151.90 a year (price as of 3 March 2026)" when the plan's terms have changed since it was bought. */
export function planPriceWords(p: PricedPlan, country: string, timeZone: string): string {
  const price = formatPlanPrice(p.amountMinor, p.currency, p.interval, country);
  return p.superseded ? `${price} (price as of ${formatInstant(p.pricedAt, timeZone)})` : price;
}
