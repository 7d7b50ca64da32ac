// The registry's performance-tuned SQL, all of it, in one style: hand-written SQL text run through
// better-sqlite3 statements, each prepared once per connection (statementFor keeps them by text).
// Why this style and not drizzle's builder or its `sql` template: the list query is assembled from
// optional filters, an FTS5 join and a chosen order, which the builder cannot say without `sql` pieces
// anyway; and a search request paid more for building drizzle's query and mapping its rows (a new
// statement, parsed again, on every request) than for running the query. Reads return only the columns
// a row shows and the care engine reads, like the reminder pass's bulk reads. The few whole-row reads
// (the CSV export, the studio's products and policies) decode their columns with the schema's own
// column mappers (wholeRows), so dates, JSON and flags read as they do everywhere else.
// Id lists travel as one JSON array (json_each), so the statement text never changes with the page size.
// The operations (registry-list.ts and the others) call these and read top to bottom.
import { getTableColumns, type Table } from "drizzle-orm";
import type Database from "better-sqlite3";
import { bound } from "@/db/bound";
import { getDb, perConnection, type Db } from "@/db/client";
import { finishLayers, finishProducts, pieces, warrantyPolicies, type CareLogRow, type FinishLayer, type FinishProduct, type Piece, type WarrantyPolicyRow } from "@/db/schema";
import type { StudioContext } from "@/lib/auth/guards";
import { addMonths } from "@/lib/care/dates";
import type { FinishClass } from "@/lib/care/vocabulary";
import type { PieceListQuery } from "@/lib/validation/pieces";
import type { CareLayerColumns, CarePieceColumns } from "./care-inputs";
import { hashTypedCode } from "./registration";
import { pieceTextMatch, searchScope } from "./search-index";

const withFunctions = new WeakSet<object>();

/**
 * Once per connection: registers gw_add_months (the care engine's clamping month arithmetic), and gives
 * the app's connection a 16 MB page cache (SQLite's default is 2 MB), enough for a search page and its
 * count (up to 501 rows spread over the pieces table) to stay in memory between requests. No memory map:
 * every page of the file it touched stayed resident in the app (about 40 MB after three searches of the
 * 100,000-piece benchmark registry, rising with the file), for no measurable gain over reads from the
 * page cache. Only once the registry is used: the scheduler reads every row once per pass, where a
 * larger cache would only add resident memory. Neither changes results.
 */
export function ensureSqlFunctions(db: Db): void {
  const client = db.$client;
  if (withFunctions.has(client)) return;
  if (client.name !== ":memory:") client.pragma("cache_size = -16384");
  client.function("gw_add_months", { deterministic: true }, (date: unknown, months: unknown) =>
    typeof date === "string" && typeof months === "number" ? addMonths(date, months) : null,
  );
  withFunctions.add(client);
}

/** One statement per distinct SQL text and connection (the list query has a few shapes: its filters and order). */
const statementCache = perConnection(() => new Map<string, Database.Statement>());

function statementFor(db: Db, text: string): Database.Statement {
  const cache = statementCache(db);
  let st = cache.get(text);
  if (!st) {
    st = db.$client.prepare(text);
    if (cache.size >= 200) cache.delete(cache.keys().next().value!);
    cache.set(text, st);
  }
  return st;
}

/** Decodes raw rows of `table` (SELECT *) into the schema's row type: column names, dates, JSON, flags. */
function wholeRows<T>(table: Table, raw: Record<string, unknown>[]): T[] {
  const cols = Object.entries(getTableColumns(table));
  return raw.map((r) => {
    const out: Record<string, unknown> = {};
    for (const [key, col] of cols) {
      const v = r[col.name];
      out[key] = v === null || v === undefined ? null : col.mapFromDriverValue(v);
    }
    return out as T;
  });
}

