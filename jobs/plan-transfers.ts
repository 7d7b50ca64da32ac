// The plan transfer pass: every care plan whose change of hands was left unfinished at Stripe (an
// outage during a release) is finished (lib/plans/transfer.ts finishPlanTransfers), and every card
// refund a cancellation claimed that Stripe didn't take at the time is paid (lib/plans/refund.ts
// finishRequestedPlanRefunds), with a summary.
import { finishRequestedPlanRefunds } from "@/lib/plans/refund";
import { finishPlanTransfers } from "@/lib/plans/transfer";

export async function planTransfersJob(): Promise<string[]> {
  const lines: string[] = [];
  const r = await finishPlanTransfers();
  if (r.finished.length + r.failed.length > 0) {
    lines.push(...r.finished.map((id) => `finished plan change of hands ${id}`), `plan transfer pass: ${r.finished.length} finished, ${r.failed.length} still waiting for the payment service`);
  }
  const refunds = await finishRequestedPlanRefunds();
  if (refunds.finished.length + refunds.failed.length > 0) {
    lines.push(...refunds.finished.map((id) => `paid plan refund ${id}`), `plan refund pass: ${refunds.finished.length} paid, ${refunds.failed.length} still waiting for the payment service`);
  }
  return lines;
}
