// What a care plan template holds: the words and shapes shared by the schema, validation and screens.
// Pure: no imports beyond the care vocabulary.
import type { CareTaskKind, ClaimCategory, FinishClass, PieceKind } from "../care/vocabulary";

export const PLAN_INTERVALS = ["year", "month"] as const;
export type PlanInterval = (typeof PLAN_INTERVALS)[number];

/** How the plan is paid: through Stripe (card at checkout) or recorded by staff (cash, transfer …). */
export const PLAN_PAID_BY = ["card", "other"] as const;
export type PlanPaidBy = (typeof PLAN_PAID_BY)[number];

/** The studio's rule for money back when a plan is cancelled: none, or the unused part of the period. */
export const PLAN_REFUND_RULES = ["none", "unused_share"] as const;
export type PlanRefundRule = (typeof PLAN_REFUND_RULES)[number];

/** One warranty line the plan lengthens (or adds, when the base terms have none) while it runs. */
export interface PlanExtendedLine {
  category: ClaimCategory;
  /** Months added to the base term (from delivery) while the plan runs. */
  extraMonths: number;
}

/** Which pieces a template fits; an empty list means any. Top area in m², inclusive bounds. */
export interface PlanFit {
  finishClasses: FinishClass[];
  pieceKinds: PieceKind[];
  minTopAreaM2: number | null;
  maxTopAreaM2: number | null;
}

export interface PlanIncluded {
  /** Care tasks the studio does instead of reminding the owner. */
  tasks: CareTaskKind[];
  /** Studio visits a year (an inspection with the included tasks). */
  visitsPerYear: number;
  /** The owner's share of an included visit's price, % (0 = included at no charge). */
  visitSharePct: number;
  extendedLines: PlanExtendedLine[];
  /** Discount on paid repairs while the plan runs, %. */
  repairDiscountPct: number;
}
