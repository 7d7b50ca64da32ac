// A care plan's discount on paid repairs: the piece's plan on the day the quote is priced, while it
// runs (in grace or ending too, until the day it lapsed or ended); a lapsed or ended plan gives none.
import type { PlanDiscount } from "@/lib/repairs/lines";
import { planOnDay } from "./coverage-terms";

export function planRepairDiscount(pieceId: string, at: Date): PlanDiscount | null {
  const plan = planOnDay(pieceId, at);
  if (!plan?.covers || plan.template.included.repairDiscountPct <= 0) return null;
  return { pct: plan.template.included.repairDiscountPct, planName: plan.template.name, planVersion: plan.template.version };
}
