import { NextResponse } from "next/server";
import { requireStaff } from "@/lib/auth/guards";
import { parseJson, route } from "@/lib/http/route";
import { requireJobActor } from "@/lib/repairs/access";
import { jobApiMoney } from "@/lib/repairs/figures";
import { getOwnerJob, getStudioJob, type JobView } from "@/lib/repairs/jobs";
import { updateJobQuote } from "@/lib/repairs/payment";
import { jobIdParams, jobQuoteSchema } from "@/lib/validation/jobs";

/** The job with its claim, its lines and totals in minor units — the figures its checkout charges. */
function jobAnswer(job: JobView["job"]) {
  const { lines: _l, proposedLines: _p, ...rest } = job;
  return { ...rest, claimId: job.claimId, ...jobApiMoney(job) };
}

export const GET = route<{ id: string }>(async (_req, { params }) => {
  const { id } = jobIdParams.parse(params);
  const actor = await requireJobActor();
  const view = actor.ctx ? getStudioJob(actor.ctx, id) : getOwnerJob(actor.owner, id);
  return NextResponse.json({ job: jobAnswer(view.job), piece: { id: view.piece.id, title: view.piece.title }, payments: view.payments.map(({ checkoutUrl: _u, ...p }) => p) });
});

export const PATCH = route<{ id: string }>(async (req, { params }) => {
  const { id } = jobIdParams.parse(params);
  const ctx = await requireStaff();
  const input = await parseJson(req, jobQuoteSchema);
  const job = await updateJobQuote(ctx, id, input);
  return NextResponse.json({ job: jobAnswer(job) });
});
