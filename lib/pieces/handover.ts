import "server-only";
import { and, asc, eq, isNull, sql } from "drizzle-orm";
import type { User } from "lucia";
import { getDb } from "@/db/client";
import { clients, finishLayers, finishProducts, ownerships, pieceHandovers, pieces, studios, warrantyPolicies, type Client, type Piece } from "@/db/schema";
import { HandOverEmail, handOverSubject } from "@/emails/hand-over";
import type { StudioContext } from "@/lib/auth/guards";
import { recordAudit } from "@/lib/audit";
import { localDate } from "@/lib/care/dates";
import { FINISH_CLASS_LABELS, PIECE_KIND_LABELS } from "@/lib/care/vocabulary";
import { randomToken, sha256Hex } from "@/lib/crypto";
import { env } from "@/lib/env";
import { AppError, conflict, forbidden, notFound, unprocessable } from "@/lib/errors";
import { sendMail } from "@/lib/mail";
import { formatDate, formatInstant, formatMonth } from "@/lib/format";
import { registerPiece } from "@/lib/owner/registration";
import { warrantyLinesFor } from "@/lib/owner/warranty";
import { registrationSchema } from "@/lib/validation/owner";
import { planLinesForMail } from "@/lib/plans/offers";
import { drawerCardData } from "./card";
import { openRegistrationCode } from "./registration";
import { loadPiece } from "./registry";

// The hand-over mail: at delivery the buyer gets what they bought, its finish and first care dates,
// how long the last layer cures, the cautions, the warranty terms and a one-tap link that registers
// the piece once they have signed up or signed in with the address it went to. The link's token is
// random (160 bits), kept only as its SHA-256, bound to the piece and that address, single use, and
// replaced by a resend. It is sent only to a buyer with an e-mail who agreed to service mail. The
// drawer card keeps its code for later owners.

export const HANDOVER_LINK_DAYS = 90;

export type HandoverBlock = "no_buyer" | "no_email" | "no_consent" | "registered" | "archived";

export const HANDOVER_BLOCK_MESSAGES: Record<HandoverBlock, string> = {
  no_buyer: "No buyer is recorded for this piece yet.",
  no_email: "The buyer has no e-mail address on record.",
  no_consent: "The buyer hasn't agreed to service mail. Record their consent on their client page first.",
  registered: "The piece is already registered, so there is nothing to hand over by mail.",
  archived: "The piece is archived.",
};

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

function everRegistered(db: ReturnType<typeof getDb>, pieceId: string): boolean {
  return !!db.select({ id: ownerships.id }).from(ownerships).where(eq(ownerships.pieceId, pieceId)).get();
}

function blockFor(piece: Piece, client: Client | null, registered: boolean): HandoverBlock | null {
  if (piece.archivedAt) return "archived";
  if (registered || piece.ownerId) return "registered";
  if (!client) return "no_buyer";
  if (!client.email) return "no_email";
  if (!client.consentService) return "no_consent";
  return null;
}

function buyerOf(ctx: StudioContext, piece: Piece): Client | null {
  if (!piece.clientId) return null;
  return getDb().select().from(clients).where(and(eq(clients.id, piece.clientId), eq(clients.studioId, ctx.studio.id))).get() ?? null;
}

/** Why this piece's hand-over mail can't go out now; null when it can. */
export function handoverBlockOf(ctx: StudioContext, piece: Piece): HandoverBlock | null {
  return blockFor(piece, buyerOf(ctx, piece), everRegistered(getDb(), piece.id));
}

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

const SURFACE_NAMES = { top: "Top", base: "Base", edges: "Edges" } as const;

