import "server-only";
import { and, eq } from "drizzle-orm";
import { getDb } from "@/db/client";
import { claims, studios, type Claim, type Studio } from "@/db/schema";
import { notFound } from "@/lib/errors";
import { readAnswers } from "./coverage";
import type { ClaimViewer } from "./viewer";

// Loading one claim for whoever asks, and the claim's public shape. Every operation in lib/claims
// starts here: the claim's owner, or staff of the claim's studio; anyone else gets a 404 so a claim's
// existence is not revealed.

/** The claim row, if the viewer may see it (owner, or staff of its studio); otherwise 404. */
export function loadVisibleClaim(viewer: ClaimViewer, claimId: string): { claim: Claim; asStaff: boolean } {
  const claim = getDb().select().from(claims).where(eq(claims.id, claimId)).get();
  if (!claim) throw notFound("No claim with that id.");
  if (viewer.staff && viewer.staff.studio.id === claim.studioId) return { claim, asStaff: true };
  if (claim.ownerId === viewer.user.id) return { claim, asStaff: false };
  throw notFound("No claim with that id.");
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
