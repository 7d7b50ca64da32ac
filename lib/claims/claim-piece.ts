import "server-only";
import { and, asc, desc, eq } from "drizzle-orm";
import { getDb } from "@/db/client";
import { careLogEntries, finishLayers, finishProducts, ownerships, pieces, warrantyPolicies, type CareLogRow, type Claim, type FinishLayer, type Piece, type Studio } from "@/db/schema";
import { claimCoverage, type ClaimCoverage } from "./coverage";

/** Everything the coverage check needs about the claim's piece, scoped to the claim's studio. */
export function coverageOf(claim: Claim, studio: Studio): { coverage: ClaimCoverage; piece: Piece; layers: FinishLayer[]; careLog: CareLogRow[] } {
  const db = getDb();
  const piece = db.select().from(pieces).where(and(eq(pieces.id, claim.pieceId), eq(pieces.studioId, claim.studioId))).get()!;
  const layers = db.select().from(finishLayers).where(eq(finishLayers.pieceId, piece.id)).orderBy(asc(finishLayers.surface), asc(finishLayers.position)).all();
  const careLog = db.select().from(careLogEntries).where(eq(careLogEntries.pieceId, piece.id)).orderBy(desc(careLogEntries.doneOn)).all();
  const products = db.select().from(finishProducts).where(eq(finishProducts.studioId, claim.studioId)).all();
  const policyRow = piece.warrantyPolicyId
    ? (db.select().from(warrantyPolicies).where(and(eq(warrantyPolicies.id, piece.warrantyPolicyId), eq(warrantyPolicies.studioId, claim.studioId))).get() ?? null)
    : null;
  const owns = db.select({ userId: ownerships.userId, startedAt: ownerships.startedAt }).from(ownerships).where(eq(ownerships.pieceId, piece.id)).all();
  const coverage = claimCoverage({ claim, piece, layers, careLog, products, policyRow, ownerships: owns, timeZone: studio.timeZone, unitSystem: studio.unitSystem });
  return { coverage, piece, layers, careLog };
}
