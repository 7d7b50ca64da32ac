import { z } from "zod";
import { route } from "@/lib/http/route";
import { approveJob } from "@/lib/repairs/payment";
import { jobIdParams } from "@/lib/validation/jobs";

// The owner approves the quote and is sent to its payment page: POST { quoteVersion, totalMinor } — the
// quote their page showed (409 when the studio has changed it since). The body is required: without it
// the stale-quote check in lib/repairs/payment.ts approveJob would have nothing to compare, so an empty
// body (it reaches the schema as undefined) is a 400 that says to reload the page.
const RELOAD = "Reload the page and approve again: the quote you saw wasn't sent with your approval, so nothing was approved.";
const shownQuote = z.object(
  {
    quoteVersion: z.number({ error: "Reload the page: the quote's version is missing." }).int().min(0),
    totalMinor: z.number({ error: "Reload the page: the quote's total is missing." }).int().min(0),
  },
  { error: RELOAD },
);

export const POST = route({ roles: ["owner"], params: jobIdParams, body: shownQuote, optionalBody: true, bodyLimit: 1024 }, async ({ actor, params, body }) => {
  const { checkoutUrl, job } = await approveJob(actor.user, params.id, body);
  return { checkoutUrl, job };
});
