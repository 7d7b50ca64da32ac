// The registry list's results, checked against a plain reading of the same rows: for a spread of searches,
// filters, sorts and pages, GET /api/pieces's page (lib/pieces/registry-list.ts) has exactly the rows, in
// exactly the order, with exactly the total and "more than" flag, and each row's finish classes in layer
// order, that the reference below finds by reading every piece, layer and index row of the studio and
// filtering and sorting them in JavaScript. The SQL is tuned for speed (registry-sql.ts, its indexes); this
// says the tuning changed nothing that anyone sees. Also: archiving and unarchiving a piece is seen by the
// very next search, its count included; a search's count read from the index alone (its scope words,
// db/migrations/0031) equals the count read from the pieces' rows, whatever archives, unarchives, moves or
// deletes a piece. All against a real SQLite file; every name below is invented.
import { eq, sql } from "drizzle-orm";
import { beforeAll, describe, expect, it } from "vitest";
import { getDb } from "@/db/client";
import { finishLayers, pieces } from "@/db/schema";
import type { StudioContext } from "@/lib/auth/guards";
import { FINISH_CLASSES, PIECE_KINDS, type FinishClass, type PieceKind, type Surface } from "@/lib/care/vocabulary";
import { createPiece, deletePiece, listPieces, updatePiece } from "@/lib/pieces/registry";
import { buildFilter, countMatches, LIST_COUNT_CAP, SEARCH_COUNT_CAP } from "@/lib/pieces/registry-sql";
import { ftsQuery, indexPiece, searchScope } from "@/lib/pieces/search-index";
import { createPieceSchema, pieceListQuerySchema, type CreatePieceInput, type PieceListQuery } from "@/lib/validation/pieces";
import { createStudio, createUser, memberContext } from "../support/fixtures";

const SPECIES = ["black_walnut", "white_oak", "sugar_maple", "black_ash"] as const;
const CLASSES: FinishClass[] = FINISH_CLASSES.slice(0, 4) as FinishClass[];
// Layers recorded surface by surface in this order, so the order they were written in is not the order
// they are listed in (surface, then position: "base" < "edges" < "top").
const LAYER_PLANS: { surface: Surface; finishClass: FinishClass }[][] = [
  [{ surface: "top", finishClass: CLASSES[0]! }],
  [
    { surface: "top", finishClass: CLASSES[1]! },
    { surface: "base", finishClass: CLASSES[2]! },
  ],
  [
    { surface: "top", finishClass: CLASSES[3]! },
    { surface: "edges", finishClass: CLASSES[0]! },
    { surface: "base", finishClass: CLASSES[3]! },
    { surface: "top", finishClass: CLASSES[2]! },
  ],
  [],
];

function input(i: number, title: string): CreatePieceInput {
  const day = String(1 + (i % 28)).padStart(2, "0");
  const month = String(1 + (i % 12)).padStart(2, "0");
  return {
    kind: PIECE_KINDS[i % PIECE_KINDS.length] as PieceKind,
    title,
    shapeKind: "rectangle",
    lengthMm: 1200,
    widthMm: 600,
    thicknessMm: 40,
    primarySpeciesId: SPECIES[i % SPECIES.length]!,
    secondarySpeciesId: i % 9 === 0 ? SPECIES[(i + 1) % SPECIES.length]! : undefined,
    resinKind: "none",
    use: "light",
    sun: "indirect",
    // Some share a delivery date, so the row order's tie-break is exercised too.
    deliveredOn: `${2023 + (i % 3)}-${month}-${day}`,
    layers: LAYER_PLANS[i % LAYER_PLANS.length]!.map((l) => ({ ...l, coats: 2, appliedOn: "2023-01-01" })),
  } as CreatePieceInput;
}

// More pieces carry "Larkspar" than a search counts (SEARCH_COUNT_CAP), so the capped total is checked.
const PIECES = SEARCH_COUNT_CAP + 120;
const title = (i: number) =>
  [i % 3 === 0 ? "Marrowby" : i % 3 === 1 ? "marrowbyne" : "Tansel", i % 5 === 0 ? "Quillfen" : "stool", "Larkspar", String(i), "(invented)"].join(" ");

type Ref = { id: string; rowid: number; title: string; kind: string; deliveredOn: string; primary: string; secondary: string | null; ownerId: string | null; archived: boolean; classes: FinishClass[] };

