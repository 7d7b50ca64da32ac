import "server-only";
import { and, eq, isNull } from "drizzle-orm";
import type { z } from "zod";
import { getDb } from "@/db/client";
import { claims, pieces, users } from "@/db/schema";
import { recordAudit } from "@/lib/audit";
import type { Actor } from "@/lib/auth/actor";
import { conflict, forbidden } from "@/lib/errors";
import { appendMessage, ownerMayWrite, threadFor } from "@/lib/messages/store";
import type { claimMessageSchema } from "@/lib/validation/claims";
import { loadVisibleClaim, requireOwnerActsOnClaim, studioOf } from "./claim-row";
import { mailClaimMessage } from "./mail";
import { moveState } from "./move-state";
import { ownerAnswered } from "./owner-answer";

export type ClaimMessageValues = z.output<typeof claimMessageSchema>;

/**
 * A message on the claim's thread from its owner or the studio. Staff may ask for more information
 * (the claim waits on the owner); the owner's answer puts it back in review; the studio's first answer
 * is stamped for the queue's wait times.
 */
export async function postClaimMessage(actor: Actor, claimId: string, input: ClaimMessageValues) {
  const { claim, asStaff } = loadVisibleClaim(actor, claimId);
  if (claim.state === "closed") throw conflict("This claim is closed. Start a new claim if something else needs the studio's attention.");
  if (!asStaff) requireOwnerActsOnClaim(actor, claim, "The piece has a new owner now, so this claim takes no more messages from you.");
  if (input.requestInfo && !asStaff) throw forbidden("Only the studio asks for more information.");
  // A former owner reads the claim but can no longer answer on it: a question would leave it waiting for good.
  if (input.requestInfo && !ownerMayWrite(getDb(), claim.ownerId, { kind: "claim", id: claim.id }))
    throw conflict("The owner has handed this piece on and can no longer answer on this claim. Send your message without asking for more, and decide the claim on what you have, or ask the new owner once they have registered the piece.");
  const now = new Date();
  const result = getDb().transaction((tx) => {
    let current = claim;
    if (asStaff && input.requestInfo) current = moveState(tx, claim, "awaiting_owner", undefined, { firstAnsweredAt: claim.firstAnsweredAt ?? now });
    else if (!asStaff) current = ownerAnswered(tx, claim); // the one way an owner's answer moves a claim (also by e-mail)
    else if (asStaff && !claim.firstAnsweredAt) {
      tx.update(claims).set({ firstAnsweredAt: now, updatedAt: now }).where(and(eq(claims.id, claim.id), isNull(claims.firstAnsweredAt))).run();
    }
    const added = appendMessage(tx, threadFor(tx, { kind: "claim", id: claim.id }, now), { author: asStaff ? "staff" : "owner", authorId: actor.user.id, body: input.body, now })!;
    const message = { ...added, body: input.body, fromStudio: asStaff };
    recordAudit(tx, {
      studioId: claim.studioId,
      actorId: actor.user.id,
      action: input.requestInfo ? "claim.info_requested" : "claim.message",
      subjectType: "claim",
      subjectId: claim.id,
      data: { messageId: message.id, fromStudio: asStaff, ...(current.state !== claim.state ? { from: claim.state, to: current.state } : {}) },
    });
    return { message, state: current.state, version: current.version };
  });
  const studio = studioOf(claim.studioId);
  const piece = getDb().select().from(pieces).where(eq(pieces.id, claim.pieceId)).get()!;
  const owner = getDb().select({ id: users.id, name: users.name, email: users.email }).from(users).where(eq(users.id, claim.ownerId)).get()!;
  await mailClaimMessage({ claim, piece, studio, owner, fromStudio: asStaff, authorName: actor.user.name, body: input.body, requestInfo: !!input.requestInfo });
  return {
    message: { id: result.message.id, body: result.message.body, fromStudio: result.message.fromStudio, createdAt: result.message.createdAt.toISOString(), authorName: actor.user.name },
    state: result.state,
    version: result.version,
  };
}
