// The piece registry against a real SQLite file: create, edit, the finish stack, codes, search, CSV.
import { eq } from "drizzle-orm";
import { describe, expect, it } from "vitest";
import { getDb } from "@/db/client";
import { finishLayers, finishProducts, pieces, warrantyPolicies } from "@/db/schema";
import { DEFAULT_WARRANTY_POLICY } from "@/lib/care/coverage";
import { AppError } from "@/lib/errors";
import { importPiecesCsv, exportPiecesCsv } from "@/lib/pieces/csv";
import { addLayer, removeLayer, updateLayer } from "@/lib/pieces/layers";
import { createPiece, deletePiece, findByTypedCode, getPieceDetail, layerHistory, listPieces, reissueRegistrationCode, SEARCH_COUNT_CAP, updatePiece } from "@/lib/pieces/registry";
import { createPieceSchema, layerSchema, pieceListQuerySchema, type CreatePieceInput } from "@/lib/validation/pieces";
import { ftsQuery, indexPiece } from "@/lib/pieces/search-index";
import { auditsOf, createStudio, createUser, memberContext, unique } from "../support/fixtures";

const base = (over: Partial<CreatePieceInput> = {}): CreatePieceInput => ({
  kind: "dining_table",
  title: "Walnut river table (invented)",
  shapeKind: "rectangle",
  lengthMm: 2400,
  widthMm: 1000,
  thicknessMm: 50,
  primarySpeciesId: "black_walnut",
  resinKind: "deep_pour",
  resinPouredOn: "2025-04-20",
  resinVolumeMl: 12000,
  resinTint: "clear",
  use: "heavy",
  sun: "indirect",
  deliveredOn: "2025-05-01",
  ...over,
});

async function expectStatus(fn: () => unknown, status: number) {
  let caught: unknown;
  try {
    await fn();
  } catch (e) {
    caught = e;
  }
  expect(caught, `expected a ${status}`).toBeInstanceOf(AppError);
  expect((caught as AppError).status).toBe(status);
}

function layerRows(pieceId: string) {
  return getDb().select().from(finishLayers).where(eq(finishLayers.pieceId, pieceId)).all().sort((a, b) => (a.surface + a.position).localeCompare(b.surface + b.position));
}

