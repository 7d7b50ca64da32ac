// The plan transfer pass: every care plan whose change of hands was left unfinished at Stripe (an
// outage during a release, or the process stopping right after the release committed: the hand-over is
// written in the release's transaction) is finished (lib/plans/transfer.ts finishPlanTransfers), and
// every card refund a cancellation claimed that Stripe didn't answer at the time is paid (lib/plans/refund.ts
// finishRequestedPlanRefunds; one Stripe refused is marked so, with words for staff, and not asked again),
// with a summary.
import { finishRequestedPlanRefunds } from "@/lib/plans/refund";
import { finishPlanTransfers } from "@/lib/plans/transfer";

export async function planTransfersJob(now: Date = new Date()): Promise<string[]> {
  const lines: string[] = [];
  const r = await finishPlanTransfers();
  if (r.finished.length + r.failed.length > 0) {
    lines.push(...r.finished.map((id) => `finished plan change of hands ${id}`), `plan transfer pass: ${r.finished.length} finished, ${r.failed.length} still waiting for the payment service`);
  }
  const refunds = await finishRequestedPlanRefunds(now);
  if (refunds.finished.length + refunds.refused.length + refunds.failed.length > 0) {
    lines.push(
      ...refunds.finished.map((id) => `paid plan refund ${id}`),
      ...refunds.refused.map((id) => `plan refund ${id} refused by the payment service: not asked again, staff see why on the plan`),
      `plan refund pass: ${refunds.finished.length} paid, ${refunds.refused.length} refused, ${refunds.failed.length} still waiting for the payment service`,
    );
  }
  return lines;
}
