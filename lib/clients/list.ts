import "server-only";
import { sql, type SQL } from "drizzle-orm";
import { getDb } from "@/db/client";
import type { StudioContext } from "@/lib/auth/guards";
import Papa from "papaparse";
import { localDate } from "@/lib/care/dates";
import { OPEN_STATES } from "@/lib/claims/states";
import { cell } from "@/lib/pieces/csv";
import { LIST_COUNT_CAP, SEARCH_COUNT_CAP } from "@/lib/pieces/registry-sql";
import { ftsQuery } from "@/lib/pieces/search-index";
import { CLIENT_PAGE_SIZE, type ClientListQuery } from "@/lib/validation/clients";
import { displayPhone, phoneSearchKeys } from "./phone";

export type ClientRow = {
  id: string;
  name: string;
  email: string;
  phoneDisplay: string;
  hasAccount: boolean;
  pieces: number;
  /** Of those, pieces nobody has registered yet. */
  unregistered: number;
  openClaims: number;
  updatedAt: string;
};
export type ClientPage = { rows: ClientRow[]; total: number; /** true: more than `total` match (the count stops there). */ totalIsCapped: boolean; page: number; pageSize: number };

const likeEscape = (s: string) => s.replace(/[\\%_]/g, (c) => `\\${c}`);
const OPEN = sql.raw(OPEN_STATES.map((s) => `'${s}'`).join(", "));

/** A phrase in an FTS5 query: the text in double quotes, quotes inside doubled. */
const phrase = (s: string) => `"${s.replace(/"/g, '""')}"`;
/** The trigram index reads substrings of at least three characters; shorter words are matched by LIKE. */
const TRIGRAM = 3;

/**
 * What a search looks up. Every word must match the name, the e-mail, the phone (by digits) or one of
 * their pieces' titles. Name, e-mail and phone match anywhere inside them, through the trigram index
 * clients_fts (case-blind, as LIKE was); a word under three characters, which that index cannot look up,
 * is matched by LIKE. A title matches by the start of one of its words, through client_titles_fts
 * (tokenised like the registry's index, lib/pieces/search-index.ts). Both indexes are kept by triggers
 * (migration 0025) and keyed by the client's rowid. A whole number typed with spaces or a trunk prefix
 * ("0412 555 019") also matches by its E.164 or its digits.
 */
function searchTerms(q: string, country: string) {
  const words = q.split(/\s+/).filter(Boolean).slice(0, 8);
  if (!words.length) return undefined;
  const perWord = words.map((w) => {
    const digits = w.replace(/\D/g, "");
    const short = [...w].length < TRIGRAM;
    // A word of digits only is one phrase over the three columns (name and e-mail by the word, the phone by
    // its digits: the same text), which reads the index once instead of twice.
    const trigram = short ? [] : digits === w ? [phrase(w)] : [`{name email} : ${phrase(w)}`, ...(digits.length >= TRIGRAM ? [`phone : ${phrase(digits)}`] : [])];
    const title = ftsQuery(w);
    return {
      like: short ? `%${likeEscape(w)}%` : null,
      trigram: trigram.length ? trigram.join(" OR ") : null,
      title: title ? `titles : ${title}` : null,
      // A word of ASCII letters and digits is one token to the index (lowercased): it can be tested on a client's titles text (titleOnRow).
      titleWord: title && ASCII_WORD.test(w) ? w.toLowerCase() : null,
    };
  });
  const phone = phoneSearchKeys(q, country);
  const wholePhone = phone.e164 ? { e164: phone.e164 } : phone.digits.length >= 6 && words.length > 1 ? { trigram: `phone : ${phrase(phone.digits)}` } : null;
  return { perWord, wholePhone };
}
type SearchTerms = NonNullable<ReturnType<typeof searchTerms>>;

const ASCII_WORD = /^[A-Za-z0-9]+$/;

