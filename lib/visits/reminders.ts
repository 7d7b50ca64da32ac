// The 24 h visit reminder pass. A ledger row (visit, kind, SEQUENCE) is claimed with a unique insert
// before the message goes out, so each visit gets one reminder per version of its time, even when two
// passes run at once. A move raises SEQUENCE, so the new time gets its own reminder. No server-only
// import: the scheduler (jobs/visit-reminders.ts) runs it under tsx.
import { and, eq, gt, lte, sql } from "drizzle-orm";
import { getDb } from "@/db/client";
import { visitMailSends, visits } from "@/db/schema";
import { loadVisitMailView, sendVisitReminder } from "./mail";

export const REMINDER_LEAD_MS = 24 * 3_600_000;
const MAX_ATTEMPTS = 3;
/** A claim older than this with no outcome belongs to a pass that died; it may be claimed again. */
const STALE_CLAIM_MS = 15 * 60_000;

export type VisitReminderReport = {
  now: string;
  sent: { visitId: string; to: string; sequence: number }[];
  skipped: number;
  failed: { visitId: string; error: string }[];
  /** The signal stopped the pass before every due visit was looked at (the next pass does the rest). */
  stopped: boolean;
};

function claim(visit: { id: string; studioId: string; sequence: number }, now: number): boolean {
  const db = getDb();
  const inserted = db
    .insert(visitMailSends)
    .values({ studioId: visit.studioId, visitId: visit.id, kind: "reminder_24h", sequence: visit.sequence, status: "queued", attempts: 1, claimedAt: new Date(now) })
    .onConflictDoNothing()
    .run();
  if (inserted.changes === 1) return true;
  // Retry a failed send, or take over a claim a dead pass left behind — one taker, by compare-and-set.
  const retaken = db
    .update(visitMailSends)
    .set({ status: "queued", attempts: sql`${visitMailSends.attempts} + 1`, claimedAt: new Date(now) })
    .where(
      and(
        eq(visitMailSends.visitId, visit.id),
        eq(visitMailSends.kind, "reminder_24h"),
        eq(visitMailSends.sequence, visit.sequence),
        sql`${visitMailSends.attempts} < ${MAX_ATTEMPTS}`,
        sql`(${visitMailSends.status} = 'failed' OR (${visitMailSends.status} = 'queued' AND ${visitMailSends.claimedAt} < ${now - STALE_CLAIM_MS}))`,
      ),
    )
    .run();
  return retaken.changes === 1;
}

function settle(visitId: string, sequence: number, set: Partial<typeof visitMailSends.$inferInsert>) {
  getDb()
    .update(visitMailSends)
    .set(set)
    .where(and(eq(visitMailSends.visitId, visitId), eq(visitMailSends.kind, "reminder_24h"), eq(visitMailSends.sequence, sequence)))
    .run();
}

/**
 * Sends the reminder for every booked visit starting within the next 24 h (as of `now`). An aborted
 * `signal` stops it before the next visit is claimed; the message in hand is finished and settled, so
 * no claim is left queued.
 */
export async function runVisitReminderPass({ now = new Date(), signal }: { now?: Date; signal?: AbortSignal } = {}): Promise<VisitReminderReport> {
  const t = now.getTime();
  const due = getDb()
    .select({ id: visits.id, studioId: visits.studioId, sequence: visits.sequence, startAt: visits.startAt, lastInviteAt: visits.lastInviteAt })
    .from(visits)
    .where(and(eq(visits.state, "booked"), gt(visits.startAt, now), lte(visits.startAt, new Date(t + REMINDER_LEAD_MS))))
    .all();
  const report: VisitReminderReport = { now: now.toISOString(), sent: [], skipped: 0, failed: [], stopped: false };
  for (const v of due) {
    if (signal?.aborted) {
      report.stopped = true;
      break;
    }
    if (!claim(v, t)) {
      report.skipped++;
      continue;
    }
    const view = loadVisitMailView(v.id);
    // No owner to write to, or the invite for this time went out inside the reminder window already.
    // Nor for a visit that has started (or passed) by now: a reminder is for a visit still to come.
    if (
      !view?.owner ||
      (v.lastInviteAt && v.lastInviteAt.getTime() > v.startAt.getTime() - REMINDER_LEAD_MS) ||
      view.visit.sequence !== v.sequence ||
      view.visit.state !== "booked" ||
      view.visit.startAt.getTime() <= t
    ) {
      settle(v.id, v.sequence, { status: "skipped" });
      report.skipped++;
      continue;
    }
    try {
      const { messageId } = await sendVisitReminder(view, t);
      settle(v.id, v.sequence, { status: "sent", sentAt: now, messageId });
      report.sent.push({ visitId: v.id, to: view.owner.email, sequence: v.sequence });
    } catch (e) {
      const error = e instanceof Error ? e.message : String(e);
      settle(v.id, v.sequence, { status: "failed", lastError: error.slice(0, 500) });
      report.failed.push({ visitId: v.id, error });
    }
  }
  return report;
}