describe("piece records", () => {
  it("creates a piece with layers, a sealed registration code and its computed area and schedule", async () => {
    const studio = createStudio();
    const ctx = await memberContext(studio, "staff");
    const { piece, registrationCode } = createPiece(ctx, createPieceSchema.parse({
      ...base(),
      layers: [
        { surface: "top", finishClass: "hardwax_oil", coats: 2, appliedOn: "2025-04-28" },
        { surface: "top", finishClass: "ceramic_topcoat", coats: 1, appliedOn: "2025-04-30" },
      ],
    }));
    expect(registrationCode).toMatch(/^[0-9A-Z]{4}-[0-9A-Z]{4}-[0-9A-Z]{4}-[0-9A-Z*~$=]$/);
    expect(piece).not.toHaveProperty("registrationCodeHash");
    const row = getDb().select().from(pieces).where(eq(pieces.id, piece.id)).get()!;
    expect(row.registrationCodeHash).not.toContain(registrationCode.replace(/-/g, ""));
    expect(row.registrationCodeEnc).not.toContain(registrationCode);
    const detail = getPieceDetail(ctx, piece.id, new Date("2025-06-01T12:00:00Z"));
    expect(detail.area!.m2).toBeCloseTo(2.4, 6);
    expect(detail.layers.map((l) => [l.surface, l.position, l.finishClass])).toEqual([
      ["top", 0, "hardwax_oil"],
      ["top", 1, "ceramic_topcoat"],
    ]);
    expect(detail.schedule!.tasks.map((t) => t.kind)).toContain("topcoat_refresh");
    expect(detail.schedule!.tasks.find((t) => t.kind === "topcoat_refresh")!.reasons[0]).toContain("2025-04-30");
    expect(detail.timeline.some((e) => e.kind === "delivered" && e.on === "2025-05-01")).toBe(true);
    // The timeline is read by people: surfaces and finish classes in words, no enum value.
    const layerTexts = detail.timeline.filter((e) => e.kind === "layer").map((e) => e.text);
    expect(layerTexts).toHaveLength(2);
    for (const t of layerTexts) expect(t).toMatch(/^Top: /);
    for (const e of detail.timeline) expect(e.text).not.toMatch(/_|\btop:/);
  });

  it("rejects a record whose shape lacks its sizes, and an unknown species, field by field", async () => {
    const ctx = await memberContext(createStudio(), "staff");
    let caught: unknown;
    try {
      createPiece(ctx, createPieceSchema.parse({ ...base(), shapeKind: "round", diameterMm: null, primarySpeciesId: "unobtainium" }));
    } catch (e) {
      caught = e;
    }
    const issues = (caught as { issues: { path: string[] }[] }).issues.map((i) => i.path.join("."));
    expect(issues).toEqual(expect.arrayContaining(["diameterMm", "primarySpeciesId"]));
  });

  it("edits a record, checks the merged record and keeps the change in the audit log", async () => {
    const studio = createStudio();
    const ctx = await memberContext(studio, "staff");
    const { piece } = createPiece(ctx, createPieceSchema.parse(base()));
    const updated = updatePiece(ctx, piece.id, { title: "Walnut river table, renamed", shapeKind: "oval" });
    expect(updated.title).toBe("Walnut river table, renamed");
    expect(updated.shapeKind).toBe("oval");
    expect(updated.resinKind).toBe("deep_pour"); // fields not sent keep their value
    expect(updated.resinTint).toBe("clear");
    expect(() => updatePiece(ctx, piece.id, { shapeKind: "measured" })).toThrow(); // no measured area
    const audit = auditsOf(piece.id, "piece.updated");
    expect(audit).toHaveLength(1);
    expect(audit[0]!.data).toMatchObject({ before: { title: "Walnut river table (invented)" }, after: { title: "Walnut river table, renamed" } });
    expect(listPieces(ctx, pieceListQuerySchema.parse({ q: "renamed" })).rows.map((r) => r.id)).toEqual([piece.id]);
  });

  it("deletes an unregistered piece, and archives a registered one instead", async () => {
    const studio = createStudio();
    const ctx = await memberContext(studio, "staff");
    const a = createPiece(ctx, createPieceSchema.parse(base())).piece;
    const owner = await createUser();
    const b = createPiece(ctx, createPieceSchema.parse(base())).piece;
    getDb().update(pieces).set({ ownerId: owner.id, registeredAt: new Date() }).where(eq(pieces.id, b.id)).run();
    expect(await deletePiece(ctx, a.id)).toEqual({ deleted: true, archived: false });
    expect(getDb().select().from(pieces).where(eq(pieces.id, a.id)).get()).toBeUndefined();
    expect(await deletePiece(ctx, b.id)).toEqual({ deleted: false, archived: true });
    expect(getDb().select().from(pieces).where(eq(pieces.id, b.id)).get()!.archivedAt).not.toBeNull();
    expect(listPieces(ctx, pieceListQuerySchema.parse({})).rows.map((r) => r.id)).not.toContain(b.id);
    expect(listPieces(ctx, pieceListQuerySchema.parse({ archived: "only" })).rows.map((r) => r.id)).toEqual([b.id]);
  });
});