/**
 * Whether one of the client's piece titles has a word starting with `word` (ASCII letters and digits,
 * lowercased), tested on their row of client_titles_fts, joined as `t` (its stored text, in the table
 * SQLite keeps for it, client_titles_fts_content, column c0: read by rowid it costs half what the
 * virtual table's lookup does), instead of through the index: the page past the count cap reads a few
 * hundred clients in name order and stops, where the index's set of a common word is every match
 * (8,486 on the bench seed), all read before the first row.
 * The answer is the index's own. The index (unicode61, migration 0025) splits a title at every ASCII
 * character other than a letter or a digit and lowercases ASCII letters, so in titles of ASCII text a
 * word starts with `word` exactly when `word` occurs (LIKE: ASCII letters in either case) at the start
 * or after such a character: at the start or after a space or a line break (between titles) says most
 * rows, a GLOB over the lowercased text the rest. Titles with other characters (the index may fold
 * them to ASCII letters: 'Ḃurl' is a word 'burl') are tested against the index's set, read once for
 * the statement if such a row comes up. That ASCII characters other than letters and digits separate
 * words was checked against the SQLite this project links (tests/integration/clients-search-walk.test.ts).
 */
function titleOnRow(word: string, title: string): SQL {
  return sql`CASE WHEN t.c0 IS NULL THEN 0
    WHEN length(t.c0) <> octet_length(t.c0) THEN c.rowid IN (SELECT rowid FROM client_titles_fts WHERE client_titles_fts MATCH ${title})
    WHEN NOT t.c0 LIKE ${`%${word}%`} THEN 0
    WHEN t.c0 LIKE ${`${word}%`} OR t.c0 LIKE ${`% ${word}%`} OR t.c0 LIKE ${`%\n${word}%`} THEN 1
    ELSE char(10) || lower(t.c0) GLOB ${`*[^a-z0-9]${word}*`} END`;
}

/**
 * The search as a condition on a client row `c`: each word's match sets tested by rowid (the page past
 * the count cap, the CSV export); `onRow`: a title word of ASCII letters and digits tested on the
 * client's titles instead (titleOnRow; the statement joins client_titles_fts as `t`).
 */
function searchWhere({ perWord, wholePhone }: SearchTerms, onRow = false): SQL {
  const allWords = sql.join(
    perWord.map(({ like, trigram, title, titleWord }) => {
      const matches = [
        like ? sql`c.name LIKE ${like} ESCAPE '\\' OR c.email LIKE ${like} ESCAPE '\\'` : null,
        trigram ? sql`c.rowid IN (SELECT rowid FROM clients_fts WHERE clients_fts MATCH ${trigram})` : null,
        title && titleWord && onRow ? titleOnRow(titleWord, title) : null,
        title && !(titleWord && onRow) ? sql`c.rowid IN (SELECT rowid FROM client_titles_fts WHERE client_titles_fts MATCH ${title})` : null,
      ].filter(Boolean) as SQL[];
      return matches.length ? sql`(${sql.join(matches, sql` OR `)})` : sql`0`;
    }),
    sql` AND `,
  );
  const whole = !wholePhone
    ? sql``
    : "e164" in wholePhone
      ? sql` OR c.phone = ${wholePhone.e164}`
      : sql` OR c.rowid IN (SELECT rowid FROM clients_fts WHERE clients_fts MATCH ${wholePhone.trigram})`;
  return sql`((${allWords})${whole})`;
}

/**
 * The search as the client rowids it finds, one compound SELECT of `rid` in rowid order (the studio and
 * filter are checked by the reader): each word's matches are the union of what it finds in each index,
 * the words' sets are intersected. In rowid order, as both indexes return them, SQLite merges the sets
 * as it reads them, so a reader that stops early (the capped count) reads only the start of each.
 */
function searchRowids({ perWord, wholePhone }: SearchTerms, studioId: string): SQL {
  const words = perWord.map(({ like, trigram, title }) => {
    const parts = [
      like ? sql`SELECT rowid AS rid FROM clients WHERE studio_id = ${studioId} AND (name LIKE ${like} ESCAPE '\\' OR email LIKE ${like} ESCAPE '\\')` : null,
      trigram ? sql`SELECT rowid AS rid FROM clients_fts WHERE clients_fts MATCH ${trigram}` : null,
      title ? sql`SELECT rowid AS rid FROM client_titles_fts WHERE client_titles_fts MATCH ${title}` : null,
    ].filter(Boolean) as SQL[];
    return parts.length ? sql`SELECT rid FROM (${sql.join(parts, sql` UNION `)} ORDER BY rid)` : sql`SELECT NULL AS rid WHERE 0`;
  });
  const whole = !wholePhone
    ? sql``
    : "e164" in wholePhone
      ? sql` UNION SELECT rowid AS rid FROM clients WHERE studio_id = ${studioId} AND phone = ${wholePhone.e164}`
      : sql` UNION SELECT rowid AS rid FROM clients_fts WHERE clients_fts MATCH ${wholePhone.trigram}`;
  return sql`${sql.join(words, sql` INTERSECT `)}${whole} ORDER BY rid`;
}

