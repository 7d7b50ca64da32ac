// A piece's registration code seen from the studio: reissued (the old one stops working), revealed for
// the drawer card, or matched against what someone typed in the registry search.
import "server-only";
import { and, eq } from "drizzle-orm";
import { getDb } from "@/db/client";
import { pieces } from "@/db/schema";
import type { StudioContext } from "@/lib/auth/guards";
import { recordAudit } from "@/lib/audit";
import { isValidRegistrationCode } from "@/lib/care/registration-code";
import { loadPiece } from "./registry-common";
import { hashTypedCode, newRegistrationCode, openRegistrationCode } from "./registration";

/** POST /api/pieces/[id]/registration-code: a new code; the old one stops working at once. */
export function reissueRegistrationCode(ctx: StudioContext, pieceId: string): { registrationCode: string } {
  return getDb().transaction((tx) => {
    loadPiece(ctx, pieceId, tx);
    const { code, hash, enc } = newRegistrationCode();
    tx.update(pieces).set({ registrationCodeHash: hash, registrationCodeEnc: enc, updatedAt: new Date() }).where(eq(pieces.id, pieceId)).run();
    recordAudit(tx, { studioId: ctx.studio.id, actorId: ctx.user.id, action: "piece.code_reissued", subjectType: "piece", subjectId: pieceId });
    return { registrationCode: code };
  });
}

/** The piece's current registration code, for printing its drawer card (staff only). */
export function revealRegistrationCode(ctx: StudioContext, pieceId: string): string {
  return openRegistrationCode(loadPiece(ctx, pieceId).registrationCodeEnc);
}

/** Whether a typed code is the current code of one of this studio's pieces (compares hashes). */
export function findByTypedCode(ctx: StudioContext, typed: string): string | null {
  if (!isValidRegistrationCode(typed)) return null;
  const hash = hashTypedCode(typed);
  if (!hash) return null;
  return getDb().select({ id: pieces.id }).from(pieces).where(and(eq(pieces.studioId, ctx.studio.id), eq(pieces.registrationCodeHash, hash))).get()?.id ?? null;
}
