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

/**
 * Where the claim's repair stands, as the decision's words need it: no job yet (or the studio still
 * pricing it), its quote sent, paid, covered, its visit booked, done or cancelled; "unseen" for a job
 * the owner no longer reaches after handing the piece on (lib/claims/view-claim.ts), of which nothing
 * is said; "closed" for a claim closed without a job.
 */
export type RepairStep = "none" | "closed" | "unseen" | "quoted" | "paid" | "covered" | "scheduled" | "done" | "cancelled";

/**
 * The decision in the owner's words, following the claim and its job: "will send you a quote" only
 * while no quote was sent; once the repair is done, in the past tense.
 */
export function ownerDecisionWords(decision: ClaimDecision, step: RepairStep): string {
  if (decision === "declined") return "The studio declined this claim.";
  const done = step === "done";
  const cover = {
    covered: done ? "Your warranty covered the repair." : "The repair is covered by your warranty.",
    partly_covered: done ? "The warranty covered part of the repair." : "The warranty covers part of the repair.",
    chargeable: done ? "The repair wasn't covered by your warranty; the studio did it as a paid repair." : "The repair isn't covered by your warranty, but the studio can do it as a paid repair.",
  }[decision];
  const next: Record<RepairStep, string> = {
    none: decision === "covered" ? "" : decision === "partly_covered" ? "The studio will quote you the rest." : "The studio will send you a quote.",
    closed: "",
    unseen: "",
    quoted: decision === "partly_covered" ? "The studio sent you a quote for the rest." : "The studio sent you a quote.",
    paid: decision === "partly_covered" ? "You paid your part." : decision === "chargeable" ? "You paid for the repair." : "",
    covered: decision === "covered" ? "" : "Nothing is left for you to pay.",
    scheduled: "The repair visit is booked.",
    done: "",
    cancelled: "The repair job was cancelled.",
  };
  return next[step] ? `${cover} ${next[step]}` : cover;
}
