import { route } from "@/lib/http/route";
import { createJob, listOwnerJobs, listStudioJobs } from "@/lib/repairs/jobs";
import { createJobSchema, jobListQuerySchema } from "@/lib/validation/jobs";

/** Staff list the studio's jobs; an owner their own (a technician acts as an owner here). */
export const GET = route({ roles: ["admin", "staff", "owner"], query: jobListQuerySchema }, ({ actor, query }) => ({
  jobs: actor.role === "owner" ? listOwnerJobs(actor.user, query) : listStudioJobs(actor, query),
}));

export const POST = route({ roles: ["admin", "staff"], body: createJobSchema, status: 201 }, ({ actor, body }) => ({ job: createJob(actor, body.from, body.id) }));