/** Every piece of the studio with its layers' finish classes in (surface, position) order, read plainly. */
function readStudio(studioId: string): Ref[] {
  const db = getDb();
  const rows = db
    .select({ id: pieces.id, rowid: sql<number>`${pieces}.rowid`, title: pieces.title, kind: pieces.kind, deliveredOn: pieces.deliveredOn, primary: pieces.primarySpeciesId, secondary: pieces.secondarySpeciesId, ownerId: pieces.ownerId, archivedAt: pieces.archivedAt })
    .from(pieces)
    .where(eq(pieces.studioId, studioId))
    .all();
  const layers = db.select().from(finishLayers).where(eq(finishLayers.studioId, studioId)).all();
  return rows.map((r) => {
    const own = layers.filter((l) => l.pieceId === r.id).sort((a, b) => (a.surface < b.surface ? -1 : a.surface > b.surface ? 1 : a.position - b.position));
    return { id: r.id, rowid: r.rowid, title: r.title, kind: r.kind, deliveredOn: r.deliveredOn, primary: r.primary, secondary: r.secondary, ownerId: r.ownerId, archived: r.archivedAt !== null, classes: [...new Set(own.map((l) => l.finishClass))] };
  });
}

/** The index's matches for what was typed (piece id → bm25 rank), or null without a search. */
const matched = new Map<string, Map<string, number>>();
function matches(q: string): Map<string, number> | null {
  if (!q.trim()) return null;
  const kept = matched.get(q);
  if (kept) return kept;
  const fts = ftsQuery(q);
  if (!fts) return new Map();
  const m = new Map(getDb().all<{ id: string; rank: number }>(sql`SELECT piece_id AS id, rank FROM pieces_fts WHERE pieces_fts MATCH ${fts}`).map((r) => [r.id, r.rank]));
  matched.set(q, m);
  return m;
}

const cmp = (a: string | number, b: string | number) => (a < b ? -1 : a > b ? 1 : 0);
const asciiLower = (s: string) => s.replace(/[A-Z]/g, (c) => c.toLowerCase()); // SQLite's NOCASE folds ASCII only

/** The page the registry should answer, from the plain reading. */
function expected(all: Ref[], q: PieceListQuery) {
  const m = matches(q.q);
  let rows = all.filter(
    (r) =>
      (q.archived === "only" ? r.archived : !r.archived) &&
      (!q.kind || r.kind === q.kind) &&
      (!q.species || r.primary === q.species || r.secondary === q.species) &&
      (!q.finishClass || r.classes.includes(q.finishClass)) &&
      (q.registered !== "yes" || r.ownerId !== null) &&
      (q.registered !== "no" || r.ownerId === null) &&
      (!m || m.has(r.id)),
  );
  const sort = q.sort ?? (m ? "created" : "delivered");
  const sign = q.dir === "asc" ? 1 : q.dir === "desc" ? -1 : sort === "title" ? 1 : -1;
  rows = [...rows].sort((a, b) => {
    if (sort === "relevance") return m ? cmp(m.get(a.id)!, m.get(b.id)!) || cmp(b.rowid, a.rowid) : cmp(b.deliveredOn, a.deliveredOn) || cmp(b.rowid, a.rowid);
    if (sort === "title") return sign * (cmp(asciiLower(a.title), asciiLower(b.title)) || cmp(a.rowid, b.rowid));
    if (sort === "created") return sign * cmp(a.rowid, b.rowid);
    return sign * (cmp(a.deliveredOn, b.deliveredOn) || cmp(a.rowid, b.rowid));
  });
  const offset = (q.page - 1) * q.pageSize;
  const page = rows.slice(offset, offset + q.pageSize);
  const cap = m ? SEARCH_COUNT_CAP : LIST_COUNT_CAP;
  const counted = !(page.length < q.pageSize && (page.length > 0 || q.page === 1));
  const capped = counted && rows.length > cap;
  return { ids: page.map((r) => r.id), classes: page.map((r) => r.classes), total: capped ? cap : rows.length, capped };
}

