// After a hand-over the former owner reads their claims as history but changes nothing on them, sees
// no visit of the repair (a paid repair job stays theirs to read, as on their job pages), and a link
// from a mail they were sent while they held the piece (a refresh offer) no longer accepts.
// All data is invented.
import { and, eq } from "drizzle-orm";
import { describe, expect, it } from "vitest";
import { getDb } from "@/db/client";
import { files, payments, refreshOffers, repairJobs } from "@/db/schema";
import { createJobFromClaim } from "@/lib/claims/open-job";
import { bookVisit } from "@/lib/visits/book";
import { listJobSlots } from "@/lib/visits/slots";
import { addClaimPhoto, removeClaimPhoto } from "@/lib/claims/photos";
import { postClaimMessage } from "@/lib/claims/reply";
import { transitionClaim } from "@/lib/claims/transition";
import { getOwnerClaim, getStaffClaim } from "@/lib/claims/view-claim";
import { registerPiece } from "@/lib/owner/registration";
import { releasePiece } from "@/lib/owner/transfer";
import { acceptOfferByToken, getOfferByToken } from "@/lib/reminders/offers";
import { offerToken } from "@/lib/reminders/tokens";
import { createAcceptedClaim, createUser } from "../support/fixtures";
import { claimWorld, fileClaim, offerFor, photoJpeg } from "./claims-helpers";
import { staffActor, visitWorld } from "./visits-helpers";

async function statusOf(p: Promise<unknown> | (() => unknown)): Promise<number> {
  try {
    await (typeof p === "function" ? p() : p);
    return 200;
  } catch (e) {
    return (e as { status?: number }).status ?? 500;
  }
}

const photosOf = (claimId: string) => getDb().select({ id: files.id }).from(files).where(and(eq(files.claimId, claimId), eq(files.purpose, "claim_photo"))).all();

describe("a former owner after the hand-over", () => {
  it("adds and removes no photos on their open claim (403, nothing stored or deleted), and reads it still", async () => {
    const w = await claimWorld();
    const jpeg = await photoJpeg();
    const claim = await fileClaim(w.ownerV, w.piece.id);
    const kept = await addClaimPhoto(w.ownerV, claim.id, async () => jpeg);
    expect(getOwnerClaim(w.owner, claim.id).mayWrite).toBe(true);
    await releasePiece({ ...w.owner }, w.piece.id, { confirm: true });
    // The claim's page reads this and offers no photo picker or message box (they answered 403 at every try).
    expect(getOwnerClaim(w.owner, claim.id).mayWrite).toBe(false);

    let read = false;
    expect(await statusOf(addClaimPhoto(w.ownerV, claim.id, async () => ((read = true), jpeg)))).toBe(403);
    expect(read).toBe(false); // refused before the upload is read
    expect(await statusOf(removeClaimPhoto(w.ownerV, claim.id, kept.id))).toBe(403);
    expect(await statusOf(postClaimMessage(w.ownerV, claim.id, { body: "Still mine? (invented)" }))).toBe(403);
    expect(photosOf(claim.id).map((f) => f.id)).toEqual([kept.id]);
    // History: the claim and its photo are still theirs to read.
    expect(getOwnerClaim(w.owner, claim.id).photos.map((p) => p.id)).toEqual([kept.id]);
  });

  it("is not asked for more by the studio (409, the claim stays in review); a plain message from the studio still goes, and staff are told they can't reply", async () => {
    const w = await claimWorld();
    const claim = await fileClaim(w.ownerV, w.piece.id);
    transitionClaim(w.staffCtx, claim.id, { to: "in_review" });
    expect(getStaffClaim(w.staffCtx, claim.id).ownerMayAnswer).toBe(true);
    await releasePiece({ ...w.owner }, w.piece.id, { confirm: true });

    expect(getStaffClaim(w.staffCtx, claim.id).ownerMayAnswer).toBe(false);
    expect(await statusOf(postClaimMessage(w.staff, claim.id, { body: "Could you measure the gap? (invented)", requestInfo: true }))).toBe(409);
    expect(getStaffClaim(w.staffCtx, claim.id).claim.state).toBe("in_review");
    const sent = await postClaimMessage(w.staff, claim.id, { body: "We are closing this as the table has a new home. (invented)" });
    expect(sent.state).toBe("in_review");
  });

  it("accepts no refresh offer from a mail sent before the hand-over; the new owner's relinked offer is theirs", async () => {
    const w = await claimWorld();
    const offer = offerFor(w.studio.id, w.piece.id, w.owner.id);
    const token = offerToken(offer.id);
    expect(getOfferByToken(token).status).toBe("offered");

    const { code } = await releasePiece({ ...w.owner }, w.piece.id, { confirm: true });
    // The link now reads as no longer open, and accepting it records nothing.
    expect(getOfferByToken(token).status).toBe("expired");
    expect(await statusOf(() => acceptOfferByToken(token))).toBe(409);
    expect(getDb().select().from(refreshOffers).where(eq(refreshOffers.id, offer.id)).get()!.status).toBe("offered");

    // Registered by someone else: still closed to the former owner's link.
    const next = await createUser({ emailVerifiedAt: new Date(), name: "Next Owner (invented)" });
    await registerPiece(next, { code }, "203.0.113.31");
    expect(await statusOf(() => acceptOfferByToken(token))).toBe(409);

    // An offer the reminder pass hands to the new owner (user_id moved to them) accepts as before.
    getDb().update(refreshOffers).set({ userId: next.id }).where(eq(refreshOffers.id, offer.id)).run();
    expect(acceptOfferByToken(token).status).toBe("accepted");
  });

  it("reads no visit time of the claim's repair; the repair itself only if they paid for it", async () => {
    const NOW = Date.parse("2027-05-03T12:00:00Z"); // a Monday
    const w = await visitWorld();
    const claim = createAcceptedClaim(w.studio, w.piece.id, w.owner.id, "chargeable");
    const { id: jobId } = createJobFromClaim(w.staff, claim.id);
    // Quote, approval and payment stood in for (their own tests are the repair job tests): the job is paid.
    getDb().update(repairJobs).set({ state: "paid", quoteVersion: 1 }).where(eq(repairJobs.id, jobId)).run();
    const slot = listJobSlots(staffActor(w.staff), jobId, { from: "2027-05-04T12:00:00Z", to: "2027-05-07T00:00:00Z" }, NOW).slots[0]!;
    await bookVisit(staffActor(w.staff), { jobId, technicianId: slot.technicianId, start: slot.start }, NOW);
    const ownerView = () => getOwnerClaim(w.owner, claim.id);
    expect(ownerView().repair).toMatchObject({ jobId, stage: expect.stringMatching(/^Repair visit booked: .*2027/) });

    await releasePiece({ ...w.owner }, w.piece.id, { confirm: true });
    // Not paid (the state was set by hand, no payment): nothing of the repair is theirs any more.
    expect(ownerView().repair).toBeNull();
    expect(getOwnerClaim(w.owner, claim.id).claim.jobId).toBeNull();
    // Paid: the job is their history; the visit (now at the next owner's) is not.
    getDb().insert(payments).values({ studioId: w.studio.id, jobId, quoteVersion: 1, checkoutSessionId: `cs_test_former_${jobId}`, amountMinor: 9_000, currency: "USD", status: "paid", paidAt: new Date() }).run();
    expect(ownerView().repair).toEqual({ jobId, state: "scheduled", stage: "Repair visit booked." });
  });
});
