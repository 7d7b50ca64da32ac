import "server-only";
import { and, asc, desc, eq, sql, type SQL } from "drizzle-orm";
import { getDb, perConnection, type Db } from "@/db/client";
import {
  careLogEntries,
  claims,
  files,
  finishLayers,
  finishProducts,
  memberships,
  pieces,
  reminderSends,
  users,
  warrantyPolicies,
  auditLog,
  type CareLogRow,
  type FinishLayer,
  type FinishProduct,
  type Piece,
} from "@/db/schema";
import { requireStaff, type StudioContext } from "@/lib/auth/guards";
import { recordAudit } from "@/lib/audit";
import { topArea, type TopArea } from "@/lib/care/area";
import { addMonths, localDate } from "@/lib/care/dates";
import { isValidRegistrationCode } from "@/lib/care/registration-code";
import type { CareSchedule, CareTask, CatalogEntry } from "@/lib/care/schedule";
import { getSpecies } from "@/lib/care/species";
import type { FinishClass } from "@/lib/care/vocabulary";
import { badRequest, conflict, notFound } from "@/lib/errors";
import { removeStoredFiles } from "@/lib/storage";
import {
  createPieceSchema,
  pieceListQuerySchema,
  piecePatchSchema,
  pieceSchema,
  type PieceListQuery,
  type PieceValues,
} from "@/lib/validation/pieces";
import { scheduleFromColumns, scheduleFromRows, toCatalog, topShape, type CareLayerColumns, type CarePieceColumns } from "./care-inputs";
import { insertLayers } from "./layers";
import { hashTypedCode, newRegistrationCode, openRegistrationCode } from "./registration";
import { ftsQuery, indexPiece, unindexPiece, type DbOrTx } from "./search-index";

/** A piece as the API hands it out: never the registration code's hash or sealed copy. */
export type PublicPiece = Omit<Piece, "registrationCodeHash" | "registrationCodeEnc">;

export function publicPiece(p: Piece): PublicPiece {
  const { registrationCodeHash, registrationCodeEnc, ...rest } = p;
  return rest;
}

function today(ctx: StudioContext, now = new Date()): string {
  return localDate(now.getTime(), ctx.studio.timeZone);
}

/** The piece row of the caller's studio, or 404 (also for another studio's piece). */
export function loadPiece(ctx: StudioContext, pieceId: string, db: DbOrTx = getDb()): Piece {
  const row = db.select().from(pieces).where(and(eq(pieces.id, pieceId), eq(pieces.studioId, ctx.studio.id))).get();
  if (!row) throw notFound("No piece with that id in this studio.");
  return row;
}

export function studioProducts(studioId: string, db: DbOrTx = getDb()): FinishProduct[] {
  if (db === getDb()) return statements(db as Db).products.all({ studioId });
  return db.select().from(finishProducts).where(eq(finishProducts.studioId, studioId)).all();
}

/** The studio's members who can apply a finish (for "applied by"). */
export function studioMembers(ctx: StudioContext) {
  return getDb()
    .select({ id: users.id, name: users.name, role: memberships.role })
    .from(memberships)
    .innerJoin(users, eq(users.id, memberships.userId))
    .where(eq(memberships.studioId, ctx.studio.id))
    .orderBy(asc(users.name))
    .all();
}

// ---- warranty: a piece is under warranty while its policy's longest line runs (lib/care addMonths) ----

const withFunctions = new WeakSet<object>();

/**
 * Once per connection: registers gw_add_months (the care engine's clamping month arithmetic), and lets
 * SQLite memory-map the file and keep a larger page cache, since a registry search touches pages all
 * over the pieces table (random ids). Only the app's connection, and only once the registry is used:
 * the scheduler reads every row once per pass, where both would only add resident memory. Neither
 * changes results.
 */
function ensureSqlFunctions(db: Db): void {
  const client = db.$client;
  if (withFunctions.has(client)) return;
  if (client.name !== ":memory:") {
    client.pragma("mmap_size = 268435456");
    client.pragma("cache_size = -65536");
  }
  client.function("gw_add_months", { deterministic: true }, (date: unknown, months: unknown) =>
    typeof date === "string" && typeof months === "number" ? addMonths(date, months) : null,
  );
  withFunctions.add(client);
}

