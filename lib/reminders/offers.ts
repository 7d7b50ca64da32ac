import "server-only";
import { and, eq, exists, isNull, sql } from "drizzle-orm";
import { getDb } from "@/db/client";
import { pieces, refreshOffers, studios, users } from "@/db/schema";
import { recordAudit } from "@/lib/audit";
import { CARE_TASK_LABELS, CARE_TASK_KINDS, type CareTaskKind } from "@/lib/care/vocabulary";
import { conflict, notFound } from "@/lib/errors";
import { offerAcceptSchema } from "@/lib/validation/reminders";
import { offerView, type OfferView } from "./content";
import { offerUrl, readOfferToken } from "./tokens";

// A refresh offer opened from its e-mail link. The signed token is the authority (no sign-in needed,
// as with unsubscribe). Accepting records it; the repair-jobs side later turns accepted offers into jobs.
// An offer is made to the piece's owner of the day (refresh_offers.user_id): once the piece has been
// handed on (released, archived) the link in their old mail no longer accepts, and reads as closed.

export type OfferPage = OfferView & {
  status: "offered" | "accepted" | "declined" | "expired";
  pieceTitle: string;
  studioName: string;
  studioEmail: string;
  taskLabel: string;
  dueOn: string;
  acceptedAt: Date | null;
};

function offerRow(token: unknown) {
  const parsed = offerAcceptSchema.shape.token.safeParse(token);
  const id = parsed.success ? readOfferToken(parsed.data) : null;
  if (!id) throw notFound("This offer link is not valid. Use the link in the care e-mail.");
  const row = getDb()
    .select({ offer: refreshOffers, holderId: pieces.ownerId, archivedAt: pieces.archivedAt, pieceTitle: pieces.title, studioName: studios.name, studioEmail: studios.email, country: studios.country, unitSystem: users.unitSystem })
    .from(refreshOffers)
    .innerJoin(pieces, eq(pieces.id, refreshOffers.pieceId))
    .innerJoin(studios, eq(studios.id, refreshOffers.studioId))
    .innerJoin(users, eq(users.id, refreshOffers.userId))
    .where(eq(refreshOffers.id, id))
    .get();
  if (!row) throw notFound("This offer link is not valid. Use the link in the care e-mail.");
  // Still open only while the person it was offered to holds the piece.
  const handedOn = row.holderId !== row.offer.userId || row.archivedAt !== null;
  return { ...row, status: row.offer.status === "offered" && handedOn ? ("expired" as const) : row.offer.status };
}

/** SQL: the offer's piece is still held by the person it was offered to, and not archived. */
function offeredToHolder() {
  return exists(
    getDb()
      .select({ one: sql`1` })
      .from(pieces)
      .where(and(eq(pieces.id, refreshOffers.pieceId), eq(pieces.ownerId, refreshOffers.userId), isNull(pieces.archivedAt))),
  );
}

function kindOfTaskKey(taskKey: string): CareTaskKind | undefined {
  const kind = taskKey.split(":")[1];
  return CARE_TASK_KINDS.find((k) => k === kind);
}

export function getOfferByToken(token: unknown): OfferPage {
  const { offer, status, pieceTitle, studioName, studioEmail, country, unitSystem } = offerRow(token);
  const kind = kindOfTaskKey(offer.taskKey);
  return {
    ...offerView(offer.quote, offerUrl(offer.id), unitSystem, country),
    status,
    pieceTitle,
    studioName,
    studioEmail,
    taskLabel: kind ? CARE_TASK_LABELS[kind] : "Refresh",
    dueOn: offer.dueOn,
    acceptedAt: offer.acceptedAt,
  };
}

/** Accepts an offered refresh (idempotent for an accepted one); a declined or expired offer is a 409. */
export function acceptOfferByToken(token: unknown, now = new Date()): OfferPage {
  const { offer, status } = offerRow(token);
  if (status === "declined" || status === "expired") {
    throw conflict("This offer is no longer open: the care it was for has moved on. The studio can send you a new one.");
  }
  if (status === "offered") {
    getDb().transaction((tx) => {
      const changed = tx
        .update(refreshOffers)
        .set({ status: "accepted", acceptedAt: now })
        .where(and(eq(refreshOffers.id, offer.id), eq(refreshOffers.status, "offered"), offeredToHolder()))
        .run().changes;
      if (changed > 0) {
        recordAudit(tx, { studioId: offer.studioId, actorId: offer.userId, action: "refresh_offer.accepted", subjectType: "refresh_offer", subjectId: offer.id, data: { priceMinor: offer.priceMinor, currency: offer.currency } });
      }
    });
  }
  const page = getOfferByToken(token);
  // Handed on between the read above and the update: nothing was accepted.
  if (page.status === "expired") throw conflict("This offer is no longer open: the care it was for has moved on. The studio can send you a new one.");
  return page;
}
