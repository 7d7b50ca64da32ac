import { route } from "@/lib/http/route";
import { approveJob } from "@/lib/repairs/payment";
import { jobIdParams } from "@/lib/validation/jobs";

export const POST = route({ roles: ["owner"], params: jobIdParams }, async ({ actor, params }) => {
  const { checkoutUrl, job } = await approveJob(actor.user, params.id);
  return { checkoutUrl, job };
});
