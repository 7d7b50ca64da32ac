// Recording a new piece (POST /api/pieces, and each row of an import): the record checked, its layers,
// a registration code, the warranty policy in force at delivery, the search index row and an audit entry.
import "server-only";
import { and, desc, eq, sql } from "drizzle-orm";
import { getDb } from "@/db/client";
import { finishProducts, memberships, pieces, warrantyPolicies, type Piece } from "@/db/schema";
import type { StudioContext } from "@/lib/auth/guards";
import { recordAudit } from "@/lib/audit";
import type { FinishClass } from "@/lib/care/vocabulary";
import { badRequest } from "@/lib/errors";
import type { CreatePieceValues, pieceSchema } from "@/lib/validation/pieces";
import { insertLayers } from "./layers";
import { publicPiece, type PublicPiece } from "./registry-common";
import { newRegistrationCode } from "./registration";
import { indexPiece, type DbOrTx } from "./search-index";

/** A layer's product must be in the studio's catalog (of the layer's class) and its applier a member. */
export function checkLayerRefs(ctx: StudioContext, db: DbOrTx, layer: { productId?: string | null; appliedById?: string | null; finishClass: FinishClass }, field = ""): void {
  if (layer.productId) {
    const p = db.select().from(finishProducts).where(and(eq(finishProducts.id, layer.productId), eq(finishProducts.studioId, ctx.studio.id))).get();
    if (!p) throw badRequest("That finish product is not in this studio's catalog.", { [`${field}productId`]: ["Pick a product from the catalog."] });
    if (p.finishClass !== layer.finishClass) {
      throw badRequest("The product's class and the layer's class differ.", { [`${field}finishClass`]: [`${p.name} is a different finish class; pick its class or another product.`] });
    }
  }
  if (layer.appliedById) {
    const m = db.select({ id: memberships.id }).from(memberships).where(and(eq(memberships.studioId, ctx.studio.id), eq(memberships.userId, layer.appliedById))).get();
    if (!m) throw badRequest("Applied by must be a member of this studio.", { [`${field}appliedById`]: ["Pick a studio member."] });
  }
}


/** The piece columns of a checked record (shape and resin fields that do not apply are null). */
export function pieceColumns(v: ReturnType<typeof pieceSchema.parse>) {
  const resin = v.resinKind !== "none";
  const shape = v.shapeKind;
  return {
    kind: v.kind,
    title: v.title,
    shapeKind: shape,
    lengthMm: shape === "rectangle" || shape === "oval" ? (v.lengthMm ?? null) : null,
    widthMm: shape === "rectangle" || shape === "oval" ? (v.widthMm ?? null) : null,
    diameterMm: shape === "round" ? (v.diameterMm ?? null) : null,
    measuredAreaM2: shape === "measured" ? (v.measuredAreaM2 ?? null) : null,
    thicknessMm: v.thicknessMm ?? null,
    primarySpeciesId: v.primarySpeciesId,
    secondarySpeciesId: v.secondarySpeciesId || null,
    resinKind: v.resinKind,
    resinPouredOn: resin ? (v.resinPouredOn ?? null) : null,
    resinVolumeMl: resin ? (v.resinVolumeMl ?? null) : null,
    resinTint: resin ? v.resinTint || null : null,
    baseMaterial: v.baseMaterial,
    baseFinish: v.baseFinish,
    use: v.use,
    sun: v.sun,
    deliveredOn: v.deliveredOn,
    deliveryAddress: v.deliveryAddress,
    internalNotes: v.internalNotes,
  };
}

/** The warranty policy version in force at a delivery date: the newest whose effectiveFrom is on or before it. */
function policyAt(db: DbOrTx, studioId: string, deliveredOn: string): string | null {
  return (
    db
      .select({ id: warrantyPolicies.id })
      .from(warrantyPolicies)
      .where(and(eq(warrantyPolicies.studioId, studioId), sql`${warrantyPolicies.effectiveFrom} <= ${deliveredOn}`))
      .orderBy(desc(warrantyPolicies.version))
      .get()?.id ?? null
  );
}

/** Inserts one piece (and its layers) inside a transaction: index row and audit entry included. */
export function insertPiece(ctx: StudioContext, tx: DbOrTx, input: CreatePieceValues, via: "form" | "import" = "form"): { piece: Piece; code: string } {
  const { code, hash, enc } = newRegistrationCode();
  const piece = tx
    .insert(pieces)
    .values({
      ...pieceColumns(input),
      studioId: ctx.studio.id,
      registrationCodeHash: hash,
      registrationCodeEnc: enc,
      warrantyPolicyId: policyAt(tx, ctx.studio.id, input.deliveredOn),
    })
    .returning()
    .get();
  if (input.layers?.length) {
    input.layers.forEach((l, i) => checkLayerRefs(ctx, tx, l, `layers.${i}.`));
    insertLayers(ctx, tx, piece.id, input.layers);
  }
  recordAudit(tx, { studioId: ctx.studio.id, actorId: ctx.user.id, action: "piece.created", subjectType: "piece", subjectId: piece.id, data: { via, title: piece.title, layers: input.layers?.length ?? 0 } });
  indexPiece(tx, piece.id);
  return { piece, code };
}

/** POST /api/pieces: the new piece with its registration code (shown once here and on the drawer card). */
export function createPiece(ctx: StudioContext, input: CreatePieceValues): { piece: PublicPiece; registrationCode: string } {
  const { piece, code } = getDb().transaction((tx) => insertPiece(ctx, tx, input));
  return { piece: publicPiece(piece), registrationCode: code };
}
