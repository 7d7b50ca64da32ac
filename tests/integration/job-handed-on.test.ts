// A claim (or an accepted refresh offer) whose piece changed hands afterwards opens no repair job: the
// owner who asked no longer holds the piece, so they could not approve, pay or book it (an owner acts on
// a job only while holding its piece, lib/repairs/owner-reach.ts), and the new owner never asked. Staff
// get a 409 in words that say so, by either way of opening a job, and the claim leaves the jobs page's
// "Ready to become jobs" list. Real SQLite file and SMTP sink (the release mails). All data is invented.
import { eq } from "drizzle-orm";
import { describe, expect, it } from "vitest";
import { getDb } from "@/db/client";
import { refreshOffers, repairJobs } from "@/db/schema";
import type { Quote } from "@/lib/care/quote";
import { createJobFromClaim } from "@/lib/claims/open-job";
import { getStaffClaim } from "@/lib/claims/view-claim";
import { registerPiece } from "@/lib/owner/registration";
import { releasePiece } from "@/lib/owner/transfer";
import { createJob, handedOnRefusal, jobsToCreate } from "@/lib/repairs/jobs";
import { createAcceptedClaim, createPiece, createStudio, createUser, memberContext, unique } from "../support/fixtures";

const CLAIM_WORDS =
  "This piece changed hands after the claim was filed. The owner who filed it no longer holds the piece and can't approve, pay or book a repair, so no repair job can be opened from this claim. If the piece's new owner wants the repair, they can file a claim of their own.";

async function refusal(run: () => unknown): Promise<{ status: number; message: string }> {
  try {
    await run();
  } catch (e) {
    const { status = 500, message } = e as { status?: number; message: string };
    return { status, message };
  }
  return { status: 200, message: "" };
}

async function world() {
  const studio = createStudio({ email: `${unique("studio")}@test.example`, currency: "USD", labourRateMinor: 8500 });
  const staff = await memberContext(studio, "staff");
  const owner = await createUser({ emailVerifiedAt: new Date(), name: "First Owner (invented)" });
  const { piece } = createPiece(studio, { ownerId: owner.id, title: "Walnut bench (invented)" });
  return { studio, staff, owner, piece };
}

const jobsOfClaim = (claimId: string) => getDb().select().from(repairJobs).where(eq(repairJobs.claimId, claimId)).all();

describe("a claim whose piece changed hands", () => {
  it("opens no repair job once the owner released the piece, nor after someone else registered it: 409 with the reason, by both ways", async () => {
    const { studio, staff, owner, piece } = await world();
    const claim = createAcceptedClaim(studio, piece.id, owner.id, "covered");
    expect(jobsToCreate(staff).fromClaims.map((c) => c.id)).toContain(claim.id);

    const { code } = await releasePiece(owner, piece.id, { confirm: true });
    expect(await refusal(() => createJobFromClaim(staff, claim.id))).toEqual({ status: 409, message: CLAIM_WORDS }); // POST /api/claims/[id]/job
    expect(await refusal(() => createJob(staff, "claim", claim.id))).toEqual({ status: 409, message: CLAIM_WORDS }); // POST /api/jobs, createJobAction
    expect(jobsOfClaim(claim.id)).toEqual([]);
    // The jobs page offers no button that could only fail; the claim page says why (the same words).
    expect(jobsToCreate(staff).fromClaims.map((c) => c.id)).not.toContain(claim.id);
    const view = getStaffClaim(staff, claim.id);
    expect(handedOnRefusal("claim", { ownerId: view.owner.id }, view.piece)).toBe(CLAIM_WORDS);

    // Registered by the next owner: still no job from the first owner's claim.
    const next = await createUser({ emailVerifiedAt: new Date(), name: "Next Owner (invented)" });
    await registerPiece(next, { code }, "203.0.113.91");
    expect(await refusal(() => createJobFromClaim(staff, claim.id))).toEqual({ status: 409, message: CLAIM_WORDS });
    expect(jobsOfClaim(claim.id)).toEqual([]);
    // The next owner's own claim on the piece becomes a job as usual.
    const theirs = createAcceptedClaim(studio, piece.id, next.id, "covered");
    expect(createJobFromClaim(staff, theirs.id)).toMatchObject({ claimId: theirs.id });
  });

  it("an owner who still holds the piece gets the job as before, and a second press is the usual refusal", async () => {
    const { studio, staff, owner, piece } = await world();
    const claim = createAcceptedClaim(studio, piece.id, owner.id, "partly_covered", 30);
    expect(handedOnRefusal("claim", claim, piece)).toBeNull();
    const job = createJob(staff, "claim", claim.id);
    expect(job).toMatchObject({ claimId: claim.id, ownerId: owner.id, coveredPct: 30 });
    // A second press is the usual "already has a job", not the hand-over words.
    expect(await refusal(() => createJob(staff, "claim", claim.id))).toEqual({ status: 409, message: "This claim already has a repair job." });
  });

  it("an accepted refresh offer of a piece since released opens no job either", async () => {
    const { studio, staff, owner, piece } = await world();
    const offer = getDb()
      .insert(refreshOffers)
      .values({ studioId: studio.id, pieceId: piece.id, userId: owner.id, taskKey: `${piece.id}:reoil:top`, dueOn: "2027-03-01", priceMinor: 12_000, currency: "USD", quote: { lines: [], subtotalMinor: 12_000, taxMinor: 0, totalMinor: 12_000, currency: "USD" } as unknown as Quote, status: "accepted", acceptedAt: new Date() })
      .returning()
      .get();
    expect(jobsToCreate(staff).fromOffers.map((o) => o.id)).toContain(offer.id);
    await releasePiece(owner, piece.id, { confirm: true });
    expect(await refusal(() => createJob(staff, "refresh_offer", offer.id))).toEqual({
      status: 409,
      message: "This piece changed hands after the refresh offer was accepted. The owner who accepted it no longer holds the piece and can't approve, pay or book the visit, so no job can be opened from this offer.",
    });
    expect(jobsToCreate(staff).fromOffers.map((o) => o.id)).not.toContain(offer.id);
  });
});