describe("registry list results", () => {
  let ctx: StudioContext;
  let all: Ref[];

  let otherCtx: StudioContext;

  beforeAll(async () => {
    ctx = await memberContext(createStudio(), "staff");
    const owner = await createUser({ name: "Odile Fenwright (invented)" });
    const made = Array.from({ length: PIECES }, (_, i) => createPiece(ctx, createPieceSchema.parse(input(i, title(i)))).piece);
    // Every fourth piece registered to an owner (whose name is then searchable), every seventh archived.
    const db = getDb();
    made.forEach((p, i) => {
      if (i % 4 === 0) {
        db.update(pieces).set({ ownerId: owner.id, registeredAt: new Date("2024-01-01T00:00:00Z") }).where(eq(pieces.id, p.id)).run();
        indexPiece(db, p.id);
      }
      if (i % 7 === 0) updatePiece(ctx, p.id, { archived: true });
    });
    // Another studio's pieces with the same words never show.
    otherCtx = await memberContext(createStudio(), "staff");
    for (let i = 0; i < 30; i++) createPiece(otherCtx, createPieceSchema.parse(input(i, title(i))));
    all = readStudio(ctx.studio.id);
    matched.clear();
  }, 120_000);

  const SEARCHES = ["", "larkspar", "Marrowby", "quill", "Marrowby larkspar", "fenwright", "walnut", "nothing-like-it", "%%"];
  const FILTERS: Partial<Record<keyof PieceListQuery, string>>[] = [
    {},
    { kind: "desk" },
    { species: "white_oak" },
    { finishClass: CLASSES[2]! },
    { registered: "yes" },
    { registered: "no" },
    { archived: "only" },
    { kind: "bench", registered: "no", finishClass: CLASSES[0]! },
  ];
  const ORDERS: Partial<Record<keyof PieceListQuery, string>>[] = [{}, { sort: "relevance" }, { sort: "title" }, { sort: "title", dir: "desc" }, { sort: "delivered", dir: "asc" }, { sort: "created", dir: "asc" }];
  const PAGES = [{ page: "1", pageSize: "25" }, { page: "2", pageSize: "10" }, { page: "3", pageSize: "100" }, { page: "30", pageSize: "25" }];

  it("every search, filter, sort and page answers exactly the rows, order, total and cap of a plain reading", () => {
    let compared = 0;
    let cappedSeen = 0;
    for (const q of SEARCHES)
      for (const f of FILTERS)
        for (const o of ORDERS)
          for (const p of PAGES) {
            const query = pieceListQuerySchema.parse({ q, ...f, ...o, ...p });
            const got = listPieces(ctx, query);
            const want = expected(all, query);
            const label = JSON.stringify({ q, ...f, ...o, ...p });
            expect({ label, ids: got.rows.map((r) => r.id), total: got.total, capped: got.totalIsCapped }).toEqual({ label, ids: want.ids, total: want.total, capped: want.capped });
            expect(got.rows.map((r) => r.finishClasses), label).toEqual(want.classes);
            compared++;
            if (got.totalIsCapped) cappedSeen++;
          }
    expect(compared).toBe(SEARCHES.length * FILTERS.length * ORDERS.length * PAGES.length);
    expect(cappedSeen).toBeGreaterThan(0); // "larkspar" has more matches than the search counts
    // The rows the pages show carry their owner and archived state as read.
    const page = listPieces(ctx, pieceListQuerySchema.parse({ q: "fenwright", archived: "only", pageSize: "100" }));
    expect(page.rows.length).toBeGreaterThan(0);
    for (const r of page.rows) expect([r.archived, r.registered, r.owner?.name]).toEqual([true, true, "Odile Fenwright (invented)"]);
  }, 180_000);

  it("archiving and unarchiving a piece is seen by the very next search, its count included", async () => {
    const search = (archived?: "only") => listPieces(ctx, pieceListQuerySchema.parse({ q: "quillfen", pageSize: "10", archived }));
    const before = search();
    const beforeArchived = search("only");
    expect(before.total).toBeGreaterThan(10); // a full page: the total comes from the count
    const target = before.rows[3]!.id;

    updatePiece(ctx, target, { archived: true });
    const hidden = search();
    expect(hidden.total).toBe(before.total - 1);
    expect(listPieces(ctx, pieceListQuerySchema.parse({ q: "quillfen", pageSize: "100" })).rows.map((r) => r.id)).not.toContain(target);
    expect(search("only").total).toBe(beforeArchived.total + 1);
    expect(search("only").rows.map((r) => r.id)).toContain(target);

    updatePiece(ctx, target, { archived: false });
    expect(search()).toEqual(before);
    expect(search("only").total).toBe(beforeArchived.total);

    // Deleting a registered piece archives it: also gone from the next search.
    const registered = listPieces(ctx, pieceListQuerySchema.parse({ q: "quillfen", registered: "yes", pageSize: "10" })).rows[0]!.id;
    expect(await deletePiece(ctx, registered)).toEqual({ deleted: false, archived: true });
    expect(search().total).toBe(before.total - 1);
    expect(search("only").rows.map((r) => r.id)).toContain(registered);
    updatePiece(ctx, registered, { archived: false });
    expect(search().total).toBe(before.total);
  });

  it("what is typed is never looked for in the index's scope words", () => {
    for (const word of [searchScope(ctx.studio.id, false), searchScope(ctx.studio.id, true)])
      // Also as the tokenizer folds them: upper case, and an "s" with a diacritic.
      for (const q of [word, word.slice(0, 8), word.slice(0, 12), word.slice(-12), word.slice(0, 8).toUpperCase(), `ś${word.slice(1, 8)}`, `Š${word.slice(1, 8)}`]) {
        const page = listPieces(ctx, pieceListQuerySchema.parse({ q }));
        expect({ q, total: page.total, rows: page.rows.length }).toEqual({ q, total: 0, rows: 0 });
      }
  });

  it("a search's count by the index alone equals its count by the pieces' rows, whatever archives, unarchives, moves or deletes a piece", async () => {
    const db = getDb();
    const count = (c: StudioContext, q: string, archived: "only" | undefined, by: "index" | "rows") => {
      const f = buildFilter(c, pieceListQuerySchema.parse({ q, archived }), new Map(), false, "2026-01-01");
      expect(f.scope, q).not.toBeNull();
      return countMatches(f, SEARCH_COUNT_CAP + 1, by);
    };
    const words = SEARCHES.filter((q) => ftsQuery(q) !== null);
    /** Each word's counts in both studios, live and archived, after checking that both ways agree. */
    const counts = () =>
      Object.fromEntries(
        [ctx, otherCtx].flatMap((c) =>
          words.flatMap((q) =>
            [undefined, "only" as const].map((a) => {
              const byIndex = count(c, q, a, "index");
              expect(byIndex, `${q} ${a} ${c.studio.id}`).toBe(count(c, q, a, "rows"));
              return [`${c === ctx ? "ours" : "theirs"} ${q} ${a ?? "live"}`, byIndex];
            }),
          ),
        ),
      );
    const start = counts();
    expect(start["ours quill live"]).toBeGreaterThan(10);
    expect(start["ours quill only"]).toBeGreaterThan(0);
    expect(start["theirs quill live"]).toBeGreaterThan(0);
    expect(start["ours larkspar live"]).toBe(SEARCH_COUNT_CAP + 1); // counting stops one past the cap

    const quill = (c: StudioContext, archived?: "only") => listPieces(c, pieceListQuerySchema.parse({ q: "quill", pageSize: "100", archived })).rows.map((r) => r.id);
    const unregistered = quill(ctx).filter((id) => db.select({ o: pieces.ownerId }).from(pieces).where(eq(pieces.id, id)).get()!.o === null);
    const [a, b, c, d] = unregistered;
    // The pieces changed below carry other words too: those counts are only checked to agree both ways.
    const quillCounts = (all: Record<string, number>) => Object.fromEntries(Object.entries(all).filter(([k]) => k.includes(" quill ")));
    const shifted = (changes: Record<string, number>) => ({ ...quillCounts(start), ...Object.fromEntries(Object.entries(changes).map(([k, n]) => [k, start[k]! + n])) });

    // Archived and unarchived by a plain UPDATE (no indexPiece): the trigger keeps the scope word right.
    db.update(pieces).set({ archivedAt: new Date() }).where(eq(pieces.id, a!)).run();
    expect(quillCounts(counts())).toEqual(shifted({ "ours quill live": -1, "ours quill only": 1 }));
    expect(quill(ctx, "only")).toContain(a);
    db.update(pieces).set({ archivedAt: null }).where(eq(pieces.id, a!)).run();
    expect(counts()).toEqual(start);

    // A piece moved to another studio is counted there, and no longer here.
    db.update(pieces).set({ studioId: otherCtx.studio.id }).where(eq(pieces.id, b!)).run();
    expect(quillCounts(counts())).toEqual(shifted({ "ours quill live": -1, "theirs quill live": 1 }));
    expect(quill(otherCtx)).toContain(b);
    db.update(pieces).set({ studioId: ctx.studio.id }).where(eq(pieces.id, b!)).run();
    expect(counts()).toEqual(start);

    // Deleted through the registry, and by a plain DELETE: the index row goes with the piece.
    expect(await deletePiece(ctx, c!)).toEqual({ deleted: true, archived: false });
    db.delete(pieces).where(eq(pieces.id, d!)).run();
    expect(quillCounts(counts())).toEqual(shifted({ "ours quill live": -2 }));
    expect(db.$client.prepare("SELECT count(*) AS n FROM pieces_fts WHERE piece_id IN (?, ?)").get(c, d)).toEqual({ n: 0 });
    expect(quill(ctx)).not.toContain(c);
    expect(quill(ctx)).not.toContain(d);
  });
});
