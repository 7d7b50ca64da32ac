import "server-only";
import { and, desc, eq } from "drizzle-orm";
import { getDb } from "@/db/client";
import { ownerships } from "@/db/schema";
import type { StudioContext } from "@/lib/auth/guards";
import { loadPiece } from "./registry";
import { openRegistrationCode } from "./registration";

// What the studio's piece page says about the drawer card: the piece's current registration code
// (staff read it to a caller), and whether its owner released it since, so that the card in the
// drawer carries a code that no longer works and a new card is due.

export type CardCodeStatus = {
  /** Null when the stored code can't be opened (a row written by hand, or under another key): staff reissue it. */
  code: string | null;
  /** When the last owner released the piece and nobody has registered it since; else null. */
  releasedAt: Date | null;
};

export function cardCodeStatus(ctx: StudioContext, pieceId: string): CardCodeStatus {
  const piece = loadPiece(ctx, pieceId);
  const last = getDb()
    .select({ endedAt: ownerships.endedAt })
    .from(ownerships)
    .where(and(eq(ownerships.pieceId, pieceId), eq(ownerships.studioId, ctx.studio.id)))
    .orderBy(desc(ownerships.startedAt))
    .get();
  let code: string | null = null;
  try {
    code = openRegistrationCode(piece.registrationCodeEnc);
  } catch {
    code = null;
  }
  return { code, releasedAt: !piece.ownerId && last?.endedAt ? last.endedAt : null };
}