const IDS = `(SELECT value FROM json_each(?))`;
// What a registry row shows, read by the list query itself (joined with users as u), in this order
// (the statement answers arrays: building an object per row in SQLite's binding cost more than the
// read). A row's finish classes come as one JSON array, in layer order, read from the layers' piece
// index alone (piece, surface, position, class: migration 0029), not from each layer's row. The order
// comes from a subquery that reads that index in its own order, not from json_group_array(… ORDER BY …),
// which opened a sorter for every row of the page (with the rowid-only join of Filter below, the page
// query went from 1.32 M to 1.10 M instructions under cachegrind on the 100,000-piece bench seed).
// SQLite keeps a FROM-clause subquery's ORDER BY when the query around it aggregates with anything but
// count/min/max, and registry-results.test.ts checks every row's classes in layer order. The care
// engine's columns, layers and care log are read only for the rows whose next care is not kept
// (loadCareInputs).
const LIST_COLUMNS = `p.id, p.title, p.kind, p.delivered_on, p.primary_species_id, p.secondary_species_id,
  p.owner_id, p.archived_at, p.warranty_policy_id, u.name, u.email,
  (SELECT json_group_array(c) FROM (SELECT l.finish_class AS c FROM finish_layers l WHERE l.piece_id = p.id ORDER BY l.surface, l.position)), p.rowid`;

function listRow(r: unknown[]): ListPieceRow {
  return {
    id: r[0] as string,
    title: r[1] as string,
    kind: r[2] as Piece["kind"],
    deliveredOn: r[3] as string,
    primarySpeciesId: r[4] as string,
    secondarySpeciesId: r[5] as string | null,
    ownerId: r[6] as string | null,
    archivedAt: r[7] as number | null,
    warrantyPolicyId: r[8] as string | null,
    ownerName: r[9] as string | null,
    ownerEmail: r[10] as string | null,
    finishClasses: [...new Set(JSON.parse(r[11] as string) as FinishClass[])],
    rowid: r[12] as number,
  };
}

export const registryStatements = perConnection((db) => {
  const sqlite = db.$client;
  const productsRaw = sqlite.prepare<[string], Record<string, unknown>>(`SELECT * FROM finish_products WHERE studio_id = ?`);
  const policiesRaw = sqlite.prepare<[string], { id: string; policy: string }>(`SELECT id, policy FROM warranty_policies WHERE studio_id = ?`);
  const policyColumn = getTableColumns(warrantyPolicies).policy;
  return {
    carePieces: sqlite.prepare<[string], CarePieceColumns>(
      `SELECT id, kind, use, sun, delivered_on AS deliveredOn, resin_kind AS resinKind, primary_species_id AS primarySpeciesId, shape_kind AS shapeKind,
         length_mm AS lengthMm, width_mm AS widthMm, diameter_mm AS diameterMm, measured_area_m2 AS measuredAreaM2 FROM pieces WHERE id IN ${IDS}`,
    ),
    listLayers: sqlite.prepare<[string], CareLayerColumns & { pieceId: string }>(
      `SELECT piece_id AS pieceId, id, surface, finish_class AS finishClass, product_id AS productId, coats, applied_on AS appliedOn
         FROM finish_layers WHERE piece_id IN ${IDS} ORDER BY surface, position`,
    ),
    careLog: sqlite.prepare<[string], CareLogColumns & { pieceId: string }>(
      `SELECT piece_id AS pieceId, task_kind AS taskKind, done_on AS doneOn, surface FROM care_log_entries WHERE piece_id IN ${IDS}`,
    ),
    fullPieces: sqlite.prepare<[string], Record<string, unknown>>(`SELECT * FROM pieces WHERE id IN ${IDS}`),
    fullLayers: sqlite.prepare<[string], Record<string, unknown>>(`SELECT * FROM finish_layers WHERE piece_id IN ${IDS} ORDER BY surface, position`),
    products: { all: ({ studioId }: { studioId: string }): FinishProduct[] => wholeRows<FinishProduct>(finishProducts, productsRaw.all(studioId)) },
    policies: {
      all: ({ studioId }: { studioId: string }): Pick<WarrantyPolicyRow, "id" | "policy">[] =>
        policiesRaw.all(studioId).map((r) => ({ id: r.id, policy: policyColumn.mapFromDriverValue(r.policy) as WarrantyPolicyRow["policy"] })),
    },
  };
});

/**
 * Each warranty policy of the studio with its longest line in months (a piece is under warranty while it
 * runs). Every registry page needs them and they rarely change: kept per studio until the database's
 * version moves (databaseVersion), so a page reads and decodes the policies only after a write. A caller
 * that has just asked for the version passes it (the registry list: one version read per page, not two).
 */
