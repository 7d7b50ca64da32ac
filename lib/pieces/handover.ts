import "server-only";
import { and, eq, isNull, sql } from "drizzle-orm";
import type { User } from "lucia";
import { getDb } from "@/db/client";
import { pieceHandovers, pieces, studios } from "@/db/schema";
import type { StudioContext } from "@/lib/auth/guards";
import { PIECE_KIND_LABELS } from "@/lib/care/vocabulary";
import { sha256Hex } from "@/lib/crypto";
import { AppError, conflict, forbidden, notFound } from "@/lib/errors";
import { formatMonth } from "@/lib/format";
import { registerPiece } from "@/lib/owner/registration";
import { registrationSchema } from "@/lib/validation/owner";
import { blockFor, buyerOf, everRegistered, HANDOVER_BLOCK_MESSAGES, mailHandover, type HandoverBlock } from "./handover-mail";
import { openRegistrationCode } from "./registration";
import { loadPiece } from "./registry";

// The hand-over mail: at delivery the buyer gets what they bought, its finish and first care dates,
// how long the last layer cures, the cautions, the warranty terms and a one-tap link that registers
// the piece once they have signed up or signed in with the address it went to. The link's token is
// random (160 bits), kept only as its SHA-256, bound to the piece and that address, single use, and
// replaced by a resend. It is sent only to a buyer with an e-mail who agreed to service mail. The
// drawer card keeps its code for later owners. The mail itself is lib/pieces/handover-mail.ts; this
// module is what staff and the buyer do with it.

export { HANDOVER_BLOCK_MESSAGES, HANDOVER_LINK_DAYS, handoverBlockOf, handoverUrl, type HandoverBlock } from "./handover-mail";

export type HandoverStatus = {
  client: { id: string; name: string; email: string } | null;
  /** When the mail first and last went out, how often, and what happened to its link (ISO instants). */
  firstSentAt: string | null;
  lastSentAt: string | null;
  sendCount: number;
  openedAt: string | null;
  /** Registered through the hand-over link. */
  registeredAt: string | null;
  /** Registered at all (through the link or the drawer card's code). */
  pieceRegisteredAt: string | null;
  /** Why the mail can't be sent now; null when it can. */
  block: HandoverBlock | null;
  blockMessage: string | null;
  timeZone: string;
};

const iso = (d: Date | null | undefined) => (d ? d.toISOString() : null);


/** What the studio's piece page shows about the hand-over mail (404 for another studio's piece). */
export function handoverStatus(ctx: StudioContext, pieceId: string): HandoverStatus {
  const db = getDb();
  const piece = loadPiece(ctx, pieceId);
  const client = buyerOf(ctx, piece);
  const row = db.select().from(pieceHandovers).where(and(eq(pieceHandovers.pieceId, piece.id), eq(pieceHandovers.studioId, ctx.studio.id))).get();
  const block = blockFor(piece, client, everRegistered(db, piece.id));
  return {
    client: client ? { id: client.id, name: client.name, email: client.email ?? "" } : null,
    firstSentAt: iso(row?.firstSentAt),
    lastSentAt: iso(row?.lastSentAt),
    sendCount: row?.sendCount ?? 0,
    openedAt: iso(row?.openedAt),
    registeredAt: iso(row?.registeredAt),
    pieceRegisteredAt: iso(piece.registeredAt),
    block,
    blockMessage: block ? HANDOVER_BLOCK_MESSAGES[block] : null,
    timeZone: ctx.studio.timeZone,
  };
}


/**
 * Sends (or sends again) the hand-over mail of one of the studio's pieces to its buyer, with a fresh
 * link (the last one stops working). 404 for another studio's piece; 409 once the piece is
 * registered; 422 without a buyer, an e-mail or their consent to service mail.
 */
export async function sendHandover(ctx: StudioContext, pieceId: string, now = new Date()): Promise<HandoverStatus> {
  await mailHandover(ctx, pieceId, now);
  return handoverStatus(ctx, pieceId);
}