describe("finish stack", () => {
  it("adds, reorders and removes layers, recomputing the schedule and keeping the history", async () => {
    const studio = createStudio();
    const ctx = await memberContext(studio, "staff");
    const product = getDb().insert(finishProducts).values({ studioId: studio.id, name: "Test topcoat (invented)", finishClass: "ceramic_topcoat", coverageM2PerL: 180, intervalHeavyMonths: 7 }).returning().get();
    const { piece } = createPiece(ctx, createPieceSchema.parse(base()));
    const now = new Date("2025-06-01T12:00:00Z");
    const first = addLayer(ctx, piece.id, layerSchema.parse({ surface: "top", finishClass: "hardwax_oil", coats: 2, appliedOn: "2025-04-28", batchLot: "LOT-1" }));
    expect(first.schedule!.tasks.map((t) => t.kind)).toContain("reoil");
    const second = addLayer(ctx, piece.id, layerSchema.parse({ surface: "top", finishClass: "ceramic_topcoat", productId: product.id, coats: 1, appliedOn: "2025-04-30", appliedById: ctx.user.id }));
    // The topcoat takes over the oil's care. Its clock runs on the longer of its catalog's 7 months and
    // the oil's own 12 (hardwax oil, heavy use): a topcoat never shortens the care of what it covers
    // (stackedLayerInterval in lib/care/schedule.ts). 2025-04-30 + 12 months.
    const topcoat = second.schedule!.tasks.find((t) => t.kind === "topcoat_refresh")!;
    expect(second.schedule!.tasks.map((t) => t.kind)).not.toContain("reoil");
    expect(topcoat.dueOn).toBe("2026-04-30");
    expect(second.layer.productLabel).toBe("Test topcoat (invented)");
    const third = addLayer(ctx, piece.id, layerSchema.parse({ surface: "base", finishClass: "hardwax_oil", coats: 1, appliedOn: "2025-04-28" }));
    const fourth = addLayer(ctx, piece.id, layerSchema.parse({ surface: "top", finishClass: "paste_wax", coats: 1, appliedOn: "2025-04-30" }));
    expect(layerRows(piece.id).map((l) => `${l.surface}${l.position}:${l.finishClass}`)).toEqual(["base0:hardwax_oil", "top0:hardwax_oil", "top1:ceramic_topcoat", "top2:paste_wax"]);

    updateLayer(ctx, piece.id, fourth.layer.id, { position: 0 });
    expect(layerRows(piece.id).filter((l) => l.surface === "top").map((l) => l.finishClass)).toEqual(["paste_wax", "hardwax_oil", "ceramic_topcoat"]);
    updateLayer(ctx, piece.id, first.layer.id, { coats: 3, notes: "third coat on the ends" });
    removeLayer(ctx, piece.id, fourth.layer.id);
    expect(layerRows(piece.id).filter((l) => l.surface === "top").map((l) => [l.position, l.finishClass, l.coats])).toEqual([
      [0, "hardwax_oil", 3],
      [1, "ceramic_topcoat", 1],
    ]);
    // Moving to another surface closes the gap it leaves.
    updateLayer(ctx, piece.id, third.layer.id, { surface: "edges" });
    expect(layerRows(piece.id).map((l) => `${l.surface}${l.position}`)).toEqual(["edges0", "top0", "top1"]);

    const history = layerHistory(ctx, piece.id).map((h) => h.action);
    expect(history.filter((a) => a === "layer.added")).toHaveLength(4);
    expect(history).toEqual(expect.arrayContaining(["layer.moved", "layer.updated", "layer.removed"]));
    const removed = auditsOf(piece.id, "layer.removed")[0]!;
    expect(removed.data).toMatchObject({ before: { finishClass: "paste_wax" } });
    expect(getPieceDetail(ctx, piece.id, now).schedule!.tasks.map((t) => t.kind)).toContain("topcoat_refresh");
    // The lot number is searchable.
    expect(listPieces(ctx, pieceListQuerySchema.parse({ q: "LOT-1" })).rows.map((r) => r.id)).toEqual([piece.id]);
  });

  it("refuses a product of another class or another studio, and an applier who is not a member", async () => {
    const studio = createStudio();
    const other = createStudio();
    const ctx = await memberContext(studio, "staff");
    const mine = getDb().insert(finishProducts).values({ studioId: studio.id, name: "Wax (invented)", finishClass: "paste_wax", coverageM2PerL: 20 }).returning().get();
    const theirs = getDb().insert(finishProducts).values({ studioId: other.id, name: "Oil (invented)", finishClass: "hardwax_oil", coverageM2PerL: 20 }).returning().get();
    const stranger = await createUser();
    const { piece } = createPiece(ctx, createPieceSchema.parse(base()));
    const layer = { surface: "top" as const, finishClass: "hardwax_oil" as const, coats: 1, appliedOn: "2025-04-28" };
    await expectStatus(() => addLayer(ctx, piece.id, layerSchema.parse({ ...layer, productId: mine.id })), 400);
    await expectStatus(() => addLayer(ctx, piece.id, layerSchema.parse({ ...layer, productId: theirs.id })), 400);
    await expectStatus(() => addLayer(ctx, piece.id, layerSchema.parse({ ...layer, appliedById: stranger.id })), 400);
    expect(layerRows(piece.id)).toHaveLength(0);
  });
});

