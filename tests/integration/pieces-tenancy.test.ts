// Every registry and catalog function refuses another studio's staff with a 404 (never a 403), and
// changes nothing. The e2e spec checks the same over HTTP for every route.
import { eq } from "drizzle-orm";
import { describe, expect, it } from "vitest";
import sharp from "sharp";
import { getDb } from "@/db/client";
import { finishLayers, finishProducts, pieces } from "@/db/schema";
import { getCatalogProduct, updateCatalogProduct, archiveCatalogProduct, listCatalog } from "@/lib/catalog";
import { AppError } from "@/lib/errors";
import { renderDrawerCard } from "@/lib/pieces/card";
import { exportPiecesCsv } from "@/lib/pieces/csv";
import { addLayer, removeLayer, updateLayer } from "@/lib/pieces/layers";
import { addPiecePhoto } from "@/lib/pieces/photos";
import { createPiece, deletePiece, getPieceDetail, layerHistory, listPieces, reissueRegistrationCode, revealRegistrationCode, updatePiece } from "@/lib/pieces/registry";
import { createPieceSchema, layerSchema, pieceListQuerySchema } from "@/lib/validation/pieces";
import { createStudio, memberContext } from "../support/fixtures";

async function status(fn: () => unknown): Promise<number | "ok"> {
  try {
    await fn();
    return "ok";
  } catch (e) {
    if (e instanceof AppError) return e.status;
    throw e;
  }
}

describe("registry tenancy", () => {
  it("another studio's staff get 404 from every piece, layer, card, photo and catalog function", async () => {
    const a = createStudio({ name: "Studio A (invented)" });
    const b = createStudio({ name: "Studio B (invented)" });
    const staffA = await memberContext(a, "staff");
    const adminB = await memberContext(b, "admin");
    const { piece, registrationCode } = createPiece(staffA, createPieceSchema.parse({
      kind: "desk",
      title: "Studio A desk (invented)",
      shapeKind: "rectangle",
      lengthMm: 1400,
      widthMm: 700,
      primarySpeciesId: "black_cherry",
      use: "moderate",
      deliveredOn: "2025-02-01",
      layers: [{ surface: "top", finishClass: "paste_wax", coats: 2, appliedOn: "2025-01-30" }],
    }));
    const layer = getDb().select().from(finishLayers).where(eq(finishLayers.pieceId, piece.id)).get()!;
    const product = getDb().insert(finishProducts).values({ studioId: a.id, name: "A's wax (invented)", finishClass: "paste_wax", coverageM2PerL: 20 }).returning().get();
    const photo = new Uint8Array(await sharp({ create: { width: 8, height: 8, channels: 3, background: "#806040" } }).png().toBuffer());
    const checks: [string, () => unknown][] = [
      ["getPieceDetail", () => getPieceDetail(adminB, piece.id)],
      ["updatePiece", () => updatePiece(adminB, piece.id, { title: "taken" })],
      ["deletePiece", () => deletePiece(adminB, piece.id)],
      ["addLayer", () => addLayer(adminB, piece.id, layerSchema.parse({ surface: "top", finishClass: "paste_wax", coats: 1, appliedOn: "2025-03-01" }))],
      ["updateLayer", () => updateLayer(adminB, piece.id, layer.id, { coats: 5 })],
      ["removeLayer", () => removeLayer(adminB, piece.id, layer.id)],
      ["layerHistory", () => layerHistory(adminB, piece.id)],
      ["reissueRegistrationCode", () => reissueRegistrationCode(adminB, piece.id)],
      ["revealRegistrationCode", () => revealRegistrationCode(adminB, piece.id)],
      ["renderDrawerCard", () => renderDrawerCard(adminB, piece.id)],
      ["addPiecePhoto", () => addPiecePhoto(adminB, piece.id, async () => photo)],
      ["getCatalogProduct", () => getCatalogProduct(adminB, product.id)],
      ["updateCatalogProduct", () => updateCatalogProduct(adminB, product.id, { name: "taken" })],
      ["archiveCatalogProduct", () => archiveCatalogProduct(adminB, product.id)],
    ];
    for (const [name, fn] of checks) expect(await status(fn), name).toBe(404);
    // Own studio still works: the refusals above were about tenancy, not broken calls.
    expect(await status(() => addPiecePhoto(staffA, piece.id, async () => photo))).toBe("ok");
    expect(await status(() => updateLayer(staffA, piece.id, layer.id, { coats: 3 }))).toBe("ok");

    // A layer id of studio A's piece used under B's own piece is a 404 too.
    const mine = createPiece(adminB, createPieceSchema.parse({ kind: "shelf", title: "B shelf (invented)", shapeKind: "measured", measuredAreaM2: 0.3, primarySpeciesId: "red_oak", use: "light", deliveredOn: "2025-02-01" })).piece;
    expect(await status(() => updateLayer(adminB, mine.id, layer.id, { coats: 5 }))).toBe(404);
    expect(await status(() => removeLayer(adminB, mine.id, layer.id))).toBe(404);

    expect(listPieces(adminB, pieceListQuerySchema.parse({})).rows.map((r) => r.id)).toEqual([mine.id]);
    expect(listPieces(adminB, pieceListQuerySchema.parse({ q: registrationCode })).rows).toHaveLength(0);
    expect(exportPiecesCsv(adminB, pieceListQuerySchema.parse({}))).not.toContain("Studio A desk");
    expect(listCatalog(adminB).map((p) => p.id)).not.toContain(product.id);
    const after = getDb().select().from(pieces).where(eq(pieces.id, piece.id)).get()!;
    expect(after.title).toBe("Studio A desk (invented)");
    expect(after.archivedAt).toBeNull();
    expect(getDb().select().from(finishLayers).where(eq(finishLayers.pieceId, piece.id)).all().map((l) => l.coats)).toEqual([3]);
  });
});
