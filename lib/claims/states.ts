// The claim state machine (states in lib/care/vocabulary.ts), as a table. Pure (type-only import of the vocabulary), so
// client components, the API and the tests read the same rules.
import type { CLAIM_DECISIONS, CLAIM_STATES } from "@/lib/care/vocabulary";

export type ClaimState = (typeof CLAIM_STATES)[number];
export type ClaimDecision = (typeof CLAIM_DECISIONS)[number];

/**
 * submitted → in_review → (awaiting_owner ↔ in_review) → accepted | declined;
 * accepted → repair_booked → closed. Every pair not listed here is illegal (409). The repair job
 * moves the last two steps (lib/claims/follow-job.ts), and a cancelled visit takes repair_booked
 * back to accepted there — not a move staff make by hand.
 */
export const CLAIM_TRANSITIONS: Readonly<Record<ClaimState, readonly ClaimState[]>> = {
  submitted: ["in_review"],
  in_review: ["awaiting_owner", "accepted", "declined"],
  awaiting_owner: ["in_review"],
  accepted: ["repair_booked"],
  declined: [],
  repair_booked: ["closed"],
  closed: [],
};

export function canTransition(from: ClaimState, to: ClaimState): boolean {
  return CLAIM_TRANSITIONS[from].includes(to);
}

/** Every (from, to) pair, legal or not: what the state-machine tests walk through. */
export function allStatePairs(): { from: ClaimState; to: ClaimState; legal: boolean }[] {
  const states = Object.keys(CLAIM_TRANSITIONS) as ClaimState[];
  return states.flatMap((from) => states.map((to) => ({ from, to, legal: canTransition(from, to) })));
}

/** A decision moves an in-review claim to accepted (covered, partly covered, chargeable) or declined. */
export function stateForDecision(decision: ClaimDecision): "accepted" | "declined" {
  return decision === "declined" ? "declined" : "accepted";
}

/** States in which the claim is still being decided: the owner may add photos and messages. */
export const OPEN_STATES: readonly ClaimState[] = ["submitted", "in_review", "awaiting_owner"];
export const MAX_CLAIM_PHOTOS = 10;