/** The mail's words about the piece: its finish, first care, cure time, cautions and warranty. */
async function composeHandover(ctx: StudioContext, piece: Piece, client: Client, url: string, expiresAt: Date, now: Date) {
  const db = getDb();
  const card = await drawerCardData(ctx, piece.id, now);
  const layers = db
    .select({ layer: finishLayers, productName: finishProducts.name })
    .from(finishLayers)
    .leftJoin(finishProducts, eq(finishProducts.id, finishLayers.productId))
    .where(and(eq(finishLayers.pieceId, piece.id), eq(finishLayers.studioId, ctx.studio.id)))
    .orderBy(asc(finishLayers.surface), asc(finishLayers.position))
    .all();
  const finish = layers.map(({ layer: l, productName }) => {
    const product = productName ?? (l.productLabel || null);
    return `${SURFACE_NAMES[l.surface]}: ${FINISH_CLASS_LABELS[l.finishClass].toLowerCase()}${product ? ` (${product})` : ""}, ${l.coats} coat${l.coats === 1 ? "" : "s"}, applied ${formatDate(l.appliedOn)}`;
  });
  const policy = piece.warrantyPolicyId ? db.select({ policy: warrantyPolicies.policy }).from(warrantyPolicies).where(eq(warrantyPolicies.id, piece.warrantyPolicyId)).get() : undefined;
  const today = localDate(now.getTime(), ctx.studio.timeZone);
  const warranty = policy
    ? warrantyLinesFor(policy.policy, piece.deliveredOn, today, true, { resin: piece.resinKind, use: piece.use, hasEpoxyLayer: layers.some((l) => l.layer.finishClass === "epoxy_surface") }).map(
        (l) =>
          `${l.label}: ${l.termMonths} months, until ${formatDate(l.endsOn)}${l.transfersToNewOwner ? " (passes to a later owner)" : " (for you as the first owner)"}${l.careLogRequired ? "; logging the care you do keeps it in force" : ""}`,
      )
    : [];
  return HandOverEmail({
    name: client.name,
    studioName: ctx.studio.name,
    pieceTitle: piece.title,
    subtitle: card.subtitle,
    finish,
    firstCare: card.schedule,
    curing: card.curing,
    cautions: card.cautions,
    warranty,
    url,
    linkExpiresOn: formatInstant(expiresAt, client.timeZone ?? ctx.studio.timeZone),
    // Not registered yet: no care log of theirs, so the plans go without a saving.
    plans: planLinesForMail(ctx.studio, piece, null, now),
  });
}

export const handoverUrl = (token: string) => new URL(`/hand-over/${token}`, env.APP_URL).href;

/**
 * Sends (or sends again) the hand-over mail of one of the studio's pieces to its buyer, with a fresh
 * link (the last one stops working). 404 for another studio's piece; 409 once the piece is
 * registered; 422 without a buyer, an e-mail or their consent to service mail.
 */
export async function sendHandover(ctx: StudioContext, pieceId: string, now = new Date()): Promise<HandoverStatus> {
  await mailHandover(ctx, pieceId, now);
  return handoverStatus(ctx, pieceId);
}

/**
 * The hand-over mail of one piece, refused as sendHandover says. With `firstOnly` (the bulk mailing,
 * lib/pieces/handover-batch.ts) only if it never went out: decided in the transaction that records
 * the sending, so two mailings never send it twice ("already_sent"); a resend stays a single action.
 */
export async function mailHandover(ctx: StudioContext, pieceId: string, now = new Date(), { firstOnly = false } = {}): Promise<"sent" | "already_sent"> {
  const db = getDb();
  const piece = loadPiece(ctx, pieceId);
  const client = buyerOf(ctx, piece);
  const block = blockFor(piece, client, everRegistered(db, piece.id));
  if (block === "registered" || block === "archived") throw conflict(HANDOVER_BLOCK_MESSAGES[block]);
  if (block || !client?.email) throw unprocessable(`handover_${block}`, HANDOVER_BLOCK_MESSAGES[block ?? "no_email"]);
  const token = randomToken();
  const expiresAt = new Date(now.getTime() + HANDOVER_LINK_DAYS * 24 * 60 * 60 * 1000);
  const email = await composeHandover(ctx, piece, client, handoverUrl(token), expiresAt, now);
  const recorded = db.transaction((tx) => {
    const before = tx.select({ id: pieceHandovers.id, sendCount: pieceHandovers.sendCount }).from(pieceHandovers).where(eq(pieceHandovers.pieceId, piece.id)).get();
    if (firstOnly && before?.sendCount) return false;
    tx.insert(pieceHandovers)
      .values({ studioId: ctx.studio.id, pieceId: piece.id, clientId: client.id, email: client.email, tokenHash: sha256Hex(token), expiresAt, firstSentAt: now, lastSentAt: now, sendCount: 1, createdAt: now, updatedAt: now })
      .onConflictDoUpdate({
        target: pieceHandovers.pieceId,
        set: {
          clientId: client.id,
          email: client.email,
          tokenHash: sha256Hex(token),
          expiresAt,
          firstSentAt: sql`coalesce(${pieceHandovers.firstSentAt}, ${now.getTime()})`,
          lastSentAt: now,
          sendCount: sql`${pieceHandovers.sendCount} + 1`,
          usedAt: null,
          updatedAt: now,
        },
      })
      .run();
    const audit = { studioId: ctx.studio.id, actorId: ctx.user.id, subjectType: "piece", subjectId: piece.id, data: { clientId: client.id } };
    if (before?.sendCount) recordAudit(tx, { ...audit, action: "piece.handover_resent" });
    else recordAudit(tx, { ...audit, action: "piece.handover_sent" });
    return true;
  });
  if (!recorded) return "already_sent";
  await sendMail({ to: client.email, subject: handOverSubject({ pieceTitle: piece.title, studioName: ctx.studio.name }), email, replyTo: ctx.studio.email || undefined, studioId: ctx.studio.id });
  return "sent";
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
