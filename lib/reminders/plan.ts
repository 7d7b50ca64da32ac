// What one pass does with one care task, given its ledger rows: pure, so the rules are easy to test.
// The ledger protocol (see pass.ts for the full story):
//   queued   — leased by a pass; messageId holds that pass's lease token ("lease:<uuid>") and sentAt
//              is null until the hand-off to SMTP begins (then sentAt = when it began, attempts + 1).
//   sent     — accepted by the SMTP server; messageId is its Message-ID.
//   failed   — the SMTP server refused or could not be reached; retried while nextAttemptAt is set
//              (at most MAX_ATTEMPTS tries); nextAttemptAt null = no automatic retry.
//   skipped  — a later step had come by the time this one could go (no bursts of stale mail).
//   cancelled— the task's cycle moved on (care was logged, or the finish changed) before it went, or
//              the studio turned its step off while it waited for a retry.
import { localDateTime } from "@/lib/care/dates";
import type { CareTask } from "@/lib/care/schedule";
import { reminderKey } from "@/lib/care/schedule";
import { REMINDER_STEPS, type ReminderStep } from "@/lib/care/vocabulary";

export const MAX_ATTEMPTS = 3;
/**
 * Reminders go out at or after this local time of the owner unless the studio chose another hour
 * (09:00 unless the studio sets studios.reminder_send_hour in settings → reminder timing).
 */
export const DEFAULT_SEND_AFTER_MINUTES = 9 * 60;
/** A queued row untouched for this long belongs to a pass that died (or hangs); see pass.ts. */
export const STALE_QUEUED_MS = 15 * 60_000;
/** Wait before retry n (after failed try n): 15 min, then 1 h. */
export const RETRY_BACKOFF_MS = [15 * 60_000, 60 * 60_000] as const;

export type LedgerStatus = "queued" | "sent" | "failed" | "skipped" | "cancelled";

export interface LedgerRow {
  id: string;
  reminderKey: string;
  taskKey: string;
  dueOn: string;
  step: ReminderStep;
  status: LedgerStatus;
  attempts: number;
  nextAttemptAt: number | null;
  messageId: string | null;
  sentAt: number | null;
  updatedAt: number;
}

/** The owner's wall clock at the pass's instant, cached per time zone for one pass. */
export class OwnerClocks {
  private readonly cache = new Map<string, { date: string; minutes: number }>();
  constructor(readonly nowMs: number) {}
  at(timeZone: string): { date: string; minutes: number } {
    let c = this.cache.get(timeZone);
    if (!c) {
      const l = localDateTime(this.nowMs, timeZone);
      c = {
        date: `${String(l.year).padStart(4, "0")}-${String(l.month).padStart(2, "0")}-${String(l.day).padStart(2, "0")}`,
        minutes: l.hour * 60 + l.minute,
      };
      this.cache.set(timeZone, c);
    }
    return c;
  }
  /**
   * Has the send time (`sendAfterMinutes` after local midnight, e.g. the studio's hour × 60) on `date`
   * in `timeZone` come? Compared on the owner's wall clock, not as an instant: a send time that does
   * not exist that day (inside a spring-forward gap, e.g. 02:00 in New York on 14 March 2027) has come
   * from the first instant after the gap (03:00 EDT), so the reminder still goes out that day. A wall
   * time that occurs twice (clocks go back) has come from its first occurrence; the ledger row leased
   * then keeps the second one from sending again.
   */
  hasCome(date: string, timeZone: string, sendAfterMinutes: number): boolean {
    const c = this.at(timeZone);
    return date < c.date || (date === c.date && c.minutes >= sendAfterMinutes);
  }
}

/** A studio's reminder timing as the pass uses it. */
export interface SendTiming {
  /** Minutes after the owner's local midnight at or after which a step may go (hour × 60). */
  sendAfterMinutes: number;
  /** The steps the studio sends, in REMINDER_STEPS order. */
  steps: readonly ReminderStep[];
}

/**
 * The timing from the studios row's columns (reminder_send_hour, reminder_steps as stored JSON text).
 * The settings page only ever writes valid values; anything else found there falls back to the column
 * defaults (09:00, every step) rather than stopping the pass for every studio.
 */
