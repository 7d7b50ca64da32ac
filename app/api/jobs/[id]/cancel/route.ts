import { NextResponse } from "next/server";
import { route } from "@/lib/http/route";
import { requireJobActor } from "@/lib/repairs/access";
import { cancelJob } from "@/lib/repairs/payment";
import { jobIdParams } from "@/lib/validation/jobs";

export const POST = route<{ id: string }>(async (_req, { params }) => {
  const { id } = jobIdParams.parse(params);
  return NextResponse.json({ job: await cancelJob(await requireJobActor(), id) });
});