// The registry's fixed-shape reads, prepared once per connection: a list page runs them on every
// request, and building and parsing them each time cost more than running them. Id lists travel as
// one JSON array (json_each), so the statement text never changes with the page size. The list's own
// reads are plain better-sqlite3 statements with only the columns a row shows and the care engine
// reads (like the reminder pass's bulk reads): mapping whole drizzle rows cost more than the query.
const IDS = `(SELECT value FROM json_each(?))`;
// A registry row's piece columns, read by the list query itself (joined with users as u).
const LIST_COLUMNS = sql.raw(`p.id, p.title, p.kind, p.use, p.sun, p.delivered_on AS deliveredOn, p.resin_kind AS resinKind,
  p.primary_species_id AS primarySpeciesId, p.secondary_species_id AS secondarySpeciesId, p.shape_kind AS shapeKind,
  p.length_mm AS lengthMm, p.width_mm AS widthMm, p.diameter_mm AS diameterMm, p.measured_area_m2 AS measuredAreaM2,
  p.owner_id AS ownerId, p.archived_at AS archivedAt, p.warranty_policy_id AS warrantyPolicyId,
  u.name AS ownerName, u.email AS ownerEmail`);
const statements = perConnection((db) => {
  const ids = sql`(SELECT value FROM json_each(${sql.placeholder("ids")}))`;
  const sqlite = db.$client;
  return {
    listLayers: sqlite.prepare<[string], CareLayerColumns & { pieceId: string }>(
      `SELECT piece_id AS pieceId, id, surface, finish_class AS finishClass, product_id AS productId, coats, applied_on AS appliedOn
         FROM finish_layers WHERE piece_id IN ${IDS} ORDER BY surface, position`,
    ),
    careLog: sqlite.prepare<[string], CareLogColumns & { pieceId: string }>(
      `SELECT piece_id AS pieceId, task_kind AS taskKind, done_on AS doneOn, surface FROM care_log_entries WHERE piece_id IN ${IDS}`,
    ),
    fullPieces: db.select().from(pieces).where(sql`${pieces.id} IN ${ids}`).prepare(),
    fullLayers: db.select().from(finishLayers).where(sql`${finishLayers.pieceId} IN ${ids}`).orderBy(asc(finishLayers.surface), asc(finishLayers.position)).prepare(),
    products: db.select().from(finishProducts).where(eq(finishProducts.studioId, sql.placeholder("studioId"))).prepare(),
    policies: db.select({ id: warrantyPolicies.id, policy: warrantyPolicies.policy }).from(warrantyPolicies).where(eq(warrantyPolicies.studioId, sql.placeholder("studioId"))).prepare(),
  };
});

function policyTerms(studioId: string): Map<string, number> {
  const rows = statements(getDb()).policies.all({ studioId });
  return new Map(rows.map((r) => [r.id, Math.max(0, ...Object.values(r.policy.lines ?? {}).map((l) => l?.termMonths ?? 0))]));
}

function warrantyEndsOn(piece: Pick<Piece, "warrantyPolicyId" | "deliveredOn">, terms: Map<string, number>): string | null {
  const term = piece.warrantyPolicyId ? terms.get(piece.warrantyPolicyId) : undefined;
  return term ? addMonths(piece.deliveredOn, term) : null;
}

// ---- the registry list ----

export type RegistryRow = {
  id: string;
  title: string;
  kind: Piece["kind"];
  primarySpecies: string;
  secondarySpecies: string | null;
  deliveredOn: string;
  owner: { name: string; email: string } | null;
  registered: boolean;
  archived: boolean;
  finishClasses: FinishClass[];
  nextCare: { label: string; dueOn: string; status: CareTask["status"] } | null;
  warrantyEndsOn: string | null;
  underWarranty: boolean;
};

export type RegistryPage = { rows: RegistryRow[]; total: number; /** true: at least `total` matches (SEARCH_COUNT_CAP). */ totalIsCapped: boolean; page: number; pageSize: number; query: PieceListQuery; matchedBy: "code" | "text" | null };

function speciesName(id: string | null): string | null {
  if (!id) return null;
  return getSpecies(id)?.commonName ?? id;
}

