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
 * Every word must match the name, the e-mail, the phone (by digits) or one of their pieces' titles.
 * Name, e-mail and phone match anywhere inside them, through the trigram index clients_fts (case-blind,
 * as LIKE was); a word under three characters, which that index cannot look up, is matched by LIKE. A
 * title matches by the start of one of its words, through client_titles_fts (tokenised like the
 * registry's index, lib/pieces/search-index.ts). Both indexes are kept by triggers (migration 0025);
 * each word's matches are looked up once, as a set of client rowids (the indexes' rowids).
 */
function searchWhere(q: string, country: string): SQL | undefined {
  const words = q.split(/\s+/).filter(Boolean).slice(0, 8);
  if (!words.length) return undefined;
  const phone = phoneSearchKeys(q, country);
  const perWord = words.map((w) => {
    const digits = w.replace(/\D/g, "");
    const short = [...w].length < TRIGRAM;
    const terms = [short ? null : `{name email} : ${phrase(w)}`, digits.length >= TRIGRAM ? `phone : ${phrase(digits)}` : null].filter(Boolean);
    const title = ftsQuery(w);
    const like = `%${likeEscape(w)}%`;
    const matches = [
      short ? sql`c.name LIKE ${like} ESCAPE '\\' OR c.email LIKE ${like} ESCAPE '\\'` : null,
      terms.length ? sql`c.rowid IN (SELECT rowid FROM clients_fts WHERE clients_fts MATCH ${terms.join(" OR ")})` : null,
      title ? sql`c.rowid IN (SELECT rowid FROM client_titles_fts WHERE client_titles_fts MATCH ${`titles : ${title}`})` : null,
    ].filter(Boolean) as SQL[];
    return matches.length ? sql`(${sql.join(matches, sql` OR `)})` : sql`0`;
  });
  const allWords = sql.join(perWord, sql` AND `);
  // A whole number typed with spaces or a trunk prefix ("0412 555 019") matches by its E.164 or its digits.
  const whole = phone.e164
    ? sql` OR c.phone = ${phone.e164}`
    : phone.digits.length >= 6 && words.length > 1
      ? sql` OR c.rowid IN (SELECT rowid FROM clients_fts WHERE clients_fts MATCH ${`phone : ${phrase(phone.digits)}`})`
      : sql``;
  return sql`((${allWords})${whole})`;
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
  address: string;
  consentService: number;
  consentOffers: number;
  userId: string | null;
  createdAt: number;
  updatedAt: number;
  pieces: number;
  unregistered: number;
  openClaims: number;
};

/** The WHERE of the list's current search and filter, scoped to the caller's studio. */
function clientsWhere(ctx: StudioContext, query: ClientListQuery): SQL {
  const conditions = [sql`c.studio_id = ${ctx.studio.id}`, searchWhere(query.q, ctx.studio.country), query.filter ? FILTERS[query.filter] : undefined].filter(Boolean) as SQL[];
  return sql.join(conditions, sql` AND `);
}

/**
 * Past this many matches (or a search's count cap, SEARCH_COUNT_CAP) a page in name order is read along clients_studio_name_nocase_idx, testing
 * each entry against the search's match sets and stopping at the page; below it, the matches are read
 * by rowid and sorted, which SQLite's planner picks by itself. Measured on the bench seed (20,000
 * clients): 8,486 matches, 11 ms by rowid and sort vs 2 ms along the index; 25 matches, 0.5 vs 3.5 ms.
 */
const READ_IN_NAME_ORDER_FROM = 1000;

/** The caller's studio's clients matching `where`, sorted: one page, or every row (the CSV export). */
function queryClients(query: ClientListQuery, where: SQL, page: { limit: number; offset: number } | "all", manyMatches = false): ListedRow[] {
  const order = ORDER[query.sort];
  const dir = sql.raw((query.dir ?? order.dir) === "asc" ? "ASC" : "DESC");
  const hint = manyMatches && query.sort === "name" ? sql.raw("INDEXED BY clients_studio_name_nocase_idx") : sql``;
  // The page's clients first, then the counts for those rows only.
  return getDb().all<ListedRow>(sql`
    SELECT c.id, c.name, c.email, c.phone, c.address, c.consent_service AS consentService, c.consent_offers AS consentOffers,
      c.user_id AS userId, c.created_at AS createdAt, c.updated_at AS updatedAt,
      (SELECT count(*) FROM pieces p WHERE p.client_id = c.id AND p.archived_at IS NULL) AS pieces,
      (SELECT count(*) FROM pieces p WHERE p.client_id = c.id AND p.archived_at IS NULL AND p.owner_id IS NULL) AS unregistered,
      CASE WHEN c.user_id IS NULL THEN 0 ELSE (SELECT count(*) FROM claims k WHERE k.owner_id = c.user_id AND k.studio_id = c.studio_id AND k.state IN (${OPEN})) END AS openClaims
    FROM (SELECT c.* FROM clients c ${hint} WHERE ${where}
      ORDER BY ${order.column} ${dir}, c.id ${dir}
      ${page === "all" ? sql`` : sql`LIMIT ${page.limit} OFFSET ${page.offset}`}) c
    ORDER BY ${order.column} ${dir}, c.id ${dir}`);
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
  const where = clientsWhere(ctx, query);
  const cap = query.q.trim() ? SEARCH_COUNT_CAP : LIST_COUNT_CAP;
  const counted = countClients(where, cap);
  const totalIsCapped = counted > cap;
  const rows = queryClients(query, where, { limit: CLIENT_PAGE_SIZE, offset: (query.page - 1) * CLIENT_PAGE_SIZE }, totalIsCapped || counted >= READ_IN_NAME_ORDER_FROM);
  return {
    rows: rows.map((r) => ({
      id: r.id,
      name: r.name,
      email: r.email ?? "",
      phoneDisplay: shownPhone(r.phone, ctx.studio.country),
      hasAccount: !!r.userId,
      pieces: r.pieces,
      unregistered: r.unregistered,
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
  const data = rows.map((r) =>
    [r.name, r.email ?? "", displayPhone(r.phone, ctx.studio.country), r.address, yesNo(r.consentService), yesNo(r.consentOffers), yesNo(r.userId), r.pieces, r.unregistered, r.openClaims, day(r.createdAt), day(r.updatedAt)].map(cell),
  );
  return Papa.unparse({ fields: [...CLIENT_CSV_COLUMNS], data });
}
