// The registry's performance-tuned SQL, all of it (one style: hand-written SQL through drizzle's `sql`
// and statements prepared once per connection). The operations (registry-list.ts and the others)
// call these and read top to bottom.
//
// The registry's fixed-shape reads are prepared once per connection: a list page runs them on every
// request, and building and parsing them each time cost more than running them. Id lists travel as
// one JSON array (json_each), so the statement text never changes with the page size. The list's own
// reads are plain better-sqlite3 statements with only the columns a row shows and the care engine
// reads (like the reminder pass's bulk reads): mapping whole drizzle rows cost more than the query.
import "server-only";
import { asc, eq, sql, type SQL } from "drizzle-orm";
import { getDb, perConnection, type Db } from "@/db/client";
import { finishLayers, finishProducts, pieces, warrantyPolicies, type CareLogRow, type FinishLayer, type Piece } from "@/db/schema";
import type { StudioContext } from "@/lib/auth/guards";
import { addMonths } from "@/lib/care/dates";
import type { PieceListQuery } from "@/lib/validation/pieces";
import type { CareLayerColumns, CarePieceColumns } from "./care-inputs";
import { hashTypedCode } from "./registration";
import { ftsQuery } from "./search-index";

const withFunctions = new WeakSet<object>();

/**
 * Once per connection: registers gw_add_months (the care engine's clamping month arithmetic), and lets
 * SQLite memory-map the file and keep a larger page cache, since a registry search touches pages all
 * over the pieces table (random ids). Only the app's connection, and only once the registry is used:
 * the scheduler reads every row once per pass, where both would only add resident memory. Neither
 * changes results.
 */