/** `where` checks each FTS row's piece id too (safe even if a VACUUM renumbered rowids before a reindex); `count` skips that read. */
type Filter = { where: SQL; count: SQL; fts: string | null; codeHash: string | null };

function buildFilter(ctx: StudioContext, q: PieceListQuery, terms: Map<string, number>, useCode: boolean): Filter {
  const conds: SQL[] = [sql`p.studio_id = ${ctx.studio.id}`];
  conds.push(q.archived === "only" ? sql`p.archived_at IS NOT NULL` : sql`p.archived_at IS NULL`);
  if (q.kind) conds.push(sql`p.kind = ${q.kind}`);
  if (q.species) conds.push(sql`(p.primary_species_id = ${q.species} OR p.secondary_species_id = ${q.species})`);
  if (q.finishClass) conds.push(sql`EXISTS (SELECT 1 FROM finish_layers l WHERE l.piece_id = p.id AND l.finish_class = ${q.finishClass})`);
  if (q.registered === "yes") conds.push(sql`p.owner_id IS NOT NULL`);
  if (q.registered === "no") conds.push(sql`p.owner_id IS NULL`);
  if (q.warranty) {
    const t = today(ctx);
    const cases = [...terms].filter(([, m]) => m > 0).map(([id, m]) => sql`WHEN ${id} THEN gw_add_months(p.delivered_on, ${m})`);
    const ends = cases.length ? sql`(CASE p.warranty_policy_id ${sql.join(cases, sql` `)} END)` : sql`NULL`;
    conds.push(q.warranty === "active" ? sql`${ends} >= ${t}` : sql`(${ends} IS NULL OR ${ends} < ${t})`);
  }
  let fts: string | null = null;
  let codeHash: string | null = null;
  const typed = q.q.trim();
  if (typed) {
    codeHash = useCode ? hashTypedCode(typed) : null;
    if (codeHash) conds.push(sql`p.registration_code_hash = ${codeHash}`);
    else {
      fts = ftsQuery(typed);
      // Nothing searchable (only punctuation): no piece matches.
      conds.push(fts ? sql`pieces_fts MATCH ${fts}` : sql`0`);
    }
  }
  const count = sql.join(conds, sql` AND `);
  return { where: fts ? sql`${count} AND pieces_fts.piece_id = p.id` : count, count, fts, codeHash };
}

// Ties break on rowid (insertion order), which the (studio_id, delivered_on) index carries, so the
// default orders read straight off an index; with a search, "newest recorded" reads the FTS index
// backwards and stops at the page (bm25 relevance ranks every match, so it is a choice, not the default).
function orderBy(q: PieceListQuery, hasFts: boolean): SQL {
  const sort = q.sort ?? (hasFts ? "created" : "delivered");
  const dir = q.dir === "asc" ? sql`ASC` : q.dir === "desc" ? sql`DESC` : sort === "title" ? sql`ASC` : sql`DESC`;
  switch (sort) {
    case "relevance":
      return hasFts ? sql`pieces_fts.rank ASC, p.rowid DESC` : sql`p.delivered_on DESC, p.rowid DESC`;
    case "title":
      return sql`p.title COLLATE NOCASE ${dir}, p.rowid ${dir}`;
    case "created":
      return hasFts ? sql`pieces_fts.rowid ${dir}` : sql`p.rowid ${dir}`;
    default:
      return sql`p.delivered_on ${dir}, p.rowid ${dir}`;
  }
}

/** A text search counts its matches up to this many ("1,000+"); counting further would read every match. */
export const SEARCH_COUNT_CAP = 500;
/** Without a text search, counts stop here ("10,000+"). */
export const LIST_COUNT_CAP = 10_000;

type CareLogColumns = Pick<CareLogRow, "taskKind" | "doneOn" | "surface">;

/** What a registry row needs of a piece: what the row shows, and the columns the care engine reads. */
type ListPieceRow = CarePieceColumns &
  Pick<Piece, "title" | "secondarySpeciesId" | "ownerId" | "warrantyPolicyId"> & { archivedAt: number | null; ownerName: string | null; ownerEmail: string | null };

type Loaded = { piece: ListPieceRow; layers: CareLayerColumns[]; careLog: CareLogColumns[] };

