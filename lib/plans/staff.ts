// What staff see of plans on a client's page: for each of the client's pieces, the plan it is under
// (and how it is paid) or the plans that fit it, to start one for a client who pays by other means.
import { and, eq, inArray } from "drizzle-orm";
import { getDb } from "@/db/client";
import { pieces } from "@/db/schema";
import type { StudioActor } from "@/lib/auth/actor";
import { piecePlan, type PiecePlan } from "./offers";
import { planPrice } from "./price";
import { templatesFitting } from "./templates";

export type ClientPiecePlans = { pieceId: string; title: string; hasOwner: boolean; plan: PiecePlan | null; fitting: { id: string; name: string; priceMinor: number; interval: "year" | "month"; currency: string }[] };

export function clientPiecePlans(ctx: StudioActor, pieceIds: readonly string[]): ClientPiecePlans[] {
  if (pieceIds.length === 0) return [];
  const rows = getDb()
    .select()
    .from(pieces)
    .where(and(eq(pieces.studioId, ctx.studio.id), inArray(pieces.id, [...pieceIds])))
    .all();
  return rows.map((piece) => {
    const plan = piecePlan(piece.id);
    const fitting = plan || !piece.ownerId ? [] : templatesFitting(piece).map((t) => ({ id: t.id, name: t.name, priceMinor: planPrice(ctx.studio, t).totalMinor, interval: t.interval, currency: t.currency }));
    return { pieceId: piece.id, title: piece.title, hasOwner: Boolean(piece.ownerId), plan, fitting };
  });
}
