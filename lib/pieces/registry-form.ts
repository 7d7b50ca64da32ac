// The new/edit piece form's page loader (guard included): units, catalog, members, today, and the
// record when editing.
import "server-only";
import { and, eq } from "drizzle-orm";
import { getDb } from "@/db/client";
import { clients } from "@/db/schema";
import { requireStaff } from "@/lib/auth/guards";
import { clientVisibleTo } from "@/lib/clients/access";
import type { PieceValues } from "@/lib/validation/pieces";
import { pieceSchema } from "@/lib/validation/pieces";
import { loadPiece, publicPiece, studioMembers, studioProducts, today } from "./registry-common";

/**
 * The new/edit piece form's context: units, catalog, members, today, and the record when editing; for a
 * new piece opened from a client's page, that client as the buyer (one of another studio, or none, is left out).
 */
export async function pieceFormContext(pieceId?: string, buyerClientId?: string) {
  const ctx = await requireStaff();
  const buyer =
    !pieceId && buyerClientId
      ? (getDb()
          .select({ id: clients.id, name: clients.name, email: clients.email })
          .from(clients)
          .where(and(eq(clients.id, buyerClientId), clientVisibleTo(ctx)))
          .get() ?? null)
      : null;
  const piece = pieceId ? publicPiece(loadPiece(ctx, pieceId)) : null;
  const initial = piece
    ? (Object.fromEntries(
        Object.keys(pieceSchema.shape).map((k) => [k, (piece as Record<string, unknown>)[k] ?? (k.endsWith("Mm") || k.endsWith("M2") || k.endsWith("Ml") || k.endsWith("On") || k === "resinTint" || k === "secondarySpeciesId" ? null : "")]),
      ) as Partial<PieceValues>)
    : undefined;
  return {
    piece,
    initial,
    unitSystem: ctx.studio.unitSystem,
    today: today(ctx),
    products: studioProducts(ctx.studio.id).filter((p) => !p.archivedAt).map((p) => ({ id: p.id, name: p.name, finishClass: p.finishClass })),
    members: studioMembers(ctx).map((m) => ({ id: m.id, name: m.name })),
    buyer: buyer ? { id: buyer.id, name: buyer.name, email: buyer.email ?? "" } : null,
  };
}
