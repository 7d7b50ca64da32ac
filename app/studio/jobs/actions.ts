"use server";

import { redirect } from "next/navigation";
import { requireStaff } from "@/lib/auth/guards";
import { createJob } from "@/lib/repairs/jobs";
import { validatedAction } from "@/lib/validation/action";
import { createJobSchema } from "@/lib/validation/jobs";

export const createJobAction = validatedAction(createJobSchema, async ({ from, id }) => {
  const job = createJob(await requireStaff(), from, id);
  redirect(`/studio/jobs/${job.id}`);
});
