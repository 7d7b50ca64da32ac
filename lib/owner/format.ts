// A care task's state as the owner's pages say it. (Lengths, money and dates are written by lib/format.)

/**
 * A care task's state in owner words, named by what to do (the engine's status says where the date
 * falls; "done" only means the last cycle was started by care, which says nothing about what is next):
 * - now: the due date has passed;
 * - soon: inside the reminder window (the 14 days up to the due date);
 * - plan: due within the next two months;
 * - later: nothing to do yet.
 */
export type OwnerTaskState = "now" | "soon" | "plan" | "later";

export const OWNER_TASK_STATE_WORDS: Record<OwnerTaskState, string> = {
  now: "Overdue: do it now",
  soon: "Due: do it soon",
  plan: "Coming up: plan for it",
  later: "Nothing to do yet",
};

/** Days ahead within which a task is worth planning for. */
export const PLAN_AHEAD_DAYS = 60;

export function ownerTaskState(status: "upcoming" | "due" | "overdue" | "done", daysUntilDue: number): OwnerTaskState {
  if (status === "overdue" || daysUntilDue < 0) return "now";
  if (status === "due") return "soon";
  return daysUntilDue <= PLAN_AHEAD_DAYS ? "plan" : "later";
}
