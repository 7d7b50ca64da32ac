// What the registry search keeps per process, each tied to the database's version or the clock: each
// row's next care (lib/pieces/registry-list.ts), the studio's warranty terms and the studio's date
// (lib/pieces/registry-sql.ts policyTerms, registry-common.ts today). The match count is not kept: it is
// counted for every request. A search repeated after a piece or policy is created, edited or deleted must
// show the change at once: the same query, asked again in the same process, against a real SQLite file.
import { eq } from "drizzle-orm";
import { describe, expect, it } from "vitest";
import { getDb } from "@/db/client";
import { warrantyPolicies } from "@/db/schema";
import { DEFAULT_WARRANTY_POLICY } from "@/lib/care/coverage";
import { createPiece, deletePiece, listPieces, updatePiece } from "@/lib/pieces/registry";
import { today } from "@/lib/pieces/registry-common";
import { createPieceSchema, pieceListQuerySchema, type CreatePieceInput } from "@/lib/validation/pieces";
import { createStudio, memberContext } from "../support/fixtures";

const base = (title: string, over: Partial<CreatePieceInput> = {}): CreatePieceInput => ({
  kind: "coffee_table",
  title,
  shapeKind: "rectangle",
  lengthMm: 1200,
  widthMm: 600,
  thicknessMm: 40,
  primarySpeciesId: "white_oak",
  resinKind: "none",
  use: "light",
  sun: "indirect",
  deliveredOn: "2025-03-01",
  layers: [{ surface: "top", finishClass: "hardwax_oil", coats: 2, appliedOn: "2025-02-27" }],
  ...over,
});