const FILTERS: Record<NonNullable<ClientListQuery["filter"]>, SQL> = {
  account: sql`c.user_id IS NOT NULL`,
  unregistered: sql`EXISTS (SELECT 1 FROM pieces p WHERE p.client_id = c.id AND p.owner_id IS NULL AND p.archived_at IS NULL)`,
  // The hand-over mail went out for a piece of theirs that nobody has registered yet.
  invited: sql`EXISTS (SELECT 1 FROM piece_handovers h JOIN pieces p ON p.id = h.piece_id
    WHERE h.studio_id = c.studio_id AND h.client_id = c.id AND h.last_sent_at IS NOT NULL AND p.owner_id IS NULL AND p.archived_at IS NULL)`,
  // Care reminders are paused on a piece of theirs, or switched off in their account.
  paused: sql`(EXISTS (SELECT 1 FROM pieces p WHERE p.client_id = c.id AND p.reminders_paused = 1 AND p.archived_at IS NULL)
    OR EXISTS (SELECT 1 FROM users u WHERE u.id = c.user_id AND u.reminders_enabled = 0))`,
  open_claims: sql`c.user_id IS NOT NULL AND EXISTS (SELECT 1 FROM claims k WHERE k.owner_id = c.user_id AND k.studio_id = c.studio_id AND k.state IN (${OPEN}))`,
};

const ORDER: Record<ClientListQuery["sort"], { column: SQL; dir: "asc" | "desc" }> = {
  name: { column: sql`c.name COLLATE NOCASE`, dir: "asc" },
  newest: { column: sql`c.created_at`, dir: "desc" },
  updated: { column: sql`c.updated_at`, dir: "desc" },
};

type ListedRow = {
  id: string;
  name: string;
  email: string | null;
  phone: string | null;
  userId: string | null;
  updatedAt: number;
  /** Both piece counts in one number (LISTED): pieces × 2^32 + unregistered (pieceCounts reads them). */
  pieceCounts: number;
  openClaims: number;
};
/** The CSV export's row: the listed columns and the client record's others it shows. */
type ExportedRow = ListedRow & { address: string; consentService: number; consentOffers: number; createdAt: number };

/** The WHERE of the list's current search and filter, scoped to the caller's studio (`onRow`: see searchWhere). */
function clientsWhere(ctx: StudioContext, query: ClientListQuery, terms = searchTerms(query.q, ctx.studio.country), onRow = false): SQL {
  const conditions = [sql`c.studio_id = ${ctx.studio.id}`, terms && searchWhere(terms, onRow), query.filter ? FILTERS[query.filter] : undefined].filter(Boolean) as SQL[];
  return sql.join(conditions, sql` AND `);
}

/**
 * Past this many clients (a list without a search) or a search's count cap (SEARCH_COUNT_CAP) a page in
 * name order is read along clients_studio_name_nocase_idx, testing each entry (against the search's
 * match sets) and stopping at the page. Measured on the bench seed (20,000 clients): 8,486 matches,
 * 11 ms by rowid and sort vs 2 ms along the index. Under the cap a search's page is read from its
 * matches (searchFirst).
 */
const READ_IN_NAME_ORDER_FROM = 1000;

/**
 * A listed client's columns (from `c`), with the counts for that row only: what the list shows, no more
 * (each column of each row costs its conversion to JavaScript: the export's four others cost the burl
 * page statement 0.77 M of its 4.2 M instructions). The client's pieces and those of them nobody has
 * registered are counted in one read of pieces_client_idx, returned as one number (pieceCounts): two
 * lookups cost the burl page 0.08 M SQLite instructions more for 50 rows.
 */
