import { z } from "zod";
import { route } from "@/lib/http/route";
import { approveJob } from "@/lib/repairs/payment";
import { jobIdParams } from "@/lib/validation/jobs";

// The owner approves the quote and is sent to its payment page: POST { quoteVersion, totalMinor } — the
// quote their page showed (409 when the studio has changed it since). lib/repairs/payment.ts approveJob.
const shownQuote = z
  .object({
    quoteVersion: z.number({ error: "Reload the page: the quote's version is missing." }).int().min(0),
    totalMinor: z.number({ error: "Reload the page: the quote's total is missing." }).int().min(0),
  })
  .optional();

export const POST = route({ roles: ["owner"], params: jobIdParams, body: shownQuote, optionalBody: true, bodyLimit: 1024 }, async ({ actor, params, body }) => {
  const { checkoutUrl, job } = await approveJob(actor.user, params.id, body);
  return { checkoutUrl, job };
});
