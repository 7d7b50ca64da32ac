// The plan transfer pass: every care plan whose change of hands was left unfinished at Stripe (an
// outage during a release) is finished (lib/plans/transfer.ts finishPlanTransfers), with a summary.
import { finishPlanTransfers } from "@/lib/plans/transfer";

export async function planTransfersJob(): Promise<string[]> {
  const r = await finishPlanTransfers();
  if (r.finished.length + r.failed.length === 0) return [];
  return [...r.finished.map((id) => `finished plan change of hands ${id}`), `plan transfer pass: ${r.finished.length} finished, ${r.failed.length} still waiting for the payment service`];
}