/** At delivery: the mail goes out when it can; otherwise the reason it didn't, in words for staff. */
export async function handoverAtDelivery(ctx: StudioContext, pieceId: string, now = new Date()): Promise<{ sent: boolean; reason: string | null }> {
  try {
    await sendHandover(ctx, pieceId, now);
    return { sent: true, reason: null };
  } catch (e) {
    if (e instanceof AppError && (e.status === 409 || e.status === 422)) return { sent: false, reason: e.message };
    throw e;
  }
}

// ---- the link, as the buyer meets it ----

export type HandoverLanding =
  | { state: "unknown" }
  | {
      state: "available" | "yours" | "taken" | "expired";
      studioName: string;
      title: string;
      kindLabel: string;
      deliveredMonth: string;
      /** The address the link was sent to: the account must have it. */
      email: string;
      pieceId: string | null;
    };

function rowForToken(token: string) {
  if (token.length < 20 || token.length > 100) return undefined;
  return getDb()
    .select({ h: pieceHandovers, piece: pieces, studioName: studios.name })
    .from(pieceHandovers)
    .innerJoin(pieces, eq(pieces.id, pieceHandovers.pieceId))
    .innerJoin(studios, eq(studios.id, pieceHandovers.studioId))
    .where(eq(pieceHandovers.tokenHash, sha256Hex(token)))
    .get();
}

/**
 * What the hand-over link's page shows: the studio, the piece, the address it was sent to, and
 * whether it can still be registered. The first opening of a working link is recorded.
 */
export function openHandover(token: string, viewer: Pick<User, "id"> | null, now = new Date()): HandoverLanding {
  const row = rowForToken(token);
  if (!row || !row.h.email) return { state: "unknown" };
  const { h, piece } = row;
  const base = { studioName: row.studioName, title: piece.title, kindLabel: PIECE_KIND_LABELS[piece.kind], deliveredMonth: formatMonth(piece.deliveredOn), email: h.email! };
  if (viewer && piece.ownerId === viewer.id) return { ...base, state: "yours", pieceId: piece.id };
  if (h.usedAt || piece.ownerId || piece.archivedAt || everRegistered(getDb(), piece.id)) return { ...base, state: "taken", pieceId: null };
  if (!h.expiresAt || h.expiresAt <= now) return { ...base, state: "expired", pieceId: null };
  if (!h.openedAt) getDb().update(pieceHandovers).set({ openedAt: now, updatedAt: now }).where(and(eq(pieceHandovers.id, h.id), isNull(pieceHandovers.openedAt))).run();
  return { ...base, state: "available", pieceId: null };
}

/**
 * Registers the piece behind a hand-over link to the signed-in account, through the one registration
 * path (the drawer card's code, read from the record instead of typed). The account's e-mail must be
 * the one the link was sent to, and confirmed. 404 for a link we don't know or one that was replaced;
 * 409 when it was used, expired, or the piece is registered.
 */
export async function registerByHandover(user: Pick<User, "id" | "email" | "emailVerifiedAt">, token: string, ip: string, now = new Date()): Promise<{ pieceId: string }> {
  const row = rowForToken(token);
  if (!row || !row.h.email) throw notFound("We don't know that link. Ask the studio to send the hand-over mail again, or type the code from the drawer card.");
  const { h, piece } = row;
  const sentTo = row.h.email;
  if (h.usedAt || piece.ownerId || everRegistered(getDb(), piece.id)) throw conflict("This link has been used: the piece is registered. If it should be yours, ask the studio.");
  if (!h.expiresAt || h.expiresAt <= now) throw conflict("This link has expired. Ask the studio to send the hand-over mail again, or type the code from the drawer card.");
  if (user.email.toLowerCase() !== sentTo.toLowerCase()) throw forbidden(`This link was sent to ${sentTo}. Sign in with that address to register the piece.`);
  const result = await registerPiece(user, registrationSchema.parse({ code: openRegistrationCode(piece.registrationCodeEnc) }), ip, now);
  getDb().update(pieceHandovers).set({ usedAt: now, registeredAt: now, openedAt: sql`coalesce(${pieceHandovers.openedAt}, ${now.getTime()})`, updatedAt: now }).where(eq(pieceHandovers.id, h.id)).run();
  return result;
}