export function policyTerms(studioId: string, version = databaseVersion(getDb())): Map<string, number> {
  const db = getDb();
  const kept = termsKept.get(studioId);
  if (kept && kept.version === version) return kept.terms;
  const rows = registryStatements(db).policies.all({ studioId });
  const terms = new Map(rows.map((r) => [r.id, Math.max(0, ...Object.values(r.policy.lines ?? {}).map((l) => l?.termMonths ?? 0))]));
  if (termsKept.size >= 100) termsKept.delete(termsKept.keys().next().value!);
  termsKept.set(studioId, { version, terms });
  return terms;
}

const termsKept = new Map<string, { version: string; terms: Map<string, number> }>();

export function warrantyEndsOn(piece: Pick<Piece, "warrantyPolicyId" | "deliveredOn">, terms: Map<string, number>): string | null {
  const term = piece.warrantyPolicyId ? terms.get(piece.warrantyPolicyId) : undefined;
  return term ? addMonths(piece.deliveredOn, term) : null;
}

/**
 * A text search binds the studio, LIMIT and OFFSET as `+?` (db/bound.ts), not `?`: the same values and
 * results, but the statement is planned once per connection (statementFor) instead of on every search
 * (the planner read the studio's value against the pieces_studio_idx statistics, and LIMIT/OFFSET's); a
 * search's plan does not need the values (it starts from pieces_fts, CROSS JOIN). Lists without text keep
 * `?`: their plan (which index, sort or not) may rightly follow the studio's size and the page's LIMIT.
 * Measured with callgrind (instructions inside sqlite3_step, 100,000-piece bench seed): the page for
 * q=walnut 0.60 M, of which 0.25 M re-preparing.
 */
function searchBound(f: Pick<Filter, "fts">): string {
  return f.fts ? bound() : "?";
}

/** A piece of SQL text and the values of its `?` placeholders, in order. */
type Fragment = { text: string; params: unknown[] };

const frag = (text: string, ...params: unknown[]): Fragment => ({ text, params });

function joinFragments(parts: Fragment[], sep: string): Fragment {
  return { text: parts.map((p) => p.text).join(sep), params: parts.flatMap((p) => p.params) };
}

/**
 * The WHERE clause of the list and its count. A search joins pieces_fts to pieces by rowid alone (the
 * page and the count alike): the app never runs VACUUM (the one thing that may renumber the pieces'
 * rowids), and a deleted piece's index row goes in the same statement as the piece (the pieces_fts_ad
 * trigger, db/migrations/0031), so an index row's rowid is its piece's. Checking each index row's
 * piece id as well cost a read of the index's content row for every row of the page. After a VACUUM
 * run by hand, rebuild the index (rebuildSearchIndex).
 * `scope` is the studio's scope word for the archived state asked for (searchScope), set when the
 * filter is that and typed text alone: the count may then be answered by the index (countMatches).
 */
export type Filter = { where: Fragment; fts: string | null; codeHash: string | null; scope: string | null };

