import "server-only";
import { eq } from "drizzle-orm";
import { getDb } from "@/db/client";
import { pieces } from "@/db/schema";
import type { StudioContext } from "@/lib/auth/guards";
import { loadClient } from "@/lib/clients/access";
import { insertClient } from "@/lib/clients/create";
import { AppError, rephrased } from "@/lib/errors";
import type { DeliverPieceValues } from "@/lib/validation/clients";
import { handoverAtDelivery } from "./handover";
import { insertPiece, publicPiece, type PublicPiece } from "./registry";

// Recording a delivered piece with its buyer: a client already on record, or a new one typed in
// the same form (their e-mail, phone and the delivery address; service-mail consent as given in
// person when staff tick it). The piece and the new client are written in one transaction; the
// hand-over mail goes out after it, when staff asked for it and the buyer can get it.

export type Delivered = {
  piece: PublicPiece;
  registrationCode: string;
  clientId: string | null;
  handover: { sent: boolean; reason: string | null };
};

/** A field error of the client record, shown beside the buyer's field of the piece form. */
function asBuyerFieldError(e: unknown): unknown {
  if (!(e instanceof AppError) || !e.fieldErrors) return e;
  const map: Record<string, string> = { email: "buyerEmail", phone: "buyerPhone", name: "buyerName" };
  const fieldErrors = Object.fromEntries(Object.entries(e.fieldErrors).map(([k, v]) => [map[k] ?? k, v]));
  const message = e.status === 409 ? "A client of this studio already has that e-mail address: pick them from your clients instead." : e.message;
  if (e.status === 409) fieldErrors.buyerEmail = [message];
  return rephrased(e, message, fieldErrors);
}

/** POST /api/pieces: the piece, its first layers and its buyer; then the hand-over mail if asked for. */
export async function deliverPiece(ctx: StudioContext, values: DeliverPieceValues, now = new Date()): Promise<Delivered> {
  const { buyer, buyerClientId, buyerName, buyerEmail, buyerPhone, buyerServiceMail, sendHandover, ...pieceInput } = values;
  const { piece, code, clientId } = getDb().transaction((tx) => {
    let clientId: string | null = null;
    if (buyer === "existing") clientId = loadClient(ctx, buyerClientId, tx).id;
    if (buyer === "new") {
      try {
        clientId = insertClient(
          ctx,
          tx,
          {
            name: buyerName,
            email: buyerEmail,
            phone: buyerPhone,
            address: pieceInput.deliveryAddress ?? "",
            preferredContact: "email",
            timeZone: "",
            notes: "",
            consent: buyerServiceMail ? { service: { granted: true, source: "in_person", note: "Recorded with their piece at delivery." } } : undefined,
          },
          now,
        ).id;
      } catch (e) {
        throw asBuyerFieldError(e);
      }
    }
    const { piece, code } = insertPiece(ctx, tx, pieceInput);
    if (clientId) tx.update(pieces).set({ clientId }).where(eq(pieces.id, piece.id)).run();
    return { piece: { ...piece, clientId }, code, clientId };
  });
  const handover = clientId && sendHandover ? await handoverAtDelivery(ctx, piece.id, now) : { sent: false, reason: null };
  return { piece: publicPiece(piece), registrationCode: code, clientId, handover };
}
