import { and, asc, eq, sql } from "drizzle-orm";
import { getDb } from "@/db/client";
import { clients, finishLayers, finishProducts, ownerships, pieceHandovers, warrantyPolicies, type Client, type Piece } from "@/db/schema";
import { HandOverEmail, handOverSubject } from "@/emails/hand-over";
import type { StudioContext } from "@/lib/auth/guards";
import { recordAudit } from "@/lib/audit";
import { localDate } from "@/lib/care/dates";
import { FINISH_CLASS_LABELS } from "@/lib/care/vocabulary";
import { randomToken, sha256Hex } from "@/lib/crypto";
import { env } from "@/lib/env";
import { conflict, unprocessable } from "@/lib/errors";
import { sendMail } from "@/lib/mail";
import { formatDate, formatInstant } from "@/lib/format";
import { warrantyLinesFor } from "@/lib/owner/warranty";
import { planLinesForMail } from "@/lib/plans/offers";
import { drawerCardData } from "./card";
import { loadPiece } from "./registry-common";

// The hand-over mail itself (what lib/pieces/handover.ts sends, resends and reports on): who may get
// it, its words about the piece, and the sending, recorded before the mail leaves. No server-only
// import: the scheduler (jobs/handover-mailings.ts) finishes stalled bulk mailings through it under
// plain Node.

export const HANDOVER_LINK_DAYS = 90;

export type HandoverBlock = "no_buyer" | "no_email" | "no_consent" | "registered" | "archived";

export const HANDOVER_BLOCK_MESSAGES: Record<HandoverBlock, string> = {
  no_buyer: "No buyer is recorded for this piece yet.",
  no_email: "The buyer has no e-mail address on record.",
  no_consent: "The buyer hasn't agreed to service mail. Record their consent on their client page first.",
  registered: "The piece is already registered, so there is nothing to hand over by mail.",
  archived: "The piece is archived.",
};

export function everRegistered(db: ReturnType<typeof getDb>, pieceId: string): boolean {
  return !!db.select({ id: ownerships.id }).from(ownerships).where(eq(ownerships.pieceId, pieceId)).get();
}

export function blockFor(piece: Piece, client: Client | null, registered: boolean): HandoverBlock | null {
  if (piece.archivedAt) return "archived";
  if (registered || piece.ownerId) return "registered";
  if (!client) return "no_buyer";
  if (!client.email) return "no_email";
  if (!client.consentService) return "no_consent";
  return null;
}

export function buyerOf(ctx: StudioContext, piece: Piece): Client | null {
  if (!piece.clientId) return null;
  return getDb().select().from(clients).where(and(eq(clients.id, piece.clientId), eq(clients.studioId, ctx.studio.id))).get() ?? null;
}

/** Why this piece's hand-over mail can't go out now; null when it can. */
export function handoverBlockOf(ctx: StudioContext, piece: Piece): HandoverBlock | null {
  return blockFor(piece, buyerOf(ctx, piece), everRegistered(getDb(), piece.id));
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