export function buildFilter(ctx: StudioContext, q: PieceListQuery, terms: Map<string, number>, useCode: boolean, t: string): Filter {
  let fts: string | null = null;
  let codeHash: string | null = null;
  const typed = q.q.trim();
  if (typed) {
    codeHash = useCode ? hashTypedCode(typed) : null;
    // Nothing searchable (only punctuation): no piece matches (the `0` below).
    if (!codeHash) fts = pieceTextMatch(typed);
  }
  const conds: Fragment[] = [frag(`p.studio_id = ${searchBound({ fts })}`, ctx.studio.id)];
  conds.push(q.archived === "only" ? frag(`p.archived_at IS NOT NULL`) : frag(`p.archived_at IS NULL`));
  if (q.kind) conds.push(frag(`p.kind = ?`, q.kind));
  if (q.species) conds.push(frag(`(p.primary_species_id = ? OR p.secondary_species_id = ?)`, q.species, q.species));
  if (q.finishClass) conds.push(frag(`EXISTS (SELECT 1 FROM finish_layers l WHERE l.piece_id = p.id AND l.finish_class = ?)`, q.finishClass));
  if (q.registered === "yes") conds.push(frag(`p.owner_id IS NOT NULL`));
  if (q.registered === "no") conds.push(frag(`p.owner_id IS NULL`));
  if (q.warranty) {
    const cases = [...terms].filter(([, m]) => m > 0).map(([id, m]) => frag(`WHEN ? THEN gw_add_months(p.delivered_on, ?)`, id, m));
    const ends = cases.length ? joinFragments([frag(`(CASE p.warranty_policy_id`), ...cases, frag(`END)`)], " ") : frag(`NULL`);
    conds.push(
      q.warranty === "active"
        ? joinFragments([ends, frag(`>= ?`, t)], " ")
        : joinFragments([frag("("), ends, frag(`IS NULL OR`), ends, frag(`< ?)`, t)], " "),
    );
  }
  if (typed) {
    if (codeHash) conds.push(frag(`p.registration_code_hash = ?`, codeHash));
    else conds.push(fts ? frag(`pieces_fts MATCH ?`, fts) : frag(`0`));
  }
  // Only the studio, the archived state and the text (whatever else is asked is in the piece's row).
  const textOnly = fts !== null && conds.length === 3;
  const scope = textOnly ? searchScope(ctx.studio.id, q.archived === "only") : null;
  return { where: joinFragments(conds, " AND "), fts, codeHash, scope };
}

// Ties break on rowid (insertion order), which the (studio_id, delivered_on) index carries, so the
// default orders read straight off an index; with a search, "newest recorded" reads the FTS index
// backwards and stops at the page (bm25 relevance ranks every match, so it is a choice, not the default).
// Only fixed words go into the text, never what was typed.
export function orderBy(q: PieceListQuery, hasFts: boolean): string {
  const sort = q.sort ?? (hasFts ? "created" : "delivered");
  const dir = q.dir === "asc" ? "ASC" : q.dir === "desc" ? "DESC" : sort === "title" ? "ASC" : "DESC";
  switch (sort) {
    case "relevance":
      return hasFts ? `pieces_fts.rank ASC, p.rowid DESC` : `p.delivered_on DESC, p.rowid DESC`;
    case "title":
      return `p.title COLLATE NOCASE ${dir}, p.rowid ${dir}`;
    case "created":
      return hasFts ? `pieces_fts.rowid ${dir}` : `p.rowid ${dir}`;
    default:
      return `p.delivered_on ${dir}, p.rowid ${dir}`;
  }
}

function fromClause(f: Filter): string {
  return f.fts ? `pieces_fts CROSS JOIN pieces p ON p.rowid = pieces_fts.rowid` : `pieces p`;
}

/** A page of registry rows for the filter (limit -1: all of them). */
export function selectListRows(f: Filter, q: PieceListQuery, limit: number, offset: number): ListPieceRow[] {
  const text = `SELECT ${LIST_COLUMNS} FROM ${fromClause(f)} LEFT JOIN users u ON u.id = p.owner_id WHERE ${f.where.text} ORDER BY ${orderBy(q, !!f.fts)} LIMIT ${searchBound(f)} OFFSET ${searchBound(f)}`;
  return (statementFor(getDb(), text).raw(true).all(...f.where.params, limit, offset) as unknown[][]).map(listRow);
}

/**
 * How many pieces match the filter, counting no further than `upTo` (the list then says "more than 500").
 * Counted afresh for every request: a count kept by the filter's text would answer a repeated search
 * from memory, which is not what searching costs.
 * "index" (only for a filter with a scope word): the index alone answers, its scope word ANDed with the
 * typed text, so no match's piece is read. "rows": each match's piece is read for its studio and
 * archived state. Both count the same pieces (registry-results.test.ts); countBy chooses.
 */
export function countMatches(f: Filter, upTo: number, by: "index" | "rows"): number {
  if (by === "index" && f.scope && f.fts) {
    const st = statementFor(getDb(), `SELECT count(*) AS n FROM (SELECT 1 FROM pieces_fts WHERE pieces_fts MATCH ? LIMIT ${bound()})`);
    return (st.get(`scope : "${f.scope}" AND ${f.fts}`, upTo) as { n: number }).n;
  }
  const text = `SELECT count(*) AS n FROM (SELECT 1 FROM ${fromClause(f)} WHERE ${f.where.text} LIMIT ${searchBound(f)})`;
  return (statementFor(getDb(), text).get(...f.where.params, upTo) as { n: number } | undefined)?.n ?? 0;
}