const LISTED = sql`c.id, c.name, c.email, c.phone, c.user_id AS userId, c.updated_at AS updatedAt,
  (SELECT count(*) * ${sql.raw(String(2 ** 32))} + count(*) FILTER (WHERE p.owner_id IS NULL) FROM pieces p WHERE p.client_id = c.id AND p.archived_at IS NULL) AS pieceCounts,
  CASE WHEN c.user_id IS NULL THEN 0 ELSE (SELECT count(*) FROM claims k WHERE k.owner_id = c.user_id AND k.studio_id = c.studio_id AND k.state IN (${OPEN})) END AS openClaims`;

/** A listed row's piece counts (LISTED's pieceCounts): all of the client's pieces, and those nobody has registered. */
function pieceCounts(row: ListedRow): { pieces: number; unregistered: number } {
  return { pieces: Math.floor(row.pieceCounts / 2 ** 32), unregistered: row.pieceCounts % 2 ** 32 };
}

/** ORDER BY of the list's sort (the client's id breaks ties, so pages never overlap). */
function orderBy(query: ClientListQuery): SQL {
  const order = ORDER[query.sort];
  const dir = sql.raw((query.dir ?? order.dir) === "asc" ? "ASC" : "DESC");
  return sql`ORDER BY ${order.column} ${dir}, c.id ${dir}`;
}

/**
 * The caller's studio's clients matching `where`, sorted: one page (LISTED), or every row with the
 * export's columns. `join`: tables `where` reads beside `c`.
 */
function queryClients(query: ClientListQuery, where: SQL, page: { limit: number; offset: number }, manyMatches?: boolean, join?: SQL): ListedRow[];
function queryClients(query: ClientListQuery, where: SQL, page: "all"): ExportedRow[];
function queryClients(query: ClientListQuery, where: SQL, page: { limit: number; offset: number } | "all", manyMatches = false, join = sql``): ListedRow[] {
  const alongName = manyMatches && query.sort === "name";
  const hint = alongName ? sql.raw("INDEXED BY clients_studio_name_nocase_idx") : sql``;
  const columns = page === "all" ? sql`${LISTED}, c.address, c.consent_service AS consentService, c.consent_offers AS consentOffers, c.created_at AS createdAt` : LISTED;
  // Along the name index the rows come in the page's order: one SELECT, whose columns (the counts) SQLite
  // computes for the page's rows only, those OFFSET skips and those the WHERE drops never reach them. On
  // the bench seed the burl page (past the cap, pageOnRows) took 2.43 M SQLite instructions as a page of
  // whole rows sorted again with their counts, 2.04 M so.
  if (alongName && page !== "all")
    return getDb().all<ListedRow>(sql`SELECT ${columns} FROM clients c ${hint} ${join} WHERE ${where} ${orderBy(query)} LIMIT ${page.limit} OFFSET ${page.offset}`);
  // Otherwise the page's clients first (sorted), then the counts for those rows only.
  return getDb().all<ListedRow>(sql`
    SELECT ${columns}
    FROM (SELECT c.* FROM clients c ${hint} ${join} WHERE ${where} ${orderBy(query)}
      ${page === "all" ? sql`` : sql`LIMIT ${page.limit} OFFSET ${page.offset}`}) c
    ${orderBy(query)}`);
}

/** Pages up to this one past the count cap, in name order, are read with the title words tested on each row (pageOnRows). */
const ON_ROWS_PAGES = 3;
/** …among this many times as many of the studio's clients (in that order) as the page's end: a word matching at least a quarter of them. */
const ON_ROWS_REACH = 4;

/**
 * A page past the count cap in name order, its title words tested on each row (searchWhere's `onRow`)
 * along clients_studio_name_nocase_idx, which stops at the page: on the bench seed "burl" (8,486 of
 * 20,000 clients) reads 112 clients for page 1, where testing each against the index's sets read all
 * 8,486 matches first (0.2 ms instead of 1.1 ms of SQLite's time). A row test costs more than a
 * set's, so only the first pages, and only among the first ON_ROWS_REACH × the page's end clients (the
 * name of the last one bounds the walk): null when they hold fewer matches than the page needs, and
 * the caller reads the page with the sets. The rows are those of queryClients over clientsWhere.
 */
