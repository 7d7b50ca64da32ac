// A piece changes hands (its owner releases it, lib/owner/transfer.ts) while a repair job of theirs on it
// waits for their payment. They can no longer pay it (an owner acts on a job only while holding its piece,
// lib/repairs/owner-reach.ts), and nobody else can: the job would wait for ever. So, in the release's own
// transaction, such a job goes back to the studio ("Being priced", the state an edited quote goes back to,
// lib/repairs/states.ts) with an audit row, and the staff job page says why (HANDED_ON_WORDS); staff send
// the quote again, which reaches the piece's new owner (lib/repairs/payment.ts sendQuote), or cancel it.
// After the release has committed, the payment pages the former owner opened for these jobs are closed at
// Stripe (closeHandedOnCheckouts), so they can't take money that would only be given back.
import { and, eq } from "drizzle-orm";
import type { Tx } from "@/db/client";
import { repairJobs, type RepairJob } from "@/db/schema";
import { recordAudit } from "@/lib/audit";
import { closeOpenCheckouts } from "./checkout";
import { moveJob } from "./jobs";
import { ownerActsOnJob } from "./owner-reach";
import { AWAITING_PAYMENT } from "./states";


/** What the staff job page says on a quoted job set back because its piece changed hands (jobHandedOn). */
export const HANDED_ON_WORDS = "It changed hands before this quote was paid. Once the new owner has registered the piece, send the quote again to reach them, or cancel the job.";

/**
 * Inside the release's transaction (after the piece has lost its owner): every job of the studio's on the
 * piece that waits for the former owner's payment goes back to being priced, audited. Returns their ids,
 * for closeHandedOnCheckouts once the transaction has committed.
 */
export function jobsBackToStudio(tx: Tx, piece: { id: string; studioId: string }, formerOwnerId: string): string[] {
  const waiting = tx
    .select()
    .from(repairJobs)
    .where(and(eq(repairJobs.studioId, piece.studioId), eq(repairJobs.pieceId, piece.id), eq(repairJobs.ownerId, formerOwnerId), eq(repairJobs.state, AWAITING_PAYMENT)))
    .all();
  for (const job of waiting) {
    moveJob(tx, job, "draft");
    recordAudit(tx, {
      studioId: job.studioId,
      actorId: formerOwnerId,
      action: "job.handed_on",
      subjectType: "repair_job",
      subjectId: job.id,
      data: { reason: "the piece changed hands before the quote was paid", quoteVersion: job.quoteVersion, totalMinor: job.totalMinor },
    });
  }
  return waiting.map((j) => j.id);
}

/**
 * After the release has committed: expires at Stripe every payment page still open for these jobs. Never
 * fails the release: when Stripe can't be reached the page stays open for now, and a payment made on it
 * is not counted but refunded automatically with the reason piece_handed_on (lib/repairs/checkout.ts
 * refundReasonFor), mailed to the payer; staff editing or sending the quote again closes it as well.
 */
export async function closeHandedOnCheckouts(jobIds: readonly string[]): Promise<void> {
  for (const jobId of jobIds) {
    try {
      await closeOpenCheckouts(jobId);
    } catch (e) {
      console.error("release: closing a repair job's open payment page at Stripe failed; a payment made there is refunded automatically", e);
    }
  }
}

/** The job was set back by a hand-over and waits for staff: a sent quote being priced again, its owner no longer holding the piece. */
export function jobHandedOn(job: Pick<RepairJob, "state" | "quoteVersion" | "ownerId">, piece: { ownerId: string | null }): boolean {
  return job.state === "draft" && job.quoteVersion > 0 && !ownerActsOnJob(job, piece);
}

/**
 * What the staff job page says about a job whose owner no longer holds its piece, if anything: set back
 * by the hand-over (HANDED_ON_WORDS); a quote sent to the former owner, who can no longer approve it; or
 * work paid for or covered, whose visit the former owner no longer sees (lib/repairs/owner-reach.ts).
 */
export function handedOnWords(job: Pick<RepairJob, "state" | "quoteVersion" | "ownerId">, piece: { ownerId: string | null }, formerOwnerName: string | null): string | null {
  if (jobHandedOn(job, piece)) return HANDED_ON_WORDS;
  if (ownerActsOnJob(job, piece)) return null;
  const who = formerOwnerName ?? "The former owner";
  if (job.state === "quoted") return `It changed hands after this quote was sent, and ${who} can no longer approve it. Edit the quote and send it again once the new owner has registered the piece, or cancel the job.`;
  if (job.state === "paid" || job.state === "covered" || job.state === "scheduled")
    return `It changed hands before this work was done. ${who} no longer sees this job's visit or gets its reminders: agree with them and the new owner where and when the work is done, then book or move the visit.`;
  return null;
}