function loadForRows(rows: ListPieceRow[]): Map<string, Loaded> {
  const st = statements(getDb());
  const out = new Map<string, Loaded>(rows.map((piece) => [piece.id, { piece, layers: [], careLog: [] }]));
  for (let i = 0; i < rows.length; i += 500) {
    const chunk = JSON.stringify(rows.slice(i, i + 500).map((p) => p.id));
    for (const l of st.listLayers.all(chunk)) out.get(l.pieceId)?.layers.push(l);
    for (const c of st.careLog.all(chunk)) out.get(c.pieceId)?.careLog.push(c);
  }
  return out;
}

/** Whole piece rows and their layers, for the CSV export of the registry's current filter. */
export function loadFullPieces(ids: string[]): Map<string, { piece: Piece; layers: FinishLayer[] }> {
  const st = statements(getDb());
  const out = new Map<string, { piece: Piece; layers: FinishLayer[] }>();
  for (let i = 0; i < ids.length; i += 500) {
    const chunk = { ids: JSON.stringify(ids.slice(i, i + 500)) };
    for (const piece of st.fullPieces.all(chunk)) out.set(piece.id, { piece, layers: [] });
    for (const l of st.fullLayers.all(chunk)) out.get(l.pieceId)?.layers.push(l);
  }
  return out;
}

function nextCareOf(schedule: CareSchedule | null): RegistryRow["nextCare"] {
  const t = schedule?.tasks.find((x) => x.status !== "done") ?? schedule?.tasks[0];
  return t ? { label: t.label, dueOn: t.dueOn, status: t.status } : null;
}

function safeSchedule(l: Loaded, catalog: CatalogEntry[], timeZone: string, now: Date): CareSchedule | null {
  try {
    return scheduleFromColumns({ piece: l.piece, layers: l.layers, careLog: l.careLog, catalog, timeZone, now });
  } catch {
    return null; // a record the care engine cannot use yet (e.g. a bad imported date) still lists
  }
}

/** GET /api/pieces: search, filters, sorting and pagination of the studio's registry. */
export function listPieces(ctx: StudioContext, raw: unknown, now = new Date()): RegistryPage {
  return queryRegistry(ctx, raw, now, false);
}

