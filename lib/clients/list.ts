import "server-only";
import type { StudioContext } from "@/lib/auth/guards";
import Papa from "papaparse";
import { localDate } from "@/lib/care/dates";
import { cell } from "@/lib/pieces/csv";
import { CLIENT_PAGE_SIZE, type ClientListQuery } from "@/lib/validation/clients";
import { asciiLower, clientsIndex, gramAt, shownPhone, titleWords, type ClientsIndex, type IndexedClient } from "./list-index";
import { phoneSearchKeys } from "./phone";

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
export type ClientPage = { rows: ClientRow[]; total: number; page: number; pageSize: number };

const FILTERS: Record<NonNullable<ClientListQuery["filter"]>, (c: IndexedClient) => boolean> = {
  account: (c) => c.userId !== null,
  unregistered: (c) => c.unregistered > 0,
  invited: (c) => !!c.invited,
  paused: (c) => !!c.paused,
  open_claims: (c) => c.userId !== null && c.openClaims > 0,
};

/** The trigram index read substrings of at least three characters; shorter words are matched as LIKE matched them. */
const TRIGRAM = 3;

/**
 * Calls `mark` for each slot whose text contains `needle`: the slots listed under its rarest three
 * characters, each checked with `contains`.
 */
function eachContaining(grams: Map<number, Int32Array>, needle: string, contains: (slot: number) => boolean, mark: (slot: number) => void) {
  let fewest: Int32Array | undefined;
  for (let i = 0; i + 3 <= needle.length; i++) {
    const slots = grams.get(gramAt(needle, i));
    if (!slots) return;
    if (!fewest || slots.length < fewest.length) fewest = slots;
  }
  for (const s of fewest ?? []) if (contains(s)) mark(s);
}

/** The first index in the sorted `words` at or after `w`. */
function lowerBound(words: string[], w: string): number {
  let lo = 0;
  let hi = words.length;
  while (lo < hi) {
    const mid = (lo + hi) >> 1;
    if (words[mid]! < w) lo = mid + 1;
    else hi = mid;
  }
  return lo;
}

/**
 * Marks the clients one word of the search finds: inside the name or e-mail, case-blind (a word under
 * three characters as LIKE '%w%' did: ASCII letters case-blind); its digits inside the phone (three or
 * more); or a title of one of their pieces with a word starting with it (a word that reads as several,
 * "oak-leaf", as those words in a row, the last by its start), as the registry's full-text search reads
 * titles (lib/pieces/search-index.ts ftsQuery).
 */
function eachMatch(ix: ClientsIndex, w: string, mark: (slot: number) => void) {
  if ([...w].length < TRIGRAM) {
    const lower = asciiLower(w);
    for (let s = 0; s < ix.clients.length; s++) if (ix.nameAscii[s]!.includes(lower) || ix.emailAscii[s]!.includes(lower)) mark(s);
  } else {
    const fold = w.toLowerCase();
    eachContaining(ix.grams, fold, (s) => ix.nameFold[s]!.includes(fold) || ix.emailFold[s]!.includes(fold), mark);
  }
  const digits = w.replace(/\D/g, "");
  if (digits.length >= TRIGRAM) eachContaining(ix.phoneGrams, digits, (s) => ix.phones[s]!.includes(digits), mark);
  const typed = w.normalize("NFKC");
  const tokens = /[\p{L}\p{N}]/u.test(typed) ? titleWords(typed) : [];
  if (tokens.length === 1) {
    const start = tokens[0]!;
    for (let i = lowerBound(ix.words, start); i < ix.words.length && ix.words[i]!.startsWith(start); i++) for (const s of ix.wordSlots[i]!) mark(s);
  } else if (tokens.length > 1) {
    const first = lowerBound(ix.words, tokens[0]!);
    if (ix.words[first] !== tokens[0]) return;
    const run = tokens.join(" ");
    for (const s of ix.wordSlots[first]!) if (ix.titleLines[s]!.includes(`\n${run}`) || ix.titleLines[s]!.includes(` ${run}`)) mark(s);
  }
}

/**
 * The slots the search finds, ascending (name order), or null when there is no search: every word (up
 * to 8) must match (eachMatch); or the whole text is one phone number typed with spaces or a trunk
 * prefix ("0412 555 019"), matched by its E.164 or its digits.
 */
