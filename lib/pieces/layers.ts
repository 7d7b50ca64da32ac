import "server-only";
import { and, asc, eq } from "drizzle-orm";
import { getDb } from "@/db/client";
import { finishLayers, finishProducts, pieces, type FinishLayer } from "@/db/schema";
import type { StudioContext } from "@/lib/auth/guards";
import { recordAudit } from "@/lib/audit";
import type { CareSchedule } from "@/lib/care/schedule";
import type { Surface } from "@/lib/care/vocabulary";
import { notFound } from "@/lib/errors";
import { layerSchema, type LayerPatch, type LayerValues } from "@/lib/validation/pieces";
import { scheduleFromRows } from "./care-inputs";
import { checkLayerRefs, loadPiece, studioProducts } from "./registry";
import { indexPiece, type DbOrTx } from "./search-index";
import { inWords } from "@/lib/validation/words";

// The finish stack: ordered layers per surface (position 0 = closest to the wood). Every change is
// written to the audit log with the layer before and after, so the stack's history is kept.

function surfaceLayers(tx: DbOrTx, pieceId: string, surface: Surface): FinishLayer[] {
  return tx.select().from(finishLayers).where(and(eq(finishLayers.pieceId, pieceId), eq(finishLayers.surface, surface))).orderBy(asc(finishLayers.position), asc(finishLayers.createdAt)).all();
}

function renumber(tx: DbOrTx, ordered: FinishLayer[]): void {
  ordered.forEach((l, i) => {
    if (l.position !== i) tx.update(finishLayers).set({ position: i }).where(eq(finishLayers.id, l.id)).run();
  });
}

/** Fills the product label from the catalog when the layer names a product and no label was typed. */
function withLabel(tx: DbOrTx, studioId: string, v: Pick<LayerValues, "productId" | "productLabel">): string {
  if (v.productLabel || !v.productId) return v.productLabel ?? "";
  return tx.select({ name: finishProducts.name }).from(finishProducts).where(and(eq(finishProducts.id, v.productId), eq(finishProducts.studioId, studioId))).get()?.name ?? "";
}

/** Appends layers to their surfaces' stacks (no audit: the caller records what it did). */
export function insertLayers(ctx: StudioContext, tx: DbOrTx, pieceId: string, layers: LayerValues[]): FinishLayer[] {
  const next: Partial<Record<Surface, number>> = {};
  return layers.map((l) => {
    const position = next[l.surface] ?? surfaceLayers(tx, pieceId, l.surface).length;
    next[l.surface] = position + 1;
    return tx
      .insert(finishLayers)
      .values({
        studioId: ctx.studio.id,
        pieceId,
        surface: l.surface,
        position,
        finishClass: l.finishClass,
        productId: l.productId || null,
        productLabel: withLabel(tx, ctx.studio.id, l),
        coats: l.coats,
        appliedOn: l.appliedOn,
        appliedById: l.appliedById || null,
        batchLot: l.batchLot,
        notes: l.notes,
      })
      .returning()
      .get();
  });
}

function scheduleOf(ctx: StudioContext, pieceId: string, now = new Date()): CareSchedule | null {
  const db = getDb();
  const piece = db.select().from(pieces).where(eq(pieces.id, pieceId)).get()!;
  const layers = db.select().from(finishLayers).where(eq(finishLayers.pieceId, pieceId)).all();
  try {
    return scheduleFromRows({ piece, layers, careLog: db.query.careLogEntries.findMany({ where: (c, { eq: e }) => e(c.pieceId, pieceId) }).sync(), products: studioProducts(ctx.studio.id), timeZone: ctx.studio.timeZone, now });
  } catch {
    return null;
  }
}

function touch(tx: DbOrTx, pieceId: string) {
  tx.update(pieces).set({ updatedAt: new Date() }).where(eq(pieces.id, pieceId)).run();
}

function snapshot(l: FinishLayer) {
  return { surface: l.surface, position: l.position, finishClass: l.finishClass, productId: l.productId, productLabel: l.productLabel, coats: l.coats, appliedOn: l.appliedOn, appliedById: l.appliedById, batchLot: l.batchLot, notes: l.notes };
}

