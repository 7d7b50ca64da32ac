"use server";

import { redirect } from "next/navigation";
import { action } from "@/lib/http/action";
import { createJob } from "@/lib/repairs/jobs";
import { createJobSchema } from "@/lib/validation/jobs";

export const createJobAction = action({ roles: ["admin", "staff"], schema: createJobSchema }, async ({ from, id }, actor) => {
  const job = createJob(actor, from, id);
  redirect(`/studio/jobs/${job.id}`);
});
