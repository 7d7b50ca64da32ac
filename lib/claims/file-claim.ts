import "server-only";
import { and, eq, isNull } from "drizzle-orm";
import type { User } from "lucia";
import type { z } from "zod";
import { getDb } from "@/db/client";
import { claims, pieces, studios } from "@/db/schema";
import { recordAudit } from "@/lib/audit";
import type { Actor } from "@/lib/auth/actor";
import { localDate } from "@/lib/care/dates";
import { notFound, unprocessable } from "@/lib/errors";
import type { createClaimSchema } from "@/lib/validation/claims";
import { studioOf } from "./claim-row";
import { mailClaimReceived } from "./mail";

// An owner files a claim on one of their pieces: the form's context, then the claim itself.

/** The claim form's values as parsed by createClaimSchema (temperatures in °C). */
export type FileClaimInput = z.output<typeof createClaimSchema>;

/** What the claim form needs about one of the owner's pieces; someone else's piece is a 404. */
export function claimFormContext(user: Pick<User, "id" | "unitSystem">, pieceId: string) {
  const row = getDb()
    .select({ id: pieces.id, title: pieces.title, deliveredOn: pieces.deliveredOn, studioName: studios.name, timeZone: studios.timeZone })
    .from(pieces)
    .innerJoin(studios, eq(studios.id, pieces.studioId))
    .where(and(eq(pieces.id, pieceId), eq(pieces.ownerId, user.id), isNull(pieces.archivedAt)))
    .get();
  if (!row) throw notFound("No piece of yours with that id.");
  return { piece: row, today: localDate(Date.now(), row.timeZone), unit: user.unitSystem === "imperial" ? ("F" as const) : ("C" as const) };
}

export async function createClaim(actor: Actor, input: FileClaimInput) {
  const db = getDb();
  const piece = db
    .select()
    .from(pieces)
    .where(and(eq(pieces.id, input.pieceId), eq(pieces.ownerId, actor.user.id), isNull(pieces.archivedAt)))
    .get();
  if (!piece) throw notFound("No piece of yours with that id.");
  const studio = studioOf(piece.studioId);
  const today = localDate(Date.now(), studio.timeZone);
  if (input.noticedOn > today) throw unprocessable("invalid_date", "That date is in the future.", { noticedOn: ["That date is in the future."] });
  if (input.noticedOn < piece.deliveredOn) {
    const msg = `The piece was delivered on ${piece.deliveredOn}; pick a date after that.`;
    throw unprocessable("invalid_date", msg, { noticedOn: [msg] });
  }
  const claim = db.transaction((tx) => {
    const row = tx
      .insert(claims)
      .values({
        studioId: piece.studioId,
        pieceId: piece.id,
        ownerId: actor.user.id,
        category: input.category,
        noticedOn: input.noticedOn,
        description: input.description,
        answers: input.answers,
        state: "submitted",
      })
      .returning()
      .get();
    recordAudit(tx, { studioId: piece.studioId, actorId: actor.user.id, action: "claim.submitted", subjectType: "claim", subjectId: row.id, data: { pieceId: piece.id, category: input.category } });
    return row;
  });
  await mailClaimReceived({ claim, piece, studio, owner: actor.user });
  return { id: claim.id, state: claim.state, version: claim.version, category: claim.category, pieceId: claim.pieceId, createdAt: claim.createdAt.toISOString() };
}
