import "server-only";
import { and, eq } from "drizzle-orm";
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
    .select({ offer: refreshOffers, pieceTitle: pieces.title, studioName: studios.name, studioEmail: studios.email, country: studios.country, unitSystem: users.unitSystem })
    .from(refreshOffers)
    .innerJoin(pieces, eq(pieces.id, refreshOffers.pieceId))
    .innerJoin(studios, eq(studios.id, refreshOffers.studioId))
    .innerJoin(users, eq(users.id, refreshOffers.userId))
    .where(eq(refreshOffers.id, id))
    .get();
  if (!row) throw notFound("This offer link is not valid. Use the link in the care e-mail.");
  return row;
}

function kindOfTaskKey(taskKey: string): CareTaskKind | undefined {
  const kind = taskKey.split(":")[1];
  return CARE_TASK_KINDS.find((k) => k === kind);
}

export function getOfferByToken(token: unknown): OfferPage {
  const { offer, pieceTitle, studioName, studioEmail, country, unitSystem } = offerRow(token);
  const kind = kindOfTaskKey(offer.taskKey);
  return {
    ...offerView(offer.quote, offerUrl(offer.id), unitSystem, country),
    status: offer.status,
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
  const { offer } = offerRow(token);
  if (offer.status === "declined" || offer.status === "expired") {
    throw conflict("This offer is no longer open: the care it was for has moved on. The studio can send you a new one.");
  }
  if (offer.status === "offered") {
    getDb().transaction((tx) => {
      const changed = tx
        .update(refreshOffers)
        .set({ status: "accepted", acceptedAt: now })
        .where(and(eq(refreshOffers.id, offer.id), eq(refreshOffers.status, "offered")))
        .run().changes;
      if (changed > 0) {
        recordAudit(tx, { studioId: offer.studioId, actorId: offer.userId, action: "refresh_offer.accepted", subjectType: "refresh_offer", subjectId: offer.id, data: { priceMinor: offer.priceMinor, currency: offer.currency } });
      }
    });
  }
  return getOfferByToken(token);
}
