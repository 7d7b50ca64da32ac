import { NextResponse } from "next/server";
import { requireUser } from "@/lib/auth/guards";
import { route } from "@/lib/http/route";
import { approveJob } from "@/lib/repairs/payment";
import { jobIdParams } from "@/lib/validation/jobs";

export const POST = route<{ id: string }>(async (_req, { params }) => {
  const { id } = jobIdParams.parse(params);
  const { checkoutUrl, job } = await approveJob(await requireUser(), id);
  return NextResponse.json({ checkoutUrl, job });
});