function searchSlots(ix: ClientsIndex, q: string): Int32Array | null {
  const words = q.split(/\s+/).filter(Boolean).slice(0, 8);
  if (!words.length) return null;
  // hits[s] = how many of the words so far found slot s (a word found twice through two fields counts
  // once); only what the first word finds can be found by all of them.
  const hits = new Uint8Array(ix.clients.length);
  // Few finds are kept in a list and sorted; past this many they are read off hits in slot order.
  const listed = ix.clients.length >> 4;
  const finds: number[] = [];
  let first = 0;
  words.forEach((w, k) =>
    eachMatch(
      ix,
      w,
      k === 0
        ? (s) => {
            if (hits[s] !== 0) return;
            hits[s] = 1;
            if (++first <= listed) finds.push(s);
          }
        : (s) => {
            if (hits[s] === k) hits[s] = k + 1;
          },
    ),
  );
  const all = words.length;
  const add = (s: number) => {
    if (hits[s] === all) return;
    hits[s] = all;
    if (++first <= listed) finds.push(s);
  };
  const phone = phoneSearchKeys(q, ix.country);
  if (phone.e164) {
    for (let s = 0; s < ix.phones.length; s++) if (ix.phones[s] === phone.e164) add(s);
  } else if (phone.digits.length >= 6 && words.length > 1) {
    eachContaining(ix.phoneGrams, phone.digits, (s) => ix.phones[s]!.includes(phone.digits), add);
  }
  if (first <= listed) return Int32Array.from(finds.filter((s) => hits[s] === all)).sort();
  const found = new Int32Array(first);
  let m = 0;
  for (let s = 0; s < hits.length; s++) if (hits[s] === all) found[m++] = s;
  return found.subarray(0, m);
}

/**
 * The caller's studio's clients the search and filter find, in the list's order (name, case-blind, or
 * created or changed; then id), with how many there are: one page of slots, or every one (the CSV export).
 */
function select(ix: ClientsIndex, query: ClientListQuery, page: { limit: number; offset: number } | "all"): { total: number; slots: number[] } {
  const found = searchSlots(ix, query.q);
  const order = query.sort === "newest" ? ix.byCreated : query.sort === "updated" ? ix.byUpdated : null;
  const desc = (query.dir ?? (query.sort === "name" ? "asc" : "desc")) === "desc";
  // Places in the sort order (ascending) of the clients the search found, or of all of them.
  const rank = query.sort === "newest" ? ix.createdRank : query.sort === "updated" ? ix.updatedRank : null;
  const places = found && rank ? found.map((s) => rank[s]!).sort() : found;
  const count = places ? places.length : ix.clients.length;
  const slotAt = (i: number) => {
    const place = places ? places[desc ? count - 1 - i : i]! : desc ? count - 1 - i : i;
    return order ? order[place]! : place;
  };
  const from = page === "all" ? 0 : page.offset;
  const to = page === "all" ? count : page.offset + page.limit;
  const filter = query.filter ? FILTERS[query.filter] : null;
  if (!filter) return { total: count, slots: Array.from({ length: Math.max(0, Math.min(to, count) - from) }, (_, i) => slotAt(from + i)) };
  const slots: number[] = [];
  let total = 0;
  for (let i = 0; i < count; i++) {
    const s = slotAt(i);
    if (!filter(ix.clients[s]!)) continue;
    if (total >= from && total < to) slots.push(s);
    total++;
  }
  return { total, slots };
}

/** One page (50) of the caller's studio's clients, searched, filtered and sorted, with the total. */
export function listClients(ctx: StudioContext, query: ClientListQuery): ClientPage {
  const ix = clientsIndex(ctx.studio);
  const { total, slots } = select(ix, query, { limit: CLIENT_PAGE_SIZE, offset: (query.page - 1) * CLIENT_PAGE_SIZE });
  return {
    rows: slots.map((s) => {
      const r = ix.clients[s]!;
      return {
        id: r.id,
        name: r.name,
        email: r.email ?? "",
        phoneDisplay: shownPhone(ix, s),
        hasAccount: !!r.userId,
        pieces: r.pieces,
        unregistered: r.unregistered,
        openClaims: r.openClaims,
        updatedAt: new Date(r.updatedAt).toISOString(),
      };
    }),
    total,
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
  const ix = clientsIndex(ctx.studio);
  const day = (ms: number) => localDate(ms, ctx.studio.timeZone);
  const yesNo = (b: unknown) => (b ? "yes" : "no");
  const data = select(ix, query, "all").slots.map((s) => {
    const r = ix.clients[s]!;
    return [r.name, r.email ?? "", shownPhone(ix, s), r.address, yesNo(r.consentService), yesNo(r.consentOffers), yesNo(r.userId), r.pieces, r.unregistered, r.openClaims, day(r.createdAt), day(r.updatedAt)].map(cell);
  });
  return Papa.unparse({ fields: [...CLIENT_CSV_COLUMNS], data });
}