/** The registry query; `all` ignores pagination (CSV export of the current filter). */
export function queryRegistry(ctx: StudioContext, raw: unknown, now: Date, all: boolean): RegistryPage {
  const q = pieceListQuerySchema.parse(raw);
  const db = getDb();
  ensureSqlFunctions(db);
  const terms = policyTerms(ctx.studio.id);
  const t = today(ctx, now);
  let catalog: CatalogEntry[] | null = null;
  const studioCatalog = () => (catalog ??= toCatalog(studioProducts(ctx.studio.id)));

  const run = (useCode: boolean) => {
    const f = buildFilter(ctx, q, terms, useCode);
    const from = f.fts ? sql`pieces_fts CROSS JOIN pieces p ON p.rowid = pieces_fts.rowid` : sql`pieces p`;
    const computed = q.sort === "next_due" || q.dueBefore !== undefined;
    if (!computed) {
      const offset = all ? 0 : (q.page - 1) * q.pageSize;
      const limit = f.fts ? SEARCH_COUNT_CAP : LIST_COUNT_CAP;
      const page = db.all<ListPieceRow>(sql`SELECT ${LIST_COLUMNS} FROM ${from} LEFT JOIN users u ON u.id = p.owner_id WHERE ${f.where} ORDER BY ${orderBy(q, !!f.fts)} LIMIT ${all ? -1 : q.pageSize} OFFSET ${offset}`);
      // A page that is not full tells the total without counting.
      const n = all || (page.length < q.pageSize && (page.length > 0 || q.page === 1)) ? offset + page.length : (db.get<{ n: number }>(sql`SELECT count(*) AS n FROM (SELECT 1 FROM ${from} WHERE ${f.count} LIMIT ${limit + 1})`)?.n ?? 0);
      const capped = !all && n > limit;
      return { f, ids: page.map((r) => r.id), total: capped ? limit : n, capped, loaded: loadForRows(page), schedules: null as Map<string, CareSchedule | null> | null };
    }
    // Next care due is computed by the care engine, so filter and sort on it in memory.
    const rows = db.all<ListPieceRow>(sql`SELECT ${LIST_COLUMNS} FROM ${from} LEFT JOIN users u ON u.id = p.owner_id WHERE ${f.where} ORDER BY ${orderBy(q, !!f.fts)}`);
    const candidates = rows.map((r) => r.id);
    const loaded = loadForRows(rows);
    const schedules = new Map(candidates.map((id) => [id, safeSchedule(loaded.get(id)!, studioCatalog(), ctx.studio.timeZone, now)]));
    let ids = candidates;
    const firstDue = (id: string) => schedules.get(id)?.tasks.find((x) => x.status !== "done")?.dueOn ?? schedules.get(id)?.tasks[0]?.dueOn ?? null;
    if (q.dueBefore) ids = ids.filter((id) => {
      const d = firstDue(id);
      return d !== null && d <= q.dueBefore!;
    });
    if (q.sort === "next_due") {
      const sign = q.dir === "desc" ? -1 : 1;
      ids = [...ids].sort((a, b) => {
        const da = firstDue(a) ?? "9999-12-31";
        const dbb = firstDue(b) ?? "9999-12-31";
        return da < dbb ? -sign : da > dbb ? sign : 0;
      });
    }
    const start = all ? 0 : (q.page - 1) * q.pageSize;
    return { f, ids: all ? ids : ids.slice(start, start + q.pageSize), total: ids.length, capped: false, loaded, schedules };
  };

  let result = run(true);
  let matchedBy: RegistryPage["matchedBy"] = result.f.codeHash ? "code" : result.f.fts ? "text" : null;
  // Something shaped like a code that is not one of ours may still be a word: search the text too.
  if (result.f.codeHash && result.total === 0) {
    result = run(false);
    matchedBy = result.f.fts ? "text" : null;
  }

  const loaded = result.loaded;
  const rows: RegistryRow[] = [];
  for (const id of result.ids) {
    const l = loaded.get(id);
    if (!l) continue;
    const schedule = result.schedules ? (result.schedules.get(id) ?? null) : safeSchedule(l, studioCatalog(), ctx.studio.timeZone, now);
    const ends = warrantyEndsOn(l.piece, terms);
    rows.push({
      id,
      title: l.piece.title,
      kind: l.piece.kind,
      primarySpecies: speciesName(l.piece.primarySpeciesId)!,
      secondarySpecies: speciesName(l.piece.secondarySpeciesId),
      deliveredOn: l.piece.deliveredOn,
      owner: l.piece.ownerName != null ? { name: l.piece.ownerName, email: l.piece.ownerEmail ?? "" } : null,
      registered: l.piece.ownerId !== null,
      archived: l.piece.archivedAt !== null,
      finishClasses: [...new Set(l.layers.map((x) => x.finishClass))],
      nextCare: nextCareOf(schedule),
      warrantyEndsOn: ends,
      underWarranty: ends !== null && ends >= t,
    });
  }
  return { rows, total: result.total, totalIsCapped: result.capped, page: q.page, pageSize: q.pageSize, query: q, matchedBy };
}

// ---- create, edit, delete ----