export function timingFromColumns(sendHour: unknown, stepsJson: unknown): SendTiming {
  const hour = typeof sendHour === "number" && Number.isInteger(sendHour) && sendHour >= 0 && sendHour <= 23 ? sendHour : DEFAULT_SEND_AFTER_MINUTES / 60;
  let steps: readonly ReminderStep[] = REMINDER_STEPS;
  try {
    const parsed: unknown = typeof stepsJson === "string" ? JSON.parse(stepsJson) : stepsJson;
    if (Array.isArray(parsed)) steps = REMINDER_STEPS.filter((s) => parsed.includes(s));
  } catch {
    // not JSON: keep the default
  }
  return { sendAfterMinutes: hour * 60, steps };
}

/**
 * The task with only the steps the studio sends. Dropped steps are never sent and never recorded as
 * skipped; whatever rode on the first reminder (a refresh offer) rides on the first step left.
 * Returns the same object when every step is on.
 */
export function withEnabledSteps<T extends Pick<CareTask, "reminders">>(task: T, steps: readonly ReminderStep[]): T {
  if (task.reminders.every((r) => steps.includes(r.step))) return task;
  return { ...task, reminders: task.reminders.filter((r) => steps.includes(r.step)) };
}

export function retryable(row: LedgerRow, nowMs: number): boolean {
  return row.status === "failed" && row.attempts < MAX_ATTEMPTS && row.nextAttemptAt !== null && row.nextAttemptAt <= nowMs;
}

export function pendingRetry(row: LedgerRow): boolean {
  return row.status === "failed" && row.nextAttemptAt !== null;
}

export type TaskDecision = {
  /** The step to send now and how to lease its ledger row (a new row, or a failed one retried), if any. */
  send?: { step: ReminderStep; reminderKey: string; lease: "insert" | "retry"; row?: LedgerRow };
  /** Earlier steps to record as skipped (INSERT … DO NOTHING: a step that has a row keeps it). */
  skipNew: { step: ReminderStep; reminderKey: string }[];
  /** Earlier steps waiting for a retry: superseded by the step being sent. */
  supersede: LedgerRow[];
};

/** Index of the most recent reminder step whose send time (owner's zone) has come, or -1. */
export function currentStepIndex(
  task: Pick<CareTask, "reminders">,
  clocks: OwnerClocks,
  ownerTimeZone: string,
  sendAfterMinutes: number = DEFAULT_SEND_AFTER_MINUTES,
): number {
  for (let i = task.reminders.length - 1; i >= 0; i--) if (clocks.hasCome(task.reminders[i]!.on, ownerTimeZone, sendAfterMinutes)) return i;
  return -1;
}

/** What a chunk knows of the ledger: the full rows that are pending, and which keys exist at all. */
export interface LedgerView {
  /** A pending (queued/failed) row, or undefined. */
  pending(key: string): LedgerRow | undefined;
  /** Whether any row (of any status) has this key. */
  exists(key: string): boolean;
}

/**
 * For one task (its reminders already cut to the studio's steps, see withEnabledSteps): the most
 * recent reminder step whose send time has come in the owner's zone is sent unless its ledger row
 * exists (a failed row is retried when due); when it is first leased, the earlier steps never sent
 * are recorded as skipped.
 */
export function decideTask(
  task: Pick<CareTask, "key" | "dueOn" | "reminders">,
  rows: LedgerView,
  clocks: OwnerClocks,
  ownerTimeZone: string,
  current = currentStepIndex(task, clocks, ownerTimeZone),
): TaskDecision {
  const out: TaskDecision = { skipNew: [], supersede: [] };
  if (current < 0) return out;
  const step = task.reminders[current]!.step;
  const key = reminderKey(task, step);
  const row = rows.pending(key);
  if (!row && !rows.exists(key)) out.send = { step, reminderKey: key, lease: "insert" };
  else if (row && retryable(row, clocks.nowMs)) out.send = { step, reminderKey: key, lease: "retry", row };
  if (!out.send) return out;
  for (let i = 0; i < current; i++) {
    const s = task.reminders[i]!.step;
    const k = reminderKey(task, s);
    const r = rows.pending(k);
    if (r) {
      if (pendingRetry(r)) out.supersede.push(r);
    } else if (out.send.lease === "insert" && !rows.exists(k)) out.skipNew.push({ step: s, reminderKey: k });
  }
  return out;
}