describe("registration codes", () => {
  it("reissuing a code makes the old one stop working at once", async () => {
    const studio = createStudio();
    const ctx = await memberContext(studio, "staff");
    const { piece, registrationCode: old } = createPiece(ctx, createPieceSchema.parse(base()));
    expect(findByTypedCode(ctx, old)).toBe(piece.id);
    const { registrationCode: fresh } = reissueRegistrationCode(ctx, piece.id);
    expect(fresh).not.toBe(old);
    expect(findByTypedCode(ctx, old)).toBeNull();
    expect(listPieces(ctx, pieceListQuerySchema.parse({ q: old })).rows).toHaveLength(0);
    expect(findByTypedCode(ctx, fresh)).toBe(piece.id);
    expect(auditsOf(piece.id, "piece.code_reissued")).toHaveLength(1);
  });
});

describe("registry search", () => {
  it("finds pieces by owner name and e-mail, by species alias, and a whole code typed in lower case with spaces", async () => {
    const studio = createStudio();
    const ctx = await memberContext(studio, "staff");
    const surname = `Quillfeather${Date.now().toString(36)}`;
    const owner = await createUser({ name: `Ada ${surname}`, email: `${unique("ada")}@owners.example` });
    const walnut = createPiece(ctx, createPieceSchema.parse(base({ title: "Long table (invented)" })));
    const cherry = createPiece(ctx, createPieceSchema.parse(base({ title: "Small desk (invented)", kind: "desk", primarySpeciesId: "black_cherry", resinKind: "none" })));
    getDb().update(pieces).set({ ownerId: owner.id, registeredAt: new Date() }).where(eq(pieces.id, cherry.piece.id)).run();
    indexPiece(getDb(), cherry.piece.id);

    expect(listPieces(ctx, pieceListQuerySchema.parse({ q: surname })).rows.map((r) => r.id)).toEqual([cherry.piece.id]);
    expect(listPieces(ctx, pieceListQuerySchema.parse({ q: surname.toLowerCase().slice(0, 8) })).rows.map((r) => r.id)).toEqual([cherry.piece.id]); // prefix
    expect(listPieces(ctx, pieceListQuerySchema.parse({ q: owner.email })).rows.map((r) => r.id)).toEqual([cherry.piece.id]);
    expect(listPieces(ctx, pieceListQuerySchema.parse({ q: "walnut" })).rows.map((r) => r.id)).toEqual([walnut.piece.id]);
    expect(listPieces(ctx, pieceListQuerySchema.parse({ q: "Juglans" })).rows.map((r) => r.id)).toEqual([walnut.piece.id]);
    expect(listPieces(ctx, pieceListQuerySchema.parse({ q: "american cherry" })).rows.map((r) => r.id)).toEqual([cherry.piece.id]);

    const typed = walnut.registrationCode.toLowerCase().replace(/-/g, " ");
    const byCode = listPieces(ctx, pieceListQuerySchema.parse({ q: typed }));
    expect(byCode.matchedBy).toBe("code");
    expect(byCode.rows.map((r) => r.id)).toEqual([walnut.piece.id]);
    expect(listPieces(ctx, pieceListQuerySchema.parse({ q: ` ${walnut.registrationCode.toLowerCase().replace(/-/g, "")} ` })).rows.map((r) => r.id)).toEqual([walnut.piece.id]);
    // Another studio's staff do not find it by its code.
    const strangers = await memberContext(createStudio(), "staff");
    expect(listPieces(strangers, pieceListQuerySchema.parse({ q: walnut.registrationCode })).rows).toHaveLength(0);
    expect(listPieces(strangers, pieceListQuerySchema.parse({ q: "walnut" })).rows).toHaveLength(0);
  });

  it("never errors on FTS5 syntax characters", async () => {
    const ctx = await memberContext(createStudio(), "staff");
    createPiece(ctx, createPieceSchema.parse(base({ title: "Quote \"test\" table (invented)" })));
    const inputs = ['"', '""', '"walnut', "walnut\"", "*", "walnut*", "**", "NEAR", "NEAR(walnut table)", "walnut NEAR/2 table", "-", "-walnut", "walnut -table", "AND", "OR", "NOT", "walnut OR", "title:walnut", "owner:", "^walnut", "(", ")", "walnut)", "{title}: x", "'; DROP TABLE pieces; --", "\\", "\u0000", "·", "🙂", "   "];
    for (const q of inputs) {
      const res = listPieces(ctx, pieceListQuerySchema.parse({ q }));
      expect(Array.isArray(res.rows), q).toBe(true);
    }
    expect(listPieces(ctx, pieceListQuerySchema.parse({ q: '"test"' })).rows).toHaveLength(1);
    expect(listPieces(ctx, pieceListQuerySchema.parse({ q: "walnut -table" })).total).toBe(1); // "-table" is a word to find, not an exclusion
    expect(ftsQuery("a\"b NEAR")).toBe('"a""b"* "NEAR"*');
    expect(ftsQuery("* - ()")).toBeNull();
  });

  it("filters by kind, species, finish class, registration, next care due and warranty, and sorts and pages", async () => {
    const studio = createStudio({ timeZone: "UTC" });
    const ctx = await memberContext(studio, "staff");
    const policy = getDb().insert(warrantyPolicies).values({ studioId: studio.id, version: 1, effectiveFrom: "2000-01-01", policy: DEFAULT_WARRANTY_POLICY }).returning().get();
    const recent = createPiece(ctx, createPieceSchema.parse({ ...base({ title: "A recent table", deliveredOn: "2026-01-10", resinPouredOn: null }), layers: [{ surface: "top", finishClass: "paste_wax", coats: 1, appliedOn: "2026-01-10" }] })).piece;
    const old = createPiece(ctx, createPieceSchema.parse({ ...base({ title: "B old bench", kind: "bench", primarySpeciesId: "white_oak", deliveredOn: "2019-03-01", resinPouredOn: null }), layers: [{ surface: "top", finishClass: "film_finish", coats: 3, appliedOn: "2019-03-01" }] })).piece;
    expect(recent.warrantyPolicyId).toBe(policy.id);
    const now = new Date("2026-03-01T12:00:00Z");
    const ids = (q: Record<string, unknown>) => listPieces(ctx, pieceListQuerySchema.parse(q), now).rows.map((r) => r.id);
    expect(ids({ kind: "bench" })).toEqual([old.id]);
    expect(ids({ species: "white_oak" })).toEqual([old.id]);
    expect(ids({ finishClass: "paste_wax" })).toEqual([recent.id]);
    expect(ids({ registered: "no" }).sort()).toEqual([recent.id, old.id].sort());
    expect(ids({ registered: "yes" })).toEqual([]);
    expect(ids({ warranty: "active" })).toEqual([recent.id]);
    expect(ids({ warranty: "ended" })).toEqual([old.id]);
    // Re-wax of a heavy-use top: 6 months from 2026-01-10 → 2026-07-10; the old bench's film inspection is long overdue.
    expect(ids({ dueBefore: "2026-04-01" })).toEqual([old.id]);
    expect(ids({ dueBefore: "2026-07-10" }).sort()).toEqual([recent.id, old.id].sort());
    expect(ids({ sort: "title", dir: "asc" })).toEqual([recent.id, old.id]);
    expect(ids({ sort: "title", dir: "desc" })).toEqual([old.id, recent.id]);
    expect(ids({ sort: "delivered", dir: "asc" })).toEqual([old.id, recent.id]);
    expect(ids({ sort: "next_due", dir: "asc" })).toEqual([old.id, recent.id]);
    const page2 = listPieces(ctx, pieceListQuerySchema.parse({ pageSize: "10", page: "2" }), now);
    expect(page2.total).toBe(2);
    expect(page2.rows).toHaveLength(0);
    expect(() => listPieces(ctx, pieceListQuerySchema.parse({ pageSize: "7" }))).toThrow();
    expect(() => listPieces(ctx, pieceListQuerySchema.parse({ dueBefore: "2026-02-30" }))).toThrow();
    const row = listPieces(ctx, pieceListQuerySchema.parse({ kind: "bench" }), now).rows[0]!;
    expect(row.nextCare).toMatchObject({ status: "overdue" });
    expect(row.underWarranty).toBe(false);
  });

  it("a text search counts its matches up to the cap and pages through every one of them", async () => {
    const studio = createStudio({ timeZone: "UTC" });
    const ctx = await memberContext(studio, "staff");
    const made: string[] = [];
    getDb().transaction(() => {
      for (let i = 0; i < SEARCH_COUNT_CAP + 10; i++) made.push(createPiece(ctx, createPieceSchema.parse(base({ title: `Quillback stool ${i}`, kind: "other", resinKind: "none", resinPouredOn: null, resinVolumeMl: null, resinTint: null }))).piece.id);
    });
    for (let i = 0; i < 130; i++) createPiece(ctx, createPieceSchema.parse(base({ title: `Fernlight shelf ${i}`, kind: "other", resinKind: "none", resinPouredOn: null, resinVolumeMl: null, resinTint: null })));
    const seen: string[] = [];
    for (let page = 1; page <= 6; page++) {
      const res = listPieces(ctx, pieceListQuerySchema.parse({ q: "quillback", pageSize: "100", page: String(page) }));
      expect(res.total).toBe(SEARCH_COUNT_CAP);
      expect(res.totalIsCapped).toBe(true);
      seen.push(...res.rows.map((r) => r.id));
    }
    // Newest recorded first, every match once, the last page partly full.
    expect(seen).toEqual([...made].reverse());
    expect(listPieces(ctx, pieceListQuerySchema.parse({ q: "quillback", pageSize: "100", page: "7" })).rows).toEqual([]);
    // Under the cap the count is exact on every page, full or not.
    for (const page of ["1", "2"]) {
      const res = listPieces(ctx, pieceListQuerySchema.parse({ q: "fernlight", pageSize: "100", page }));
      expect([res.total, res.totalIsCapped, res.rows.length]).toEqual([130, false, page === "1" ? 100 : 30]);
    }
    expect(listPieces(ctx, pieceListQuerySchema.parse({ q: "fernlight quillback" })).total).toBe(0);
  });
});