function checkLayerRefs(ctx: StudioContext, db: DbOrTx, layer: { productId?: string | null; appliedById?: string | null; finishClass: FinishClass }, field = ""): void {
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

export { checkLayerRefs };

function pieceColumns(v: ReturnType<typeof pieceSchema.parse>) {
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
export function insertPiece(ctx: StudioContext, tx: DbOrTx, raw: unknown, via: "form" | "import" = "form"): { piece: Piece; code: string } {
  const input = createPieceSchema.parse(raw);
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
export function createPiece(ctx: StudioContext, raw: unknown): { piece: PublicPiece; registrationCode: string } {
  const { piece, code } = getDb().transaction((tx) => insertPiece(ctx, tx, raw));
  return { piece: publicPiece(piece), registrationCode: code };
}

/** PATCH /api/pieces/[id]: merges the change into the record and checks the whole record again. */
export function updatePiece(ctx: StudioContext, pieceId: string, raw: unknown): PublicPiece {
  const patch = piecePatchSchema.parse(raw);
  const db = getDb();
  return db.transaction((tx) => {
    const current = loadPiece(ctx, pieceId, tx);
    const { archived, ...fields } = patch;
    const merged = pieceSchema.parse({ ...current, ...Object.fromEntries(Object.entries(fields).filter(([, v]) => v !== undefined)) });
    const columns = pieceColumns(merged);
    const changed = Object.fromEntries(Object.entries(columns).filter(([k, v]) => (current as Record<string, unknown>)[k] !== v));
    const archivedAt = archived === undefined ? current.archivedAt : archived ? (current.archivedAt ?? new Date()) : null;
    if (Object.keys(changed).length === 0 && archivedAt === current.archivedAt) return publicPiece(current);
    const updated = tx
      .update(pieces)
      .set({ ...columns, archivedAt, updatedAt: new Date() })
      .where(and(eq(pieces.id, pieceId), eq(pieces.studioId, ctx.studio.id)))
      .returning()
      .get();
    const before = Object.fromEntries(Object.keys(changed).map((k) => [k, (current as Record<string, unknown>)[k]]));
    if (Object.keys(changed).length) recordAudit(tx, { studioId: ctx.studio.id, actorId: ctx.user.id, action: "piece.updated", subjectType: "piece", subjectId: pieceId, data: { before, after: changed } });
    if (archivedAt !== current.archivedAt) recordAudit(tx, { studioId: ctx.studio.id, actorId: ctx.user.id, action: archivedAt ? "piece.archived" : "piece.unarchived", subjectType: "piece", subjectId: pieceId });
    indexPiece(tx, pieceId);
    return publicPiece(updated);
  });
}

/** DELETE /api/pieces/[id]: removes a piece nobody has registered; a registered piece is archived instead. */
export async function deletePiece(ctx: StudioContext, pieceId: string): Promise<{ deleted: boolean; archived: boolean }> {
  const db = getDb();
  const outcome = db.transaction((tx) => {
    const piece = loadPiece(ctx, pieceId, tx);
    if (piece.ownerId !== null || piece.registeredAt !== null) {
      if (!piece.archivedAt) {
        tx.update(pieces).set({ archivedAt: new Date(), updatedAt: new Date() }).where(eq(pieces.id, pieceId)).run();
        recordAudit(tx, { studioId: ctx.studio.id, actorId: ctx.user.id, action: "piece.archived", subjectType: "piece", subjectId: pieceId, data: { reason: "delete requested; the piece is registered" } });
      }
      return { deleted: false, archived: true, keys: [] as string[] };
    }
    const claimCount = tx.select({ id: claims.id }).from(claims).where(eq(claims.pieceId, pieceId)).all().length;
    if (claimCount > 0) throw conflict("This piece has claims on record; archive it instead.");
    const keys = tx.select({ a: files.storageKey, b: files.thumbKey }).from(files).where(eq(files.pieceId, pieceId)).all().flatMap((f) => [f.a, f.b]);
    unindexPiece(tx, pieceId);
    tx.delete(pieces).where(and(eq(pieces.id, pieceId), eq(pieces.studioId, ctx.studio.id))).run();
    recordAudit(tx, { studioId: ctx.studio.id, actorId: ctx.user.id, action: "piece.deleted", subjectType: "piece", subjectId: pieceId, data: { title: piece.title } });
    return { deleted: true, archived: false, keys };
  });
  if (outcome.keys.length) await removeStoredFiles(...outcome.keys);
  return { deleted: outcome.deleted, archived: outcome.archived };
}

/** POST /api/pieces/[id]/registration-code: a new code; the old one stops working at once. */
export function reissueRegistrationCode(ctx: StudioContext, pieceId: string): { registrationCode: string } {
  return getDb().transaction((tx) => {
    loadPiece(ctx, pieceId, tx);
    const { code, hash, enc } = newRegistrationCode();
    tx.update(pieces).set({ registrationCodeHash: hash, registrationCodeEnc: enc, updatedAt: new Date() }).where(eq(pieces.id, pieceId)).run();
    recordAudit(tx, { studioId: ctx.studio.id, actorId: ctx.user.id, action: "piece.code_reissued", subjectType: "piece", subjectId: pieceId });
    return { registrationCode: code };
  });
}

/** The piece's current registration code, for printing its drawer card (staff only). */
export function revealRegistrationCode(ctx: StudioContext, pieceId: string): string {
  return openRegistrationCode(loadPiece(ctx, pieceId).registrationCodeEnc);
}

/** Whether a typed code is the current code of one of this studio's pieces (compares hashes). */
export function findByTypedCode(ctx: StudioContext, typed: string): string | null {
  if (!isValidRegistrationCode(typed)) return null;
  const hash = hashTypedCode(typed);
  if (!hash) return null;
  return getDb().select({ id: pieces.id }).from(pieces).where(and(eq(pieces.studioId, ctx.studio.id), eq(pieces.registrationCodeHash, hash))).get()?.id ?? null;
}

// ---- the piece page ----

export type TimelineEvent = { on: string; at?: number; kind: "delivered" | "layer" | "care" | "reminder" | "claim" | "registered" | "record"; text: string };

const AUDIT_TEXT: Record<string, string> = {
  "piece.created": "Piece record created",
  "piece.updated": "Piece record edited",
  "piece.archived": "Piece archived",
  "piece.unarchived": "Piece taken out of the archive",
  "piece.code_reissued": "Registration code reissued; the old code stopped working",
  "layer.added": "Finish layer added",
  "layer.updated": "Finish layer edited",
  "layer.moved": "Finish layer moved",
  "layer.removed": "Finish layer removed",
  "photo.added": "Photo added",
  "piece.handover_sent": "Hand-over mail sent to the buyer",
  "piece.handover_resent": "Hand-over mail sent again, with a fresh link",
};

export function getPieceDetail(ctx: StudioContext, pieceId: string, now = new Date()) {
  const db = getDb();
  const piece = loadPiece(ctx, pieceId);
  const owner = piece.ownerId ? (db.select({ id: users.id, name: users.name, email: users.email }).from(users).where(eq(users.id, piece.ownerId)).get() ?? null) : null;
  const layers = db
    .select({ layer: finishLayers, productName: finishProducts.name, appliedByName: users.name })
    .from(finishLayers)
    .leftJoin(finishProducts, eq(finishProducts.id, finishLayers.productId))
    .leftJoin(users, eq(users.id, finishLayers.appliedById))
    .where(and(eq(finishLayers.pieceId, pieceId), eq(finishLayers.studioId, ctx.studio.id)))
    .orderBy(asc(finishLayers.surface), asc(finishLayers.position))
    .all();
  const careLog = db.select().from(careLogEntries).where(and(eq(careLogEntries.pieceId, pieceId), eq(careLogEntries.studioId, ctx.studio.id))).orderBy(asc(careLogEntries.doneOn)).all();
  const products = studioProducts(ctx.studio.id);
  let schedule: CareSchedule | null = null;
  let scheduleError: string | null = null;
  try {
    schedule = scheduleFromRows({ piece, layers: layers.map((l) => l.layer), careLog, products, timeZone: ctx.studio.timeZone, now });
  } catch (e) {
    scheduleError = e instanceof Error ? e.message : "The care schedule could not be computed.";
  }
  const shape = topShape(piece);
  let area: TopArea | null = null;
  try {
    area = shape ? topArea(shape) : null;
  } catch {
    area = null;
  }
  const photos = db
    .select({ id: files.id, width: files.width, height: files.height, createdAt: files.createdAt })
    .from(files)
    .where(and(eq(files.pieceId, pieceId), eq(files.studioId, ctx.studio.id), eq(files.purpose, "piece_photo")))
    .orderBy(asc(files.createdAt))
    .all()
    .map((f) => ({ ...f, url: `/api/files/${f.id}`, thumbUrl: `/api/files/${f.id}?thumb=1` }));

  const tz = ctx.studio.timeZone;
  const day = (d: Date) => localDate(d.getTime(), tz);
  const timeline: TimelineEvent[] = [{ on: piece.deliveredOn, kind: "delivered", text: `Delivered${piece.deliveryAddress ? ` to ${piece.deliveryAddress}` : ""}` }];
  for (const { layer, productName } of layers) {
    timeline.push({ on: layer.appliedOn, kind: "layer", text: `${layer.surface}: ${productName ?? (layer.productLabel || layer.finishClass)} applied, ${layer.coats} coat${layer.coats === 1 ? "" : "s"}` });
  }
  for (const c of careLog) timeline.push({ on: c.doneOn, kind: "care", text: `Care logged (${c.source}): ${c.taskKind.replace(/_/g, " ")}${c.notes ? ` — ${c.notes}` : ""}` });
  if (piece.registeredAt) timeline.push({ on: day(piece.registeredAt), at: piece.registeredAt.getTime(), kind: "registered", text: `Registered by ${owner?.name ?? "its owner"}` });
  for (const r of db.select().from(reminderSends).where(and(eq(reminderSends.pieceId, pieceId), eq(reminderSends.studioId, ctx.studio.id), eq(reminderSends.status, "sent"))).all()) {
    if (r.sentAt) timeline.push({ on: day(r.sentAt), at: r.sentAt.getTime(), kind: "reminder", text: `Care reminder sent: ${r.taskKind.replace(/_/g, " ")} (${r.step.replace(/_/g, " ")}), due ${r.dueOn}` });
  }
  for (const c of db.select().from(claims).where(and(eq(claims.pieceId, pieceId), eq(claims.studioId, ctx.studio.id))).all()) {
    timeline.push({ on: day(c.createdAt), at: c.createdAt.getTime(), kind: "claim", text: `Claim filed: ${c.category.replace(/_/g, " ")} (now ${c.state.replace(/_/g, " ")})` });
  }
  for (const a of db
    .select()
    .from(auditLog)
    .where(and(eq(auditLog.studioId, ctx.studio.id), eq(auditLog.subjectType, "piece"), eq(auditLog.subjectId, pieceId)))
    .orderBy(asc(auditLog.createdAt))
    .all()) {
    if (a.action.startsWith("layer.") || a.action === "piece.created") continue; // layers are on the timeline by their date
    timeline.push({ on: day(a.createdAt), at: a.createdAt.getTime(), kind: "record", text: AUDIT_TEXT[a.action] ?? a.action });
  }
  timeline.sort((a, b) => (a.on < b.on ? 1 : a.on > b.on ? -1 : (b.at ?? 0) - (a.at ?? 0)));

  const terms = policyTerms(ctx.studio.id);
  const ends = warrantyEndsOn(piece, terms);
  return {
    piece: publicPiece(piece),
    owner,
    layers: layers.map((l) => ({ ...l.layer, productName: l.productName, appliedByName: l.appliedByName })),
    schedule,
    scheduleError,
    area,
    photos,
    timeline,
    warrantyEndsOn: ends,
    underWarranty: ends !== null && ends >= today(ctx, now),
    members: studioMembers(ctx),
    products: products.filter((p) => !p.archivedAt).map((p) => ({ id: p.id, name: p.name, finishClass: p.finishClass })),
  };
}

/** Stack history of a piece (the audit entries of its layers), newest first. */
export function layerHistory(ctx: StudioContext, pieceId: string) {
  loadPiece(ctx, pieceId);
  return getDb()
    .select({ action: auditLog.action, data: auditLog.data, createdAt: auditLog.createdAt, actorName: users.name })
    .from(auditLog)
    .leftJoin(users, eq(users.id, auditLog.actorId))
    .where(and(eq(auditLog.studioId, ctx.studio.id), eq(auditLog.subjectType, "piece"), eq(auditLog.subjectId, pieceId), sql`${auditLog.action} LIKE 'layer.%'`))
    .orderBy(desc(auditLog.createdAt))
    .all();
}

// ---- page loaders: one call per page, guard included ----

/** The new/edit piece form's context: units, catalog, members, today, and the record when editing. */
export async function pieceFormContext(pieceId?: string) {
  const ctx = await requireStaff();
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
  };
}

/** The piece page: the record, stack, schedule, timeline and stack history. */
export async function piecePage(pieceId: string) {
  const ctx = await requireStaff();
  const detail = getPieceDetail(ctx, pieceId);
  return { ...detail, history: layerHistory(ctx, pieceId), unitSystem: ctx.studio.unitSystem, today: today(ctx), studioName: ctx.studio.name };
}