function pageOnRows(ctx: StudioContext, query: ClientListQuery, terms: SearchTerms, page: { limit: number; offset: number }): ListedRow[] | null {
  if (query.sort !== "name" || page.offset >= ON_ROWS_PAGES * page.limit || !terms.perWord.some((w) => w.titleWord)) return null;
  const asc = (query.dir ?? ORDER.name.dir) === "asc";
  const dir = sql.raw(asc ? "ASC" : "DESC");
  const edge = getDb().get<{ name: string } | undefined>(sql`
    SELECT name FROM clients INDEXED BY clients_studio_name_nocase_idx WHERE studio_id = ${ctx.studio.id}
    ORDER BY name COLLATE NOCASE ${dir}, id ${dir} LIMIT 1 OFFSET ${ON_ROWS_REACH * (page.offset + page.limit) - 1}`);
  // By the name alone (a bound SQLite reads the index to, unlike a (name, id) pair): clients who share the
  // last one's name come too, the walk's start all the same.
  const within = edge ? sql` AND c.name COLLATE NOCASE ${sql.raw(asc ? "<=" : ">=")} ${edge.name}` : sql``;
  const rows = queryClients(query, sql`${clientsWhere(ctx, query, terms, true)}${within}`, page, true, sql`LEFT JOIN client_titles_fts_content t ON t.id = c.rowid`);
  return rows.length === page.limit || !edge ? rows : null;
}

/**
 * Whether the search's title matches alone pass the cap: every word's title matches (one MATCH of the
 * title index, the words ANDed) joined to the studio's clients with the filter, counted as they stream in
 * rowid order up to `cap` + 1. Each client it finds is one the search finds, so reaching `cap` + 1 is the
 * search's capped count without merging the title matches with the other indexes' (searchRowids). On the
 * bench seed "burl" (8,486 clients through their titles) took 2.53 M SQLite instructions to merge and
 * count, 1.03 M to count its title matches alone; a search with few title matches ("Thornwick": none)
 * adds a lookup that finds them. False when a word has no title query (ftsQuery found no letter or digit).
 */
function titlesPassCap(query: ClientListQuery, studioId: string, { perWord }: SearchTerms, cap: number): boolean {
  if (!perWord.every((w) => w.title)) return false;
  const titles = perWord.map((w) => `(${w.title})`).join(" AND ");
  const filter = query.filter ? sql` AND ${FILTERS[query.filter]}` : sql``;
  return getDb().get<{ n: number }>(sql`SELECT count(*) AS n FROM (SELECT 1 FROM client_titles_fts f CROSS JOIN clients c ON c.rowid = f.rowid
    WHERE client_titles_fts MATCH ${titles} AND c.studio_id = ${studioId}${filter} LIMIT ${cap + 1})`)!.n > cap;
}

/**
 * A search's capped count and, when it is under the cap, its page, in one statement that reads the
 * matches once: the search's rowids (searchRowids, merged in rowid order) are joined to their clients
 * (the studio and the filter checked there) until `cap` + 1 are found; when no more than `cap` are, the
 * page is those sorted. Past the cap `rows` is empty and the caller reads the page another way.
 * Before, a search counted and then paged with `c.rowid IN (...)` tests, which SQLite answered by
 * walking all of the studio's clients along the name index twice (20,000 on the bench seed) even for a
 * surname with 25 matches. The page is sorted as rowids and its clients read once after (sorting whole
 * rows, then sorting them again with their counts, cost "Thornwick" 0.14 M SQLite instructions more).
 */
function searchFirst(query: ClientListQuery, studioId: string, rowids: SQL, cap: number, page: { limit: number; offset: number }): { counted: number; rows: ListedRow[] } {
  const filter = query.filter ? sql` AND ${FILTERS[query.filter]}` : sql``;
  const found = getDb().all<ListedRow & { counted: number }>(sql`
    WITH m AS MATERIALIZED (SELECT c.rowid AS rid FROM (${rowids}) s CROSS JOIN clients c ON c.rowid = s.rid WHERE c.studio_id = ${studioId}${filter} LIMIT ${cap + 1}),
      n AS MATERIALIZED (SELECT count(*) AS counted FROM m),
      pg AS (SELECT c.rowid AS rid FROM clients c WHERE c.rowid IN (SELECT rid FROM m) ${orderBy(query)}
        LIMIT CASE WHEN (SELECT counted FROM n) <= ${cap} THEN ${page.limit} ELSE 0 END OFFSET ${page.offset})
    SELECT n.counted, ${LISTED} FROM n LEFT JOIN pg LEFT JOIN clients c ON c.rowid = pg.rid ${orderBy(query)}`);
  return { counted: found[0]!.counted, rows: found.filter((r) => r.id !== null) };
}

