import { route } from "@/lib/http/route";
import { cancelJob } from "@/lib/repairs/payment";
import { jobIdParams } from "@/lib/validation/jobs";

/** Staff cancel the studio's jobs; an owner their own (a technician acts as an owner here). */
export const POST = route({ roles: ["admin", "staff", "owner"], params: jobIdParams }, async ({ actor, params }) => ({ job: await cancelJob(actor, params.id) }));
