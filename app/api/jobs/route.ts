import { NextResponse } from "next/server";
import { requireStaff } from "@/lib/auth/guards";
import { parseJson, parseQuery, route } from "@/lib/http/route";
import { requireJobActor } from "@/lib/repairs/access";
import { createJob, listOwnerJobs, listStudioJobs } from "@/lib/repairs/jobs";
import { createJobSchema, jobListQuerySchema } from "@/lib/validation/jobs";

export const GET = route(async (req) => {
  const filter = parseQuery(req, jobListQuerySchema);
  const actor = await requireJobActor();
  const jobs = actor.ctx ? listStudioJobs(actor.ctx, filter) : listOwnerJobs(actor.owner, filter);
  return NextResponse.json({ jobs });
});

export const POST = route(async (req) => {
  const ctx = await requireStaff();
  const { from, id } = await parseJson(req, createJobSchema);
  return NextResponse.json({ job: createJob(ctx, from, id) }, { status: 201 });
});