describe("CSV import and export", () => {
  const header = "title,kind,shape,length_mm,width_mm,diameter_mm,area_m2,thickness_mm,primary_species,secondary_species,resin,resin_poured_on,resin_volume_ml,resin_tint,base_material,base_finish,use,sun,delivered_on,delivery_address,notes,finish_stack";

  it("writes nothing when one row is bad, and names the row and the column", async () => {
    const studio = createStudio();
    const ctx = await memberContext(studio, "staff");
    const csv = [
      header,
      "Oak bench (invented),bench,rectangle,1600,400,,,45,white oak,,none,,,,oak legs,oil,moderate,none,2023-05-01,1 Test Row,,top:hardwax_oil:2:2023-04-28",
      "Round table (invented),Dining table,round,,,1200,,40,Black walnut,,deep-pour casting,2023-06-01,5000,clear,steel,powder coat,heavy,indirect,2023-06-10,,\"Notes, with a comma\",top:epoxy_surface:1:2023-06-09",
      "Bad table (invented),dining_table,rectangle,2000,,,,40,black_walnut,,none,,,,,,heavy,none,2023-13-01,,,",
    ].join("\n");
    const before = getDb().select().from(pieces).where(eq(pieces.studioId, studio.id)).all().length;
    const result = importPiecesCsv(ctx, { csv, commit: true });
    expect(result.ok).toBe(false);
    expect(result.committed).toBe(false);
    expect(result.errors).toEqual(
      expect.arrayContaining([
        expect.objectContaining({ row: 4, field: "delivered_on" }),
        expect.objectContaining({ row: 4, field: "width_mm" }),
      ]),
    );
    expect(result.errors.every((e) => e.row === 4)).toBe(true);
    expect(getDb().select().from(pieces).where(eq(pieces.studioId, studio.id)).all().length).toBe(before);

    const good = csv.split("\n").slice(0, 3).join("\n");
    const preview = importPiecesCsv(ctx, { csv: good, commit: false });
    expect(preview).toMatchObject({ ok: true, committed: false, created: 0 });
    expect(preview.rows.map((r) => r.row)).toEqual([2, 3]);
    expect(getDb().select().from(pieces).where(eq(pieces.studioId, studio.id)).all().length).toBe(before);
    const done = importPiecesCsv(ctx, { csv: good, commit: true });
    expect(done).toMatchObject({ ok: true, committed: true, created: 2 });
    const round = listPieces(ctx, pieceListQuerySchema.parse({ q: "round" })).rows[0]!;
    expect(round.primarySpecies).toBe("Black walnut");
    expect(round.finishClasses).toEqual(["epoxy_surface"]);
  });

  it("reports a missing column and a bad finish stack", async () => {
    const ctx = await memberContext(createStudio(), "staff");
    const r1 = importPiecesCsv(ctx, { csv: "title,kind\nA,desk", commit: false });
    expect(r1.errors.map((e) => e.field)).toEqual(expect.arrayContaining(["shape", "primary_species", "use", "delivered_on"]));
    const r2 = importPiecesCsv(ctx, { csv: `${header}\nA (invented),desk,rectangle,1000,500,,,30,ash,,none,,,,,,moderate,none,2024-01-01,,,top:lacquer:2:2024-01-01`, commit: true });
    expect(r2.errors).toEqual([expect.objectContaining({ row: 2, field: "finish_stack" })]);
  });

  it("exports the current filter, neutralising formulas, and the export imports again", async () => {
    const studio = createStudio();
    const ctx = await memberContext(studio, "staff");
    createPiece(ctx, createPieceSchema.parse({ ...base({ title: "=HYPERLINK(\"x\") table" }), layers: [{ surface: "top", finishClass: "hardwax_oil", coats: 2, appliedOn: "2025-04-28", productLabel: "Some oil" }] }));
    createPiece(ctx, createPieceSchema.parse(base({ title: "Desk (invented)", kind: "desk" })));
    const csv = exportPiecesCsv(ctx, pieceListQuerySchema.parse({ kind: "dining_table" }));
    const lines = csv.trim().split(/\r?\n/);
    expect(lines).toHaveLength(2);
    expect(csv).toContain("'=HYPERLINK");
    expect(csv).toContain("top:hardwax_oil:2:2025-04-28:Some oil");
    expect(csv).not.toContain("Desk (invented)");
    const target = await memberContext(createStudio(), "staff");
    const again = importPiecesCsv(target, { csv, commit: true });
    expect(again).toMatchObject({ ok: true, created: 1 });
    expect(listPieces(target, pieceListQuerySchema.parse({})).rows[0]!.title).toBe("=HYPERLINK(\"x\") table");
  });
});
