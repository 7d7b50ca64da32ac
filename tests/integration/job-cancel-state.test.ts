// Cancelling a job its state does not allow (done, already cancelled) is refused before anything is
// asked of the payment service: no refund for a job that stays done. Found by the authorization matrix
// (tests/e2e/authz-matrix.spec.ts), where staff cancelling the demo's done job reached the refund.
import { eq } from "drizzle-orm";
import { describe, expect, it } from "vitest";
import { getDb } from "@/db/client";
import { payments, repairJobs } from "@/db/schema";
import { createAcceptedClaim, createPiece, createStudio, createUser, memberContext } from "../support/fixtures";
import { createJob } from "@/lib/repairs/jobs";
import { cancelJob } from "@/lib/repairs/payment";

async function paidJobIn(state: "done" | "cancelled") {
  const studio = createStudio();
  const staff = await memberContext(studio, "staff");
  const owner = await createUser();
  const { piece } = createPiece(studio, { ownerId: owner.id });
  const claim = createAcceptedClaim(studio, piece.id, owner.id, "chargeable");
  const job = createJob(staff, "claim", claim.id);
  const db = getDb();
  db.update(repairJobs).set({ state, totalMinor: 12_000 }).where(eq(repairJobs.id, job.id)).run();
  // A captured payment whose intent the payment service would refund if it were asked.
  db.insert(payments)
    .values({ studioId: studio.id, jobId: job.id, quoteVersion: 1, checkoutSessionId: `cs_test_${job.id}`, amountMinor: 12_000, currency: "USD", status: "paid", paymentIntentId: `pi_test_${job.id}`, paidAt: new Date() })
    .run();
  return { staff, job };
}

describe("cancelling a job in a state that can't be cancelled", () => {
  it.each(["done", "cancelled"] as const)("a %s job: 409 from the state machine, the payment stays paid", async (state) => {
    const { staff, job } = await paidJobIn(state);
    const label = state === "done" ? "Done" : "Cancelled";
    await expect(cancelJob(staff, job.id)).rejects.toMatchObject({ status: 409, message: `A job that is "${label}" can't become "Cancelled".` });
    const payment = getDb().select().from(payments).where(eq(payments.jobId, job.id)).get()!;
    expect(payment.status).toBe("paid");
    expect(payment.refundedMinor).toBe(0);
    expect(getDb().select().from(repairJobs).where(eq(repairJobs.id, job.id)).get()!.state).toBe(state);
  });
});
