// A repair job quoted to its owner, for the payment tests: the studio's staff quote one re-oiling (one
// coat, no travel, a 125 ml product at 19.00) on a chargeable claim of the owner's piece. Invented.
import { getDb } from "@/db/client";
import { payments, type RepairJob, type Studio } from "@/db/schema";
import { getStripe } from "@/lib/payments/stripe";
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

/**
 * A second Checkout Session for the job, opened through the SDK with the metadata and payments row an
 * approval writes: what a checkout opened in the instant a quote changed (or on a second device at
 * once) leaves behind, so that two completed payments can reach the app.
 */
export async function extraCheckout(job: RepairJob, quoteVersion: number, amountMinor: number) {
  const session = await getStripe().checkout.sessions.create({
    mode: "payment",
    client_reference_id: job.id,
    metadata: { jobId: job.id, studioId: job.studioId, quoteVersion: String(quoteVersion) },
    line_items: [{ quantity: 1, price_data: { currency: job.currency.toLowerCase(), unit_amount: amountMinor, product_data: { name: job.title } } }],
    success_url: `http://localhost:3999/jobs/${job.id}?checkout=success&session_id={CHECKOUT_SESSION_ID}`,
    cancel_url: `http://localhost:3999/jobs/${job.id}?checkout=cancelled`,
  });
  getDb().insert(payments).values({ studioId: job.studioId, jobId: job.id, quoteVersion, checkoutSessionId: session.id, checkoutUrl: session.url, amountMinor, currency: job.currency }).run();
  return session;
}
