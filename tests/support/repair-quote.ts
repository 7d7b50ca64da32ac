// A repair job quoted to its owner, for the payment tests: the studio's staff quote one re-oiling (one
// coat, no travel, a 125 ml product at 19.00) on a chargeable claim of the owner's piece. Invented.
import type { Studio } from "@/db/schema";
import { createJob, getStudioJob } from "@/lib/repairs/jobs";
import { sendQuote, updateJobQuote } from "@/lib/repairs/payment";
import { createAcceptedClaim, createPiece, createProduct, createUser, memberContext } from "./fixtures";

/** A new owner's piece of `studio` with a chargeable repair quoted and sent to them; the job as staff read it. */
export async function quotedRepairJob(studio: Studio) {
  const staff = await memberContext(studio, "staff");
  const owner = await createUser();
  const { piece } = createPiece(studio, { ownerId: owner.id });
  const product = createProduct(studio, { containers: [{ ml: 125, priceMinor: 1900 }] });
  const claim = createAcceptedClaim(studio, piece.id, owner.id, "chargeable", 0);
  const job = createJob(staff, "claim", claim.id);
  await updateJobQuote(staff, job.id, { title: "Refresh the top", tasks: ["reoil"], productIds: [product.id], coats: 1, travel: false, coveredPct: job.coveredPct, notes: "" });
  await sendQuote(staff, job.id);
  return { staff, owner, job: getStudioJob(staff, job.id).job };
}
