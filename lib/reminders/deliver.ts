// Handing one leased reminder to SMTP and recording what came of it: steps 2 and 3 of the ledger
// protocol (pass.ts). The pass calls it for each row it leased; the staff "send again" action
// (staff.ts) leases a failed row the same way and calls it too.
import type { Db } from "@/db/client";
import { sendMailNow } from "@/lib/mail";
import { planLinesForPieceMail } from "@/lib/plans/offers";
import { composeReminder, type ReminderMail } from "./compose";
import { passStatements } from "./pass-sql";
import { MAX_ATTEMPTS, RETRY_BACKOFF_MS } from "./plan";

/** A ledger row this pass (or the staff action) holds: its id and the lease token in messageId. */
export type Lease = ReminderMail & { rowId: string; token: string };

export type SentItem = { reminderKey: string; to: string; subject: string; messageId: string; offerId?: string };
export type FailedItem = { reminderKey: string; to: string; error: string; willRetry: boolean };

/** Lease tokens are written to messageId while a row is queued: "lease:<uuid>". */
export const LEASE_PREFIX = "lease:";

/**
 * Hands one leased reminder to SMTP and records the outcome: nothing is sent when the hand-off finds
 * the row no longer held by this lease ("lost": another pass took it over).
 */
export async function deliverLease(
  db: Db,
  lease: Lease,
  nowMs: number,
): Promise<{ kind: "sent"; item: SentItem } | { kind: "failed"; item: FailedItem } | { kind: "lost" }> {
  const s = passStatements(db.$client);
  if (s.handoff.run(nowMs, nowMs, lease.rowId, lease.token).changes === 0) return { kind: "lost" };
  try {
    // A refresh offer carries the care plans that fit the piece, with the owner's own last year against each.
    const mail = composeReminder(lease.offer ? { ...lease, plans: planLinesForPieceMail(lease.piece.id, lease.owner.id, new Date(nowMs), db) } : lease);
    const { messageId } = await sendMailNow(mail);
    s.markSent.run(messageId, nowMs, nowMs, lease.rowId);
    return { kind: "sent", item: { reminderKey: lease.reminderKey, to: lease.owner.email, subject: mail.subject, messageId, offerId: lease.offer?.id } };
  } catch (e) {
    const attempts = (s.attemptsOf.get(lease.rowId) as { attempts: number } | undefined)?.attempts ?? MAX_ATTEMPTS;
    const willRetry = attempts < MAX_ATTEMPTS;
    const next = willRetry ? nowMs + RETRY_BACKOFF_MS[Math.min(attempts, RETRY_BACKOFF_MS.length) - 1]! : null;
    const error = `try ${attempts} of ${MAX_ATTEMPTS}: ${e instanceof Error ? e.message : String(e)}`.slice(0, 500);
    s.markFailed.run(error, next, nowMs, lease.rowId, lease.token);
    return { kind: "failed", item: { reminderKey: lease.reminderKey, to: lease.owner.email, error, willRetry } };
  }
}
