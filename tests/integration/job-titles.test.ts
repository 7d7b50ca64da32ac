// A new repair job's title names the work, not the piece: every page, mail and receipt shows a job beside
// its piece, and "Repair: <piece>" read "Repair: Cherry writing desk · Cherry writing desk" there.
import { describe, expect, it } from "vitest";
import { getDb } from "@/db/client";
import { refreshOffers } from "@/db/schema";
import type { Quote } from "@/lib/care/quote";
import { createJob } from "@/lib/repairs/jobs";
import { createAcceptedClaim, createPiece, createStudio, createUser, memberContext } from "../support/fixtures";

describe("a new job's title", () => {
  it("from a claim: the kind of damage (the fixture's claim is finish wear)", async () => {
    const studio = createStudio();
    const staff = await memberContext(studio, "staff");
    const owner = await createUser();
    const { piece } = createPiece(studio, { ownerId: owner.id });
    const claim = createAcceptedClaim(studio, piece.id, owner.id, "chargeable");
    const job = createJob(staff, "claim", claim.id);
    expect(job.title).toBe("Repair: finish wear, rings or marks");
    expect(job.quoteInput.title).toBe(job.title);
    expect(job.title).not.toContain(piece.title);
  });

  it("from an accepted refresh offer: the care task", async () => {
    const studio = createStudio();
    const staff = await memberContext(studio, "staff");
    const owner = await createUser();
    const { piece } = createPiece(studio, { ownerId: owner.id });
    const offer = getDb()
      .insert(refreshOffers)
      .values({ studioId: studio.id, pieceId: piece.id, userId: owner.id, taskKey: `${piece.id}:topcoat_refresh:top`, dueOn: "2027-03-01", priceMinor: 12_000, currency: "USD", quote: { lines: [], subtotalMinor: 12_000, taxMinor: 0, totalMinor: 12_000, currency: "USD" } as unknown as Quote, status: "accepted" })
      .returning()
      .get();
    const job = createJob(staff, "refresh_offer", offer.id);
    expect(job.title).toBe("Refresh visit: topcoat refresh");
    expect(job.title).not.toContain(piece.title);
  });
});
