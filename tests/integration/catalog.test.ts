// The finish catalog: defaults from lib/care/intervals.ts stay null (the care engine's defaults apply), edited
// intervals drive the care schedule, archiving keeps layers' labels.
import { describe, expect, it } from "vitest";
import { archiveCatalogProduct, createCatalogProduct, listCatalog, updateCatalogProduct } from "@/lib/catalog";
import { catalogProductSchema, createPieceSchema, layerSchema } from "@/lib/validation/pieces";
import { addLayer } from "@/lib/pieces/layers";
import { createPiece, getPieceDetail } from "@/lib/pieces/registry";
import { createStudio, memberContext } from "../support/fixtures";

describe("finish catalog", () => {
  it("stores only intervals that differ from the defaults, and the schedule uses them", async () => {
    const studio = createStudio();
    const admin = await memberContext(studio, "admin");
    const p = createCatalogProduct(admin, { name: "Test oil (invented)", finishClass: "hardwax_oil", coverageM2PerL: 24, containers: [{ ml: 250, priceMinor: 1900 }], intervalHeavyMonths: 12, intervalModerateMonths: 20, intervalLightMonths: null });
    expect([p.intervalHeavyMonths, p.intervalModerateMonths, p.intervalLightMonths]).toEqual([null, 20, null]);
    expect(listCatalog(admin)[0]!.defaults).toEqual({ heavy: 12, moderate: 24, light: 36 });
    const { piece } = createPiece(admin, createPieceSchema.parse({ kind: "desk", title: "Desk (invented)", shapeKind: "rectangle", lengthMm: 1200, widthMm: 600, primarySpeciesId: "white_ash", use: "moderate", deliveredOn: "2025-01-10" }));
    addLayer(admin, piece.id, layerSchema.parse({ surface: "top", finishClass: "hardwax_oil", productId: p.id, coats: 2, appliedOn: "2025-01-10" }));
    const reoil = getPieceDetail(admin, piece.id, new Date("2025-02-01T12:00:00Z")).schedule!.tasks.find((t) => t.kind === "reoil")!;
    expect(reoil.dueOn).toBe("2026-09-10");
    expect(reoil.reasons.join(" ")).toContain("Test oil (invented)");
    updateCatalogProduct(admin, p.id, { intervalModerateMonths: 24 });
    const back = getPieceDetail(admin, piece.id, new Date("2025-02-01T12:00:00Z")).schedule!.tasks.find((t) => t.kind === "reoil")!;
    expect(back.dueOn).toBe("2027-01-10");
    const archived = archiveCatalogProduct(admin, p.id);
    expect(archived.archivedAt).not.toBeNull();
    expect(archived.containers).toEqual([{ ml: 250, priceMinor: 1900 }]); // a partial edit keeps the rest
    expect(getPieceDetail(admin, piece.id).layers[0]!.productLabel).toBe("Test oil (invented)");
  });

  it("rejects bad numbers field by field (the schema app/api/catalog's routes parse with, once)", () => {
    const parsed = catalogProductSchema.safeParse({ name: "", finishClass: "hardwax_oil", coverageM2PerL: -1, containers: [{ ml: 0, priceMinor: 1.5 }] });
    expect(parsed.success).toBe(false);
    expect(parsed.error!.issues.map((i) => i.path.join("."))).toEqual(expect.arrayContaining(["name", "coverageM2PerL", "containers.0.ml", "containers.0.priceMinor"]));
  });

  it("staff read the catalog but only admins change it, wherever it is called from", async () => {
    const studio = createStudio();
    const admin = await memberContext(studio, "admin");
    const staff = await memberContext(studio, "staff");
    const p = createCatalogProduct(admin, { name: "Test wax (invented)", finishClass: "hardwax_oil", coverageM2PerL: 20, containers: [] });
    expect(listCatalog(staff).map((r) => r.id)).toContain(p.id);
    const refusals = [() => createCatalogProduct(staff, { name: "Other (invented)", finishClass: "hardwax_oil", coverageM2PerL: 20, containers: [] }), () => updateCatalogProduct(staff, p.id, { name: "renamed" }), () => archiveCatalogProduct(staff, p.id)];
    for (const refused of refusals) expect(refused).toThrow(expect.objectContaining({ status: 403, message: "Only the studio's admins can change the finish catalog." }));
  });
});
