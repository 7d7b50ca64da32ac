// After a hand-over the former owner reads their claims as history but changes nothing on them.
// All data is invented.
import { and, eq } from "drizzle-orm";
import { describe, expect, it } from "vitest";
import { getDb } from "@/db/client";
import { files } from "@/db/schema";
import { addClaimPhoto, removeClaimPhoto } from "@/lib/claims/photos";
import { postClaimMessage } from "@/lib/claims/reply";
import { getOwnerClaim } from "@/lib/claims/view-claim";
import { releasePiece } from "@/lib/owner/transfer";
import { claimWorld, fileClaim, photoJpeg } from "./claims-helpers";

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
    await releasePiece({ ...w.owner }, w.piece.id, { confirm: true });

    let read = false;
    expect(await statusOf(addClaimPhoto(w.ownerV, claim.id, async () => ((read = true), jpeg)))).toBe(403);
    expect(read).toBe(false); // refused before the upload is read
    expect(await statusOf(removeClaimPhoto(w.ownerV, claim.id, kept.id))).toBe(403);
    expect(await statusOf(postClaimMessage(w.ownerV, claim.id, { body: "Still mine? (invented)" }))).toBe(403);
    expect(photosOf(claim.id).map((f) => f.id)).toEqual([kept.id]);
    // History: the claim and its photo are still theirs to read.
    expect(getOwnerClaim(w.owner, claim.id).photos.map((p) => p.id)).toEqual([kept.id]);
  });
});
