import { route } from "@/lib/http/route";
import { jobApiMoney } from "@/lib/repairs/figures";
import { getOwnerJob, getStudioJob, type JobView } from "@/lib/repairs/jobs";
import { updateJobQuote } from "@/lib/repairs/payment";
import { jobIdParams, jobQuoteSchema } from "@/lib/validation/jobs";

/** The job with its claim, its lines and totals in minor units — the figures its checkout charges. */
function jobAnswer(job: JobView["job"]) {
  const { lines: _l, proposedLines: _p, ...rest } = job;
  return { ...rest, claimId: job.claimId, ...jobApiMoney(job) };
}

/** Staff read the studio's jobs; an owner their own (a technician acts as an owner here). */
export const GET = route({ roles: ["admin", "staff", "owner"], params: jobIdParams }, ({ actor, params }) => {
  const view = actor.role === "owner" ? getOwnerJob(actor.user, params.id) : getStudioJob(actor, params.id);
  return { job: jobAnswer(view.job), piece: { id: view.piece.id, title: view.piece.title }, payments: view.payments.map(({ checkoutUrl: _u, ...p }) => p) };
});

export const PATCH = route({ roles: ["admin", "staff"], params: jobIdParams, body: jobQuoteSchema }, async ({ actor, params, body }) => ({
  job: jobAnswer(await updateJobQuote(actor, params.id, body)),
}));
