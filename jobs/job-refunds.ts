// The job refund pass: every refund staff gave on a repair job that the payment service left unanswered,
// and that nobody finished within a few minutes, is asked again with the same key and finished once
// (lib/repairs/refunds.ts finishPendingJobRefunds), with a summary.
import { finishPendingJobRefunds } from "@/lib/repairs/refunds";

export async function jobRefundsJob(now: Date = new Date()): Promise<string[]> {
  const r = await finishPendingJobRefunds(now);
  if (r.finished.length + r.refused.length + r.waiting.length === 0) return [];
  return [
    ...r.finished.map((id) => `finished job refund ${id}`),
    ...r.refused.map((id) => `job refund ${id} refused by the payment service: removed, nothing given back`),
    `job refund pass: ${r.finished.length} finished, ${r.refused.length} refused, ${r.waiting.length} still waiting for the payment service`,
  ];
}
