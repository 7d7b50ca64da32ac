// The stalled hand-over mailing pass: a bulk hand-over mailing (lib/pieces/handover-batch.ts) goes out
// after the request that wrote it has answered; when the server stops mid-way, the rest would wait
// until someone next opened its progress. This pass, every few minutes, finishes every mailing nobody
// has worked for STALLED_MAILING_MS (running, or still queued). It takes each mailing with the same
// conditional update a runner uses (a lease renewed after every piece), so two passes, or a pass and
// a live runner, never work one mailing at once; and each piece goes out at most once across every
// mailing (the piece's hand-over row is written, in one transaction with the check that it was never
// sent, before the mail leaves), so no buyer gets the hand-over twice.
import { and, asc, eq, lt, or } from "drizzle-orm";
import { getDb } from "@/db/client";
import { handoverBatches } from "@/db/schema";
import { runHandoverBatch } from "@/lib/pieces/handover-batch";

/** A mailing untouched for this long is stalled (well past STALE_BATCH_MS, so a slow runner keeps its own). */
export const STALLED_MAILING_MS = 5 * 60_000;

/** Mailings taken up and finished, and one stopped part-way by the signal (the next pass goes on with it). */
export type HandoverMailingsResult = { resumed: string[]; stopped: string[] };

/** One pass at `now`: finishes each stalled mailing in turn (oldest first); on `signal` it stops after the mail in hand. */
export async function handoverMailingsJob(now = new Date(), signal?: AbortSignal): Promise<HandoverMailingsResult> {
  const before = new Date(now.getTime() - STALLED_MAILING_MS);
  const stalled = getDb()
    .select({ id: handoverBatches.id })
    .from(handoverBatches)
    .where(or(and(eq(handoverBatches.state, "running"), lt(handoverBatches.updatedAt, before)), and(eq(handoverBatches.state, "queued"), lt(handoverBatches.createdAt, before))))
    .orderBy(asc(handoverBatches.createdAt))
    .all();
  const out: HandoverMailingsResult = { resumed: [], stopped: [] };
  for (const { id } of stalled) {
    if (signal?.aborted) break;
    const outcome = await runHandoverBatch(id, { signal });
    if (outcome === "finished") out.resumed.push(id);
    if (outcome === "stopped") out.stopped.push(id);
  }
  return out;
}

/** The pass's log lines. */
export function describeHandoverMailings(r: HandoverMailingsResult): string[] {
  return [...r.resumed.map((id) => `hand-over mailing ${id}: taken up again and finished`), ...r.stopped.map((id) => `hand-over mailing ${id}: stopped after the mail in hand; the next pass goes on with it`)];
}