export function ensureSqlFunctions(db: Db): void {
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

const IDS = `(SELECT value FROM json_each(?))`;
// A registry row's piece columns, read by the list query itself (joined with users as u).
export const LIST_COLUMNS = sql.raw(`p.id, p.title, p.kind, p.use, p.sun, p.delivered_on AS deliveredOn, p.resin_kind AS resinKind,
  p.primary_species_id AS primarySpeciesId, p.secondary_species_id AS secondarySpeciesId, p.shape_kind AS shapeKind,
  p.length_mm AS lengthMm, p.width_mm AS widthMm, p.diameter_mm AS diameterMm, p.measured_area_m2 AS measuredAreaM2,
  p.owner_id AS ownerId, p.archived_at AS archivedAt, p.warranty_policy_id AS warrantyPolicyId,
  u.name AS ownerName, u.email AS ownerEmail`);
export const registryStatements = perConnection((db) => {
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

/** Each warranty policy of the studio with its longest line in months (a piece is under warranty while it runs). */
export function policyTerms(studioId: string): Map<string, number> {
  const rows = registryStatements(getDb()).policies.all({ studioId });
  return new Map(rows.map((r) => [r.id, Math.max(0, ...Object.values(r.policy.lines ?? {}).map((l) => l?.termMonths ?? 0))]));
}

export function warrantyEndsOn(piece: Pick<Piece, "warrantyPolicyId" | "deliveredOn">, terms: Map<string, number>): string | null {
  const term = piece.warrantyPolicyId ? terms.get(piece.warrantyPolicyId) : undefined;
  return term ? addMonths(piece.deliveredOn, term) : null;
}

/** `where` checks each FTS row's piece id too (safe even if a VACUUM renumbered rowids before a reindex); `count` skips that read. */
export type Filter = { where: SQL; count: SQL; fts: string | null; codeHash: string | null };

export function buildFilter(ctx: StudioContext, q: PieceListQuery, terms: Map<string, number>, useCode: boolean, t: string): Filter {
  const conds: SQL[] = [sql`p.studio_id = ${ctx.studio.id}`];
  conds.push(q.archived === "only" ? sql`p.archived_at IS NOT NULL` : sql`p.archived_at IS NULL`);
  if (q.kind) conds.push(sql`p.kind = ${q.kind}`);
  if (q.species) conds.push(sql`(p.primary_species_id = ${q.species} OR p.secondary_species_id = ${q.species})`);
  if (q.finishClass) conds.push(sql`EXISTS (SELECT 1 FROM finish_layers l WHERE l.piece_id = p.id AND l.finish_class = ${q.finishClass})`);
  if (q.registered === "yes") conds.push(sql`p.owner_id IS NOT NULL`);
  if (q.registered === "no") conds.push(sql`p.owner_id IS NULL`);
  if (q.warranty) {
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
export function orderBy(q: PieceListQuery, hasFts: boolean): SQL {
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

function fromClause(f: Filter): SQL {
  return f.fts ? sql`pieces_fts CROSS JOIN pieces p ON p.rowid = pieces_fts.rowid` : sql`pieces p`;
}

/** A page of registry rows for the filter (limit -1: all of them). */
export function selectListRows(f: Filter, q: PieceListQuery, limit: number, offset: number): ListPieceRow[] {
  return getDb().all<ListPieceRow>(sql`SELECT ${LIST_COLUMNS} FROM ${fromClause(f)} LEFT JOIN users u ON u.id = p.owner_id WHERE ${f.where} ORDER BY ${orderBy(q, !!f.fts)} LIMIT ${limit} OFFSET ${offset}`);
}

/**
 * How many pieces match the filter, counting no further than `upTo`. Counting walks up to `upTo`
 * matches (the most expensive read of a search page), and the pager asks again for every page and
 * every repeat of a search, so counts are kept per process until the database changes: `key` names
 * the filter, and the database's version (PRAGMA data_version moves when another connection commits;
 * total_changes() when this one writes) must be the one the count was taken at.
 */
export function countMatches(f: Filter, upTo: number, key: string): number {
  const db = getDb();
  const version = databaseVersion(db);
  const cacheKey = `${upTo}|${key}`;
  const hit = counts.get(cacheKey);
  if (hit && hit.version === version) return hit.n;
  const n = db.get<{ n: number }>(sql`SELECT count(*) AS n FROM (SELECT 1 FROM ${fromClause(f)} WHERE ${f.count} LIMIT ${upTo})`)?.n ?? 0;
  if (counts.size >= 1000) counts.delete(counts.keys().next().value!);
  counts.set(cacheKey, { version, n });
  return n;
}

const counts = new Map<string, { version: string; n: number }>();

const versionStatements = perConnection((db) => ({
  dataVersion: db.$client.prepare("PRAGMA data_version").pluck(),
  totalChanges: db.$client.prepare("SELECT total_changes()").pluck(),
}));

/** Changes whenever anything in the database changed since it was last asked (any connection, this one included). */
export function databaseVersion(db: Db): string {
  const st = versionStatements(db);
  return `${db.$client.name}|${st.dataVersion.get() as number}|${st.totalChanges.get() as number}`;
}

/** A text search counts its matches up to this many ("1,000+"); counting further would read every match. */
export const SEARCH_COUNT_CAP = 500;
/** Without a text search, counts stop here ("10,000+"). */
export const LIST_COUNT_CAP = 10_000;

export type CareLogColumns = Pick<CareLogRow, "taskKind" | "doneOn" | "surface">;

/** What a registry row needs of a piece: what the row shows, and the columns the care engine reads. */
export type ListPieceRow = CarePieceColumns &
  Pick<Piece, "title" | "secondarySpeciesId" | "ownerId" | "warrantyPolicyId"> & { archivedAt: number | null; ownerName: string | null; ownerEmail: string | null };

export type Loaded = { piece: ListPieceRow; layers: CareLayerColumns[]; careLog: CareLogColumns[] };

export function loadForRows(rows: ListPieceRow[]): Map<string, Loaded> {
  const st = registryStatements(getDb());
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
  const st = registryStatements(getDb());
  const out = new Map<string, { piece: Piece; layers: FinishLayer[] }>();
  for (let i = 0; i < ids.length; i += 500) {
    const chunk = { ids: JSON.stringify(ids.slice(i, i + 500)) };
    for (const piece of st.fullPieces.all(chunk)) out.set(piece.id, { piece, layers: [] });
    for (const l of st.fullLayers.all(chunk)) out.get(l.pieceId)?.layers.push(l);
  }
  return out;
}
