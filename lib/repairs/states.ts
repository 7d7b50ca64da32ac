import type { RepairJob } from "@/db/schema";
import { conflict } from "@/lib/errors";

type JobState = RepairJob["state"];

// DESIGN.md §2: draft → quoted → approved → paid (or covered) → scheduled → done. Editing a quoted
// job takes it back to draft; any open job can be cancelled.
const NEXT: Record<JobState, readonly JobState[]> = {
  draft: ["quoted", "covered", "cancelled"],
  quoted: ["draft", "approved", "covered", "cancelled"],
  approved: ["paid", "draft", "cancelled"],
  paid: ["scheduled", "cancelled"],
  covered: ["scheduled", "cancelled"],
  scheduled: ["done", "paid", "covered", "cancelled"],
  done: [],
  cancelled: [],
};

export const JOB_STATE_LABELS: Record<JobState, string> = {
  draft: "Being priced",
  quoted: "Quote sent",
  approved: "Approved, awaiting payment",
  paid: "Paid",
  covered: "Covered by warranty",
  scheduled: "Visit booked",
  done: "Done",
  cancelled: "Cancelled",
};

export function canMove(from: JobState, to: JobState): boolean {
  return NEXT[from].includes(to);
}

export function assertMove(from: JobState, to: JobState): void {
  if (!canMove(from, to)) throw conflict(`A job that is "${JOB_STATE_LABELS[from]}" can't become "${JOB_STATE_LABELS[to]}".`);
}

export const JOB_STATE_TONES: Record<JobState, "neutral" | "progress" | "waiting" | "ok" | "stopped"> = {
  draft: "neutral",
  quoted: "waiting",
  approved: "waiting",
  paid: "progress",
  covered: "progress",
  scheduled: "progress",
  done: "ok",
  cancelled: "stopped",
};