/** POST /api/pieces/[id]/layers: adds a layer on top of its surface's stack; returns the recomputed care schedule. */
export function addLayer(ctx: StudioContext, pieceId: string, input: LayerValues) {
  const layer = getDb().transaction((tx) => {
    loadPiece(ctx, pieceId, tx);
    checkLayerRefs(ctx, tx, input);
    const [layer] = insertLayers(ctx, tx, pieceId, [input]);
    recordAudit(tx, { studioId: ctx.studio.id, actorId: ctx.user.id, action: "layer.added", subjectType: "piece", subjectId: pieceId, data: { layerId: layer!.id, after: snapshot(layer!) } });
    touch(tx, pieceId);
    indexPiece(tx, pieceId);
    return layer!;
  });
  return { layer, schedule: scheduleOf(ctx, pieceId) };
}

function loadLayer(ctx: StudioContext, tx: DbOrTx, pieceId: string, layerId: string): FinishLayer {
  loadPiece(ctx, pieceId, tx);
  const layer = tx.select().from(finishLayers).where(and(eq(finishLayers.id, layerId), eq(finishLayers.pieceId, pieceId), eq(finishLayers.studioId, ctx.studio.id))).get();
  if (!layer) throw notFound("No such finish layer on this piece.");
  return layer;
}

/** PATCH /api/pieces/[id]/layers/[layerId]: edits a layer, moves it within its stack, or to another surface. */
export function updateLayer(ctx: StudioContext, pieceId: string, layerId: string, patch: LayerPatch) {
  const layer = getDb().transaction((tx) => {
    const current = loadLayer(ctx, tx, pieceId, layerId);
    const { position, ...fields } = patch;
    const merged = layerSchema.parse({ ...current, ...Object.fromEntries(Object.entries(fields).filter(([, v]) => v !== undefined)) }, { error: inWords });
    checkLayerRefs(ctx, tx, merged);
    const surfaceChanged = merged.surface !== current.surface;
    tx.update(finishLayers)
      .set({
        surface: merged.surface,
        finishClass: merged.finishClass,
        productId: merged.productId || null,
        productLabel: fields.productLabel !== undefined || fields.productId !== undefined ? withLabel(tx, ctx.studio.id, merged) : current.productLabel,
        coats: merged.coats,
        appliedOn: merged.appliedOn,
        appliedById: merged.appliedById || null,
        batchLot: merged.batchLot,
        notes: merged.notes,
        position: surfaceChanged ? 10_000 : current.position,
      })
      .where(eq(finishLayers.id, layerId))
      .run();
    if (surfaceChanged) renumber(tx, surfaceLayers(tx, pieceId, current.surface));
    if (position !== undefined || surfaceChanged) {
      const stack = surfaceLayers(tx, pieceId, merged.surface).filter((l) => l.id !== layerId);
      const me = tx.select().from(finishLayers).where(eq(finishLayers.id, layerId)).get()!;
      const at = Math.min(position ?? stack.length, stack.length);
      stack.splice(at, 0, me);
      renumber(tx, stack);
    }
    const updated = tx.select().from(finishLayers).where(eq(finishLayers.id, layerId)).get()!;
    const moved = updated.position !== current.position || surfaceChanged;
    const edited = JSON.stringify({ ...snapshot(updated), position: 0, surface: "" }) !== JSON.stringify({ ...snapshot(current), position: 0, surface: "" });
    if (moved || edited) {
      recordAudit(tx, {
        studioId: ctx.studio.id,
        actorId: ctx.user.id,
        action: edited ? "layer.updated" : "layer.moved",
        subjectType: "piece",
        subjectId: pieceId,
        data: { layerId, before: snapshot(current), after: snapshot(updated) },
      });
      touch(tx, pieceId);
      indexPiece(tx, pieceId);
    }
    return updated;
  });
  return { layer, schedule: scheduleOf(ctx, pieceId) };
}

/** DELETE /api/pieces/[id]/layers/[layerId]: removes a layer; the rest of its stack closes up. */
export function removeLayer(ctx: StudioContext, pieceId: string, layerId: string) {
  getDb().transaction((tx) => {
    const current = loadLayer(ctx, tx, pieceId, layerId);
    tx.delete(finishLayers).where(eq(finishLayers.id, layerId)).run();
    renumber(tx, surfaceLayers(tx, pieceId, current.surface));
    recordAudit(tx, { studioId: ctx.studio.id, actorId: ctx.user.id, action: "layer.removed", subjectType: "piece", subjectId: pieceId, data: { layerId, before: snapshot(current) } });
    touch(tx, pieceId);
    indexPiece(tx, pieceId);
  });
  return { removed: true, schedule: scheduleOf(ctx, pieceId) };
}
