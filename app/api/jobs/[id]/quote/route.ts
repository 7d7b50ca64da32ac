import { route } from "@/lib/http/route";
import { sendQuote } from "@/lib/repairs/payment";
import { jobIdParams } from "@/lib/validation/jobs";

export const POST = route({ roles: ["admin", "staff"], params: jobIdParams }, async ({ actor, params }) => ({ job: await sendQuote(actor, params.id) }));