/**
 * Matches at most this many rowids apart, on average, are counted by the index ("index"): FTS5 ANDs the
 * typed words' list with the scope word's, stepping the scope word's list along to each match, so its
 * cost grows with the rowids stepped over, where reading each match's piece ("rows") costs the same
 * however far apart they lie. Measured with cachegrind on the 100,000-piece bench seed (one studio,
 * tests/bench/seed-registry.ts), per count of up to 501: q=walnut (matches about 10 rowids apart) 1.16 M
 * instructions by the index against 1.65 M by the rows, q=burl (about 7) 1.13 M against 1.40 M,
 * q=Thornwood (about 256) 7.65 M against 1.48 M; by instructions the two meet near 23 apart. The index
 * reads far less memory (L1 data read misses for walnut 1.8 k against 6.1 k), and by process CPU of
 * repeated counts the two met between 20 and 50 apart.
 */
const INDEX_COUNT_SPREAD = 32;

/**
 * How countMatches should count, from the page just read: a page in rowid order (a search's default,
 * "newest recorded") shows how far apart the matches lie; any other order, or a filter without a scope
 * word, counts by the rows.
 */
export function countBy(f: Filter, q: PieceListQuery, page: ListPieceRow[]): "index" | "rows" {
  if (!f.scope || (q.sort ?? "created") !== "created" || page.length < 2) return "rows";
  const spread = Math.abs(page[0]!.rowid - page[page.length - 1]!.rowid) / (page.length - 1);
  return spread <= INDEX_COUNT_SPREAD ? "index" : "rows";
}

const versionStatements = perConnection((db) => ({
  dataVersion: db.$client.prepare("PRAGMA data_version").pluck(),
  totalChanges: db.$client.prepare("SELECT total_changes()").pluck(),
}));

/** Changes whenever anything in the database changed since it was last asked (any connection, this one included). */
export function databaseVersion(db: Db): string {
  const st = versionStatements(db);
  return `${db.$client.name}|${st.dataVersion.get() as number}|${st.totalChanges.get() as number}`;
}

/** A text search counts its matches up to this many (the list says "more than 500"); counting further would read every match. */
export const SEARCH_COUNT_CAP = 500;
/** Without a text search, counts stop here ("10,000+"). */
export const LIST_COUNT_CAP = 10_000;

export type CareLogColumns = Pick<CareLogRow, "taskKind" | "doneOn" | "surface">;

/** What a registry row shows of a piece (the list query's columns). */
export type ListPieceRow = Pick<Piece, "id" | "title" | "kind" | "deliveredOn" | "primarySpeciesId" | "secondarySpeciesId" | "ownerId" | "warrantyPolicyId"> & {
  archivedAt: number | null;
  ownerName: string | null;
  ownerEmail: string | null;
  finishClasses: FinishClass[];
  /** The piece's rowid (its search index row's too): countBy reads how far apart a page's matches lie. */
  rowid: number;
};

/** What the care engine reads of a piece, its layers and its care log. */
export type CareInputs = { piece: CarePieceColumns; layers: CareLayerColumns[]; careLog: CareLogColumns[] };

/** The care engine's inputs for these pieces (ids of the caller's studio's rows), 500 at a time. */
export function loadCareInputs(ids: string[]): Map<string, CareInputs> {
  const st = registryStatements(getDb());
  const out = new Map<string, CareInputs>();
  for (let i = 0; i < ids.length; i += 500) {
    const chunk = JSON.stringify(ids.slice(i, i + 500));
    for (const piece of st.carePieces.all(chunk)) out.set(piece.id, { piece, layers: [], careLog: [] });
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
    const chunk = JSON.stringify(ids.slice(i, i + 500));
    for (const piece of wholeRows<Piece>(pieces, st.fullPieces.all(chunk))) out.set(piece.id, { piece, layers: [] });
    for (const l of wholeRows<FinishLayer>(finishLayers, st.fullLayers.all(chunk))) out.get(l.pieceId)?.layers.push(l);
  }
  return out;
}
