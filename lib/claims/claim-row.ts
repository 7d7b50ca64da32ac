import "server-only";
import { and, eq, or } from "drizzle-orm";
import { getDb } from "@/db/client";
import { claims, studios, type Claim, type Studio } from "@/db/schema";
import { forbidden, notFound } from "@/lib/errors";
import { ownerMayWrite } from "@/lib/messages/store";
import { readAnswers } from "./coverage";
import type { ActorRef } from "@/lib/auth/actor";
import { claimVisibleTo } from "./visible";

// Loading one claim for whoever asks, and the claim's public shape. Every operation in lib/claims
// starts here: the claim's owner, or staff of the claim's studio; anyone else gets a 404 so a claim's
// existence is not revealed.

/**
 * The claim row, if the actor may see it (lib/claims/visible.ts: staff of its studio, or its owner —
 * a studio member's own claim too, seen as its owner); otherwise 404. `asStaff`: seen as the studio.
 */
export function loadVisibleClaim(actor: ActorRef, claimId: string): { claim: Claim; asStaff: boolean } {
  const reach = actor.studio ? or(claimVisibleTo(actor), claimVisibleTo({ role: "owner", user: actor.user, studio: null })) : claimVisibleTo(actor);
  const claim = getDb().select().from(claims).where(and(eq(claims.id, claimId), reach)).get();
  if (!claim) throw notFound("No claim with that id.");
  return { claim, asStaff: actor.role !== "owner" && claim.studioId === actor.studio?.id };
}

/**
 * The one rule for an owner's writes on their claim (messages, photos): they act on it only while
 * they hold its piece (lib/messages/store.ts ownerMayWrite). After a hand-over the former owner still
 * reads the claim as their history, but adds or removes nothing; `refusal` says what they tried.
 */
export function requireOwnerActsOnClaim(actor: ActorRef, claim: Claim, refusal: string): void {
  if (!ownerMayWrite(getDb(), actor.user.id, { kind: "claim", id: claim.id })) throw forbidden(refusal);
}

/** A claim of the studio's, for staff operations; another studio's claim is a 404. */
export function loadStudioClaim(studioId: string, claimId: string): Claim {
  const claim = getDb().select().from(claims).where(and(eq(claims.id, claimId), eq(claims.studioId, studioId))).get();
  if (!claim) throw notFound("No claim with that id in this studio.");
  return claim;
}

export function studioOf(studioId: string): Studio {
  return getDb().select().from(studios).where(eq(studios.id, studioId)).get()!;
}

export function fileUrl(fileId: string, thumb = false): string {
  return `/api/files/${fileId}${thumb ? "?thumb=1" : ""}`;
}

export function photoView(f: { id: string; width: number; height: number; createdAt: Date }) {
  return { id: f.id, url: fileUrl(f.id), thumbUrl: fileUrl(f.id, true), width: f.width, height: f.height, createdAt: f.createdAt.toISOString() };
}
export type ClaimPhoto = ReturnType<typeof photoView>;

export function claimCore(claim: Claim) {
  return {
    id: claim.id,
    state: claim.state,
    version: claim.version,
    category: claim.category,
    noticedOn: claim.noticedOn,
    description: claim.description,
    answers: readAnswers(claim.answers),
    decision: claim.decision,
    coveredPct: claim.coveredPct,
    decisionReason: claim.decisionReason,
    decidedAt: claim.decidedAt?.toISOString() ?? null,
    firstAnsweredAt: claim.firstAnsweredAt?.toISOString() ?? null,
    createdAt: claim.createdAt.toISOString(),
    updatedAt: claim.updatedAt.toISOString(),
  };
}