/**
 * How many clients the search and filter find, counted up to `cap` + 1: past it the list says "more than"
 * (as the registry does, lib/pieces/registry-list.ts). Counting every match read all 8,486 clients of a
 * common title word on the bench seed, most of the request.
 */
function countClients(where: SQL, cap: number): number {
  return getDb().get<{ n: number }>(sql`SELECT count(*) AS n FROM (SELECT 1 FROM clients c WHERE ${where} LIMIT ${cap + 1})`)!.n;
}

/** A stored number as shown (libphonenumber's parse and format cost more than the page's SQL for 50 rows); kept for the last 10,000 numbers. */
function shownPhone(e164: string | null, country: string): string {
  const key = `${country}|${e164 ?? ""}`;
  let shown = shownPhones.get(key);
  if (shown === undefined) {
    shown = displayPhone(e164, country);
    if (shownPhones.size >= 10_000) shownPhones.delete(shownPhones.keys().next().value!);
    shownPhones.set(key, shown);
  }
  return shown;
}

const shownPhones = new Map<string, string>();

/** One page (50) of the caller's studio's clients, searched, filtered and sorted, with the total. */
export function listClients(ctx: StudioContext, query: ClientListQuery): ClientPage {
  const page = { limit: CLIENT_PAGE_SIZE, offset: (query.page - 1) * CLIENT_PAGE_SIZE };
  const terms = searchTerms(query.q, ctx.studio.country);
  let counted: number;
  let rows: ListedRow[];
  let cap: number;
  if (terms) {
    cap = SEARCH_COUNT_CAP;
    ({ counted, rows } = titlesPassCap(query, ctx.studio.id, terms, cap) ? { counted: cap + 1, rows: [] } : searchFirst(query, ctx.studio.id, searchRowids(terms, ctx.studio.id), cap, page));
    if (counted > cap) rows = pageOnRows(ctx, query, terms, page) ?? queryClients(query, clientsWhere(ctx, query, terms), page, true);
  } else {
    cap = LIST_COUNT_CAP;
    const where = clientsWhere(ctx, query);
    counted = countClients(where, cap);
    rows = queryClients(query, where, page, counted > cap || counted >= READ_IN_NAME_ORDER_FROM);
  }
  const totalIsCapped = counted > cap;
  return {
    rows: rows.map((r) => ({
      id: r.id,
      name: r.name,
      email: r.email ?? "",
      phoneDisplay: shownPhone(r.phone, ctx.studio.country),
      hasAccount: !!r.userId,
      ...pieceCounts(r),
      openClaims: r.openClaims,
      updatedAt: new Date(r.updatedAt).toISOString(),
    })),
    total: totalIsCapped ? cap : counted,
    totalIsCapped,
    page: query.page,
    pageSize: CLIENT_PAGE_SIZE,
  };
}

export const CLIENT_CSV_COLUMNS = ["name", "email", "phone", "address", "service_mail", "offers", "has_account", "pieces", "unregistered", "open_claims", "created_on", "updated_on"] as const;

/**
 * GET /api/clients/export.csv: every client the list's current search and filter find (all pages),
 * one row each. Cells that a spreadsheet would read as a formula are prefixed with ' (lib/pieces/csv).
 */
export function exportClientsCsv(ctx: StudioContext, query: ClientListQuery): string {
  const rows = queryClients(query, clientsWhere(ctx, query), "all");
  const day = (ms: number) => localDate(ms, ctx.studio.timeZone);
  const yesNo = (b: unknown) => (b ? "yes" : "no");
  const data = rows.map((r) => {
    const { pieces, unregistered } = pieceCounts(r);
    return [r.name, r.email ?? "", displayPhone(r.phone, ctx.studio.country), r.address, yesNo(r.consentService), yesNo(r.consentOffers), yesNo(r.userId), pieces, unregistered, r.openClaims, day(r.createdAt), day(r.updatedAt)].map(cell);
  });
  return Papa.unparse({ fields: [...CLIENT_CSV_COLUMNS], data });
}