describe("registry search caches", () => {
  it("a repeated search counts again after a piece is created, edited or deleted", async () => {
    const ctx = await memberContext(createStudio(), "staff");
    // A page of 10 with more matches than that: the total comes from the count, not the page.
    const search = () => listPieces(ctx, pieceListQuerySchema.parse({ q: "quillback", pageSize: 10 }));
    const made = Array.from({ length: 11 }, (_, i) => createPiece(ctx, createPieceSchema.parse(base(`Quillback stool ${i + 1} (invented)`))).piece);
    expect(search().total).toBe(11);
    expect(search().total).toBe(11); // asked again: the same

    const added = createPiece(ctx, createPieceSchema.parse(base("Quillback desk (invented)"))).piece;
    expect(search().total).toBe(12);

    updatePiece(ctx, made[0]!.id, { title: "Plain bench (invented)" });
    expect(search().total).toBe(11);
    expect(listPieces(ctx, pieceListQuerySchema.parse({ q: "quillback", pageSize: 100 })).rows.map((r) => r.id)).not.toContain(made[0]!.id);

    expect(await deletePiece(ctx, added.id)).toEqual({ deleted: true, archived: false });
    // Ten left: a full first page of 10 still asks the count.
    expect(search().total).toBe(10);
    expect(listPieces(ctx, pieceListQuerySchema.parse({ q: "quillback", pageSize: 100 })).rows.map((r) => r.id).sort()).toEqual(made.slice(1).map((p) => p.id).sort());
  });

  it("a row's next care date follows an edit of the piece it depends on", async () => {
    const ctx = await memberContext(createStudio(), "staff");
    const { piece } = createPiece(ctx, createPieceSchema.parse(base("Sallowmere side table (invented)")));
    const row = () => listPieces(ctx, pieceListQuerySchema.parse({ q: "sallowmere" })).rows.find((r) => r.id === piece.id)!;
    const before = row().nextCare;
    expect(before).not.toBeNull();
    expect(row().nextCare).toEqual(before); // asked again: served from the cache
    // Delivered a year later, with no care logged: the care clocks that count from delivery move, so
    // the row's next care date moves too.
    updatePiece(ctx, piece.id, { deliveredOn: "2026-03-01" });
    const after = row();
    expect(after.deliveredOn).toBe("2026-03-01");
    expect(after.nextCare).not.toBeNull();
    expect(after.nextCare!.dueOn).not.toBe(before!.dueOn);
  });

  it("a row reads its finish classes from its layers (in layer order, each once) and its next care from the care engine's inputs once per change", async () => {
    const ctx = await memberContext(createStudio(), "staff");
    const layers: CreatePieceInput["layers"] = [
      { surface: "top", finishClass: "hardwax_oil", coats: 2, appliedOn: "2025-02-27" },
      { surface: "base", finishClass: "film_finish", coats: 1, appliedOn: "2025-02-27" },
      { surface: "edges", finishClass: "hardwax_oil", coats: 1, appliedOn: "2025-02-27" },
    ];
    const { piece } = createPiece(ctx, createPieceSchema.parse(base("Marrowbrook hall bench (invented)", { layers })));
    const row = () => listPieces(ctx, pieceListQuerySchema.parse({ q: "marrowbrook" })).rows.find((r) => r.id === piece.id)!;
    const first = row();
    // Layers in surface order (base, edges, top), each class once.
    expect(first.finishClasses).toEqual(["film_finish", "hardwax_oil"]);
    expect(first.nextCare).not.toBeNull();
    // Computed from the same inputs, the list sorted by next care agrees with the kept value.
    const sorted = listPieces(ctx, pieceListQuerySchema.parse({ q: "marrowbrook", sort: "next_due" })).rows.find((r) => r.id === piece.id)!;
    expect(sorted.nextCare).toEqual(first.nextCare);
    expect(row()).toEqual(first); // asked again: the kept next care, the same row
  });

  it("a row's warranty end follows an edit of the studio's warranty policy at once", async () => {
    const studio = createStudio({ timeZone: "UTC" });
    const ctx = await memberContext(studio, "staff");
    const policy = getDb().insert(warrantyPolicies).values({ studioId: studio.id, version: 1, effectiveFrom: "2000-01-01", policy: DEFAULT_WARRANTY_POLICY }).returning().get();
    const { piece } = createPiece(ctx, createPieceSchema.parse(base("Wrenfold console (invented)", { deliveredOn: "2025-03-01" })));
    expect(piece.warrantyPolicyId).toBe(policy.id);
    const now = new Date("2026-03-01T12:00:00Z");
    const row = () => listPieces(ctx, pieceListQuerySchema.parse({ q: "wrenfold" }), now).rows.find((r) => r.id === piece.id)!;
    const before = row();
    expect(before.warrantyEndsOn).not.toBeNull();
    expect(row()).toEqual(before); // asked again: the same

    // Every line of the policy now runs 7 years: the row's warranty end moves with the next search.
    const lines = Object.fromEntries(Object.entries(DEFAULT_WARRANTY_POLICY.lines).map(([k, l]) => [k, l && { ...l, termMonths: 84 }]));
    getDb().update(warrantyPolicies).set({ policy: { ...DEFAULT_WARRANTY_POLICY, lines } as typeof DEFAULT_WARRANTY_POLICY }).where(eq(warrantyPolicies.id, policy.id)).run();
    expect(row().warrantyEndsOn).toBe("2032-03-01");
    expect(row().underWarranty).toBe(true);
  });

  it("the studio's date turns at its local midnight, also in a zone with a 45-minute offset or, before 1973, a seconds offset", async () => {
    const at = async (timeZone: string, iso: string) => today(await memberContext(createStudio({ timeZone }), "staff"), new Date(iso));
    // Asia/Kathmandu is UTC+05:45: local midnight is 18:15 UTC (IANA tz database, zone Asia/Kathmandu).
    expect(await at("Asia/Kathmandu", "2026-03-01T18:14:00Z")).toBe("2026-03-01");
    expect(await at("Asia/Kathmandu", "2026-03-01T18:14:59.999Z")).toBe("2026-03-01");
    expect(await at("Asia/Kathmandu", "2026-03-01T18:15:00Z")).toBe("2026-03-02");
    // Africa/Monrovia was UTC−00:44:30 until 1972 (IANA tz database, zone Africa/Monrovia): midnight
    // fell at 00:44:30 UTC, inside a UTC minute.
    expect(await at("Africa/Monrovia", "1970-01-02T00:44:29Z")).toBe("1970-01-01");
    expect(await at("Africa/Monrovia", "1970-01-02T00:44:30Z")).toBe("1970-01-02");
    expect(await at("Africa/Monrovia", "1970-01-02T00:44:01Z")).toBe("1970-01-01");
  });
});
