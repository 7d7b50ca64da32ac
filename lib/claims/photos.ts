import "server-only";
import { and, count, eq } from "drizzle-orm";
import { getDb } from "@/db/client";
import { files } from "@/db/schema";
import { recordAudit } from "@/lib/audit";
import type { Actor } from "@/lib/auth/actor";
import { conflict, forbidden, notFound } from "@/lib/errors";
import { removeStoredFiles, storeImage } from "@/lib/storage";
import { loadVisibleClaim, photoView, requireOwnerActsOnClaim, type ClaimPhoto } from "./claim-row";
import { MAX_CLAIM_PHOTOS, OPEN_STATES } from "./states";

// The owner adds photos to an open claim and removes them while the claim is still new.

function photoCount(claimId: string): number {
  return getDb().select({ n: count() }).from(files).where(and(eq(files.claimId, claimId), eq(files.purpose, "claim_photo"))).get()?.n ?? 0;
}

/**
 * Adds one photo to an open claim of the actor's. `read` is called only after the actor is
 * authorized, so a stranger's upload is never read; the image is checked and cleaned by lib/storage.
 */
export async function addClaimPhoto(actor: Actor, claimId: string, read: () => Promise<Uint8Array>): Promise<ClaimPhoto> {
  const { claim } = loadVisibleClaim(actor, claimId);
  if (claim.ownerId !== actor.user.id) throw forbidden("Only the owner who filed the claim adds photos to it.");
  requireOwnerActsOnClaim(actor, claim, "The piece has a new owner now, so this claim takes no more photos from you.");
  if (!OPEN_STATES.includes(claim.state)) throw conflict("This claim has been decided; photos can no longer be added. Send the studio a message instead.");
  if (photoCount(claim.id) >= MAX_CLAIM_PHOTOS) throw conflict(`A claim holds at most ${MAX_CLAIM_PHOTOS} photos. Remove one to add another.`);
  const stored = await storeImage(await read(), actor.user.id);
  try {
    return getDb().transaction((tx) => {
      const n = tx.select({ n: count() }).from(files).where(and(eq(files.claimId, claim.id), eq(files.purpose, "claim_photo"))).get()?.n ?? 0;
      if (n >= MAX_CLAIM_PHOTOS) throw conflict(`A claim holds at most ${MAX_CLAIM_PHOTOS} photos. Remove one to add another.`);
      const row = tx
        .insert(files)
        .values({ studioId: claim.studioId, purpose: "claim_photo", pieceId: claim.pieceId, claimId: claim.id, uploadedById: actor.user.id, ...stored })
        .returning()
        .get();
      recordAudit(tx, { studioId: claim.studioId, actorId: actor.user.id, action: "claim.photo_added", subjectType: "claim", subjectId: claim.id, data: { fileId: row.id } });
      return photoView(row);
    });
  } catch (e) {
    await removeStoredFiles(stored.storageKey, stored.thumbKey);
    throw e;
  }
}

/** The owner removes a photo while the claim is still new (before the studio started reviewing). */
export async function removeClaimPhoto(actor: Actor, claimId: string, fileId: string): Promise<void> {
  const { claim } = loadVisibleClaim(actor, claimId);
  const file = getDb().select().from(files).where(and(eq(files.id, fileId), eq(files.claimId, claim.id))).get();
  if (!file) throw notFound("No such photo on this claim.");
  if (claim.ownerId !== actor.user.id) throw forbidden("Only the owner who filed the claim removes its photos.");
  requireOwnerActsOnClaim(actor, claim, "The piece has a new owner now, so the photos on this claim stay as they are.");
  if (claim.state !== "submitted") throw conflict("The studio has started reviewing this claim, so its photos stay. Send a message if one was a mistake.");
  getDb().transaction((tx) => {
    tx.delete(files).where(eq(files.id, file.id)).run();
    recordAudit(tx, { studioId: claim.studioId, actorId: actor.user.id, action: "claim.photo_removed", subjectType: "claim", subjectId: claim.id, data: { fileId } });
  });
  await removeStoredFiles(file.storageKey, file.thumbKey);
}
