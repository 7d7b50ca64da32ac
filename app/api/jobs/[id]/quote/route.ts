import { NextResponse } from "next/server";
import { requireStaff } from "@/lib/auth/guards";
import { route } from "@/lib/http/route";
import { sendQuote } from "@/lib/repairs/payment";
import { jobIdParams } from "@/lib/validation/jobs";

export const POST = route<{ id: string }>(async (_req, { params }) => {
  const { id } = jobIdParams.parse(params);
  return NextResponse.json({ job: await sendQuote(await requireStaff(), id) });
});
