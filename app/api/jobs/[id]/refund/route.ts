import { route } from "@/lib/http/route";
import { jobRefundSchema, refundJob } from "@/lib/repairs/refunds";
import { jobIdParams } from "@/lib/validation/jobs";

// Staff give back all or part of a paid job's payment; the job stays as it is: POST { version,
// refundableMinor (what the page showed), amountMinor, reason (the owner reads it) }; 409 when the
// job or what can be given back has changed since. lib/repairs/refunds.ts.
export const POST = route({ roles: ["admin", "staff"], params: jobIdParams, body: jobRefundSchema, bodyLimit: 2048 }, async ({ actor, params, body }) => {
  const { job, refund } = await refundJob(actor, params.id, body);
  return { job: { id: job.id, version: job.version, state: job.state }, refund: { id: refund.id, amountMinor: refund.amountMinor, currency: refund.currency } };
});
