import { NextResponse } from "next/server";
import { requireStaff } from "@/lib/auth/guards";
import { parseJson, route } from "@/lib/http/route";
import { requireJobActor } from "@/lib/repairs/access";
import { getOwnerJob, getStudioJob } from "@/lib/repairs/jobs";
import { updateJobQuote } from "@/lib/repairs/payment";
import { jobIdParams, jobQuoteSchema } from "@/lib/validation/jobs";

export const GET = route<{ id: string }>(async (_req, { params }) => {
  const { id } = jobIdParams.parse(params);
  const actor = await requireJobActor();
  const view = actor.ctx ? getStudioJob(actor.ctx, id) : getOwnerJob(actor.owner, id);
  return NextResponse.json({ job: view.job, piece: { id: view.piece.id, title: view.piece.title }, payments: view.payments.map(({ checkoutUrl: _u, ...p }) => p) });
});

export const PATCH = route<{ id: string }>(async (req, { params }) => {
  const { id } = jobIdParams.parse(params);
  const ctx = await requireStaff();
  const input = await parseJson(req, jobQuoteSchema);
  return NextResponse.json({ job: await updateJobQuote(ctx, id, input) });
});
