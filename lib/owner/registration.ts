import "server-only";
import { indexPiece } from "@/lib/pieces/search-index";
import { and, eq, isNull } from "drizzle-orm";
import type { User } from "lucia";
import { getDb } from "@/db/client";
import { ownerships, pieces, studios } from "@/db/schema";
import { recordAudit } from "@/lib/audit";
import { consumeAttempt, resetAttempts } from "@/lib/auth/rate-limit";
import { isValidRegistrationCode, normalizeRegistrationCode } from "@/lib/care/registration-code";
import { PIECE_KIND_LABELS } from "@/lib/care/vocabulary";
import { AppError, conflict, forbidden, isAppError, notFound } from "@/lib/errors";
import { linkPieceToOwner } from "@/lib/clients/link";
import { hashTypedCode } from "@/lib/pieces/registration";
import type { RegistrationValues } from "@/lib/validation/owner";
import { formatMonth } from "@/lib/format";
import { adoptStudioUnits } from "./preferences";

// Registering a piece from its drawer card. Codes are compared by their keyed hash only; attempts
// are rate-limited per IP and per account; exactly one owner wins a code, even under concurrency.

export const UNKNOWN_CODE_MESSAGE =
  "We don't know that code. Check it against the card in the drawer — if it still doesn't work, ask the studio that made the piece.";

export function alreadyRegisteredMessage(studioName: string, studioEmail: string) {
  return (
    `This piece is already registered to someone. If it has changed hands, ask its previous owner to release it in Grainward — ` +
    `that gives them a new registration code to hand to you. Or ask ${studioName}${studioEmail ? ` (${studioEmail})` : ""} for a transfer.`
  );
}

type Viewer = Pick<User, "id"> | null;

export type CardLanding =
  | { state: "typo" | "malformed" | "unknown" | "rate_limited"; code: string; message: string }
  | {
      state: "available" | "yours" | "registered";
      code: string;
      card: { studioName: string; title: string; kindLabel: string; deliveredMonth: string };
      /** Only when the piece is the viewer's own. */
      pieceId: string | null;
      message: string | null;
    };

/**
 * What the drawer-card landing may show to anyone holding the card: studio name, piece title and
 * kind, delivery month. A code that misses costs an attempt from the IP's bucket, so the page cannot
 * be used to search for codes; a code that hits costs nothing (people scan their card twice).
 */
export async function lookupCard(typed: string, ip: string, viewer: Viewer): Promise<CardLanding> {
  const code = normalizeRegistrationCode(typed) ?? typed.slice(0, 40);
  if (!normalizeRegistrationCode(typed)) return { state: "malformed", code, message: "That doesn't look like a registration code. Type the code from the card instead." };
  if (!isValidRegistrationCode(typed)) return { state: "typo", code, message: "That code has a typo — check the card." };
  const row = getDb()
    .select({ id: pieces.id, title: pieces.title, kind: pieces.kind, deliveredOn: pieces.deliveredOn, ownerId: pieces.ownerId, studioName: studios.name, studioEmail: studios.email })
    .from(pieces)
    .innerJoin(studios, eq(studios.id, pieces.studioId))
    .where(and(eq(pieces.registrationCodeHash, hashTypedCode(code)!), isNull(pieces.archivedAt)))
    .get();
  if (!row) {
    try {
      await consumeAttempt([["codeIp", ip]]);
    } catch (e) {
      if (isAppError(e) && e.status === 429) return { state: "rate_limited", code, message: e.message };
      throw e;
    }
    return { state: "unknown", code, message: UNKNOWN_CODE_MESSAGE };
  }
  const card = { studioName: row.studioName, title: row.title, kindLabel: PIECE_KIND_LABELS[row.kind], deliveredMonth: formatMonth(row.deliveredOn) };
  if (!row.ownerId) return { state: "available", code, card, pieceId: null, message: null };
  if (viewer && row.ownerId === viewer.id) return { state: "yours", code, card, pieceId: row.id, message: "This piece is registered to you." };
  return { state: "registered", code, card, pieceId: null, message: alreadyRegisteredMessage(row.studioName, row.studioEmail) };
}

/**
 * Registers the piece whose card carries `raw.code` to `user`. 400 when the code is not shaped like
 * one or its check symbol fails (before any lookup or rate limit), 403 until the e-mail is
 * confirmed, 429 when rate-limited, 404 unknown, 409 already registered. One transaction: a
 * conditional update (`owner_id IS NULL`) whose changed-row count decides the winner.
 */
export async function registerPiece(
  user: Pick<User, "id" | "emailVerifiedAt">,
  { code }: RegistrationValues,
  ip: string,
  now = new Date(),
  /** The request's Accept-Language: an owner who has not chosen units gets them from its region (lib/owner/preferences). */
  { acceptLanguage }: { acceptLanguage?: string | null } = {},
): Promise<{ pieceId: string }> {
  if (!user.emailVerifiedAt) throw forbidden("Confirm your e-mail address first — open the link we sent you, then register the piece.");
  await consumeAttempt([
    ["codeIp", ip],
    ["codeAccount", user.id],
  ]);
  const hash = hashTypedCode(code);
  if (!hash) throw notFound(UNKNOWN_CODE_MESSAGE);
  const db = getDb();
  const result = db.transaction((tx) => {
    const won = tx
      .update(pieces)
      .set({ ownerId: user.id, registeredAt: now, updatedAt: now })
      .where(and(eq(pieces.registrationCodeHash, hash), isNull(pieces.ownerId), isNull(pieces.archivedAt)))
      .returning({ id: pieces.id, studioId: pieces.studioId })
      .all();
    if (won.length !== 1) {
      const existing = tx
        .select({ ownerId: pieces.ownerId, studioName: studios.name, studioEmail: studios.email })
        .from(pieces)
        .innerJoin(studios, eq(studios.id, pieces.studioId))
        .where(and(eq(pieces.registrationCodeHash, hash), isNull(pieces.archivedAt)))
        .get();
      if (!existing) return notFound(UNKNOWN_CODE_MESSAGE);
      if (existing.ownerId === user.id) return conflict("This piece is already registered to you — you'll find it under My pieces.");
      return conflict(alreadyRegisteredMessage(existing.studioName, existing.studioEmail));
    }
    const piece = won[0]!;
    const before = tx.select({ id: ownerships.id }).from(ownerships).where(eq(ownerships.pieceId, piece.id)).get();
    const via = before ? "transfer" : "registration";
    tx.insert(ownerships).values({ studioId: piece.studioId, pieceId: piece.id, userId: user.id, via, startedAt: now }).run();
    // The piece's client is now its owner's client in the studio (made if missing).
    linkPieceToOwner(tx, piece, user.id, now);
    adoptStudioUnits(tx, user.id, piece.studioId, piece.id, acceptLanguage);
    recordAudit(tx, { studioId: piece.studioId, actorId: user.id, action: "piece.registered", subjectType: "piece", subjectId: piece.id, data: { via } });
    // The registry searches by owner name and e-mail.
    indexPiece(tx, piece.id);
    return { pieceId: piece.id };
  });
  if (result instanceof AppError) throw result;
  await resetAttempts("codeAccount", user.id);
  return result;
}
