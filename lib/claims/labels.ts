// Our own words for claim states, categories and decisions (lib/care/vocabulary.ts). Pure, safe for client
// components. Screens pair each state word with an icon (components/claims/state-badge.tsx).
import type { ClaimCategory } from "@/lib/care/vocabulary";
import type { ClaimDecision, ClaimState } from "./states";

export const CLAIM_CATEGORY_LABELS: Record<ClaimCategory, string> = {
  crack_gap: "Crack or gap",
  resin_clouding: "Resin clouding or yellowing",
  finish_wear: "Finish wear, rings or marks",
  finish_peeling: "Finish peeling",
  structural: "Structural, loose or wobbly",
  scratch_dent: "Scratch or dent",
  other: "Something else",
};

/** How the studio sees each state. */
export const CLAIM_STATE_LABELS_STAFF: Record<ClaimState, string> = {
  submitted: "New",
  in_review: "Reviewing",
  awaiting_owner: "Waiting on owner",
  accepted: "Accepted",
  declined: "Declined",
  repair_booked: "Repair booked",
  closed: "Closed",
};

/** How the owner sees each state. */
export const CLAIM_STATE_LABELS_OWNER: Record<ClaimState, string> = {
  submitted: "Sent to the studio",
  in_review: "Studio is reviewing",
  awaiting_owner: "Studio needs your reply",
  accepted: "Accepted",
  declined: "Declined",
  repair_booked: "Repair booked",
  closed: "Closed",
};

export const CLAIM_DECISION_LABELS: Record<ClaimDecision, string> = {
  covered: "Covered",
  partly_covered: "Partly covered",
  chargeable: "Chargeable repair",
  declined: "Declined",
};

export function decisionText(decision: ClaimDecision, coveredPct: number | null): string {
  return decision === "partly_covered" && coveredPct != null ? `Partly covered (${coveredPct} %)` : CLAIM_DECISION_LABELS[decision];
}
