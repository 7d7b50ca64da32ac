// The one state machine of a plan subscription. Every move goes through assertPlanMove and is written
// with an audit row and a version check (lib/plans/subscriptions.ts moveSubscription); only verified
// Stripe events (lib/plans/stripe-sync.ts), staff and owner actions (lib/plans/cancel.ts, a piece
// changing hands in lib/plans/transfer.ts, starting a plan in lib/plans/subscriptions.ts) and the
// scheduler for plans paid by other means (lib/plans/visits.ts) call it.

export const PLAN_STATES = ["awaiting_payment", "running", "grace", "lapsed", "ending", "ended"] as const;
export type PlanState = (typeof PLAN_STATES)[number];

/**
 * awaiting_payment: checkout opened, nothing paid yet.
 * running: paid for the current period.
 * grace: a renewal payment failed; the plan still covers while the owner fixes it.
 * lapsed: the grace ran out unpaid; coverage is back to the base terms from the lapse date. Final.
 * ending: cancelled, runs to the end of the paid period.
 * ended: over (cancelled, or never paid). Final.
 */
const MOVES: Record<PlanState, readonly PlanState[]> = {
  awaiting_payment: ["running", "ended"],
  running: ["grace", "ending", "ended", "lapsed"],
  grace: ["running", "lapsed", "ending", "ended"],
  ending: ["running", "ended", "grace"],
  lapsed: [],
  ended: [],
};

export const PLAN_STATE_LABELS: Record<PlanState, string> = {
  awaiting_payment: "Waiting for the first payment",
  running: "Running",
  grace: "Payment overdue (grace period)",
  lapsed: "Lapsed",
  ending: "Ends at the end of the period",
  ended: "Ended",
};

/** States in which the plan's terms apply (coverage, included visits). */
export const PLAN_COVERS: readonly PlanState[] = ["running", "grace", "ending"];
export const PLAN_FINAL: readonly PlanState[] = ["lapsed", "ended"];

export function canMovePlan(from: PlanState, to: PlanState): boolean {
  return MOVES[from].includes(to);
}

export class PlanMoveError extends Error {
  constructor(
    readonly from: PlanState,
    readonly to: PlanState,
  ) {
    super(`A plan that is ${PLAN_STATE_LABELS[from].toLowerCase()} can't become ${PLAN_STATE_LABELS[to].toLowerCase()}.`);
  }
}

export function assertPlanMove(from: PlanState, to: PlanState): void {
  if (!canMovePlan(from, to)) throw new PlanMoveError(from, to);
}
