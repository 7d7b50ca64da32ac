import { route } from "@/lib/http/route";
import { finishJobRefund } from "@/lib/repairs/refunds";
import { jobRefundParams } from "@/lib/validation/jobs";

// Staff finish a refund left "being given back" because the payment service did not answer: POST, no
// body. Stripe is asked again with the same idempotency key, so the money goes back at most once.
// lib/repairs/refunds.ts.
export const POST = route({ roles: ["admin", "staff"], params: jobRefundParams }, async ({ actor, params }) => {
  const { job, refund } = await finishJobRefund(actor, params.id, params.refundId);
  return { job: { id: job.id, version: job.version, state: job.state }, refund: { id: refund.id, amountMinor: refund.amountMinor, currency: refund.currency, refunded: refund.refundedAt !== null } };
});
