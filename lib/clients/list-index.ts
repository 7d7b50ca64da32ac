import "server-only";
import { sql } from "drizzle-orm";
import { getDb } from "@/db/client";
import { OPEN_STATES } from "@/lib/claims/states";
import { databaseVersion } from "@/lib/pieces/registry-sql";
import { displayPhone } from "./phone";

/**
 * The clients list's rows of one studio, held in memory with what its search reads: each client's
 * columns and counts in name order, the other two sort orders, its filters, and lookup tables for the
 * search (three-character pieces of the case-folded name and e-mail and of the phone; the words of its
 * pieces' titles). Built from the tables on the first list call and again after anything in the
 * database changed (its version, as the registry's counts are kept: lib/pieces/registry-sql.ts), so a
 * search is a walk over arrays instead of index lookups, a sort and counts per row in SQL (on 20,000
 * clients / 100,000 pieces the SQL cost 3-8 ms a call, most of the request). Nothing here is keyed by
 * what was searched for.
 */
export type IndexedClient = {
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
  invited: number;
  paused: number;
};

export type ClientsIndex = {
  version: string;
  /** Clients in name order (name, case-blind as SQLite's NOCASE, then id); a client's slot is its place here. */
  clients: IndexedClient[];
  /** Slots by created_at then id, and by updated_at then id, both ascending; and each slot's place in them. */
  byCreated: Int32Array;
  byUpdated: Int32Array;
  createdRank: Int32Array;
  updatedRank: Int32Array;
  /** Name and e-mail lower-cased (the trigram index's case-blind match) and ASCII-lower-cased (LIKE's). */
  nameFold: string[];
  emailFold: string[];
  nameAscii: string[];
  emailAscii: string[];
  phones: string[];
  /** Every three characters in a row (gramAt) of nameFold and emailFold, and of the phone, → the slots that contain them. */
  grams: Map<number, Int32Array>;
  phoneGrams: Map<number, Int32Array>;
  /** Title words (lib/clients/list-index titleWords), sorted, with the slots whose pieces have them. */
  words: string[];
  wordSlots: Int32Array[];
  /** Per slot: each title's words joined by spaces, the titles by new lines, with a new line either side. */
  titleLines: string[];
  /** phoneDisplay per slot, formatted on first use (libphonenumber costs more than the rest of a row). */
  shownPhones: (string | undefined)[];
  country: string;
};

export const asciiLower = (s: string) => s.replace(/[A-Z]+/g, (c) => c.toLowerCase());

/**
 * A title's words as the registry's full-text index reads them (SQLite FTS5 documentation, "Unicode61
 * Tokenizer": letters, digits and private-use characters make words, anything else separates them;
 * remove_diacritics 2 folds accents; from memory): accents are taken off after canonical decomposition,
 * then lower-cased. ASCII text (most titles) is split directly.
 */
export function titleWords(text: string): string[] {
  const lower = text.toLowerCase();
  if (/^[\x00-\x7f]*$/.test(lower)) return lower.split(/[^a-z0-9]+/).filter(Boolean);
  return text
    .normalize("NFD")
    .split(/[^\p{L}\p{N}\p{Co}\p{Mn}]+/u)
    .map((w) => w.replace(/\p{Mn}+/gu, "").toLowerCase())
    .filter(Boolean);
}

/**
 * Three UTF-16 code units in a row as a small integer (a map keyed by it allocates nothing). Two
 * different triples may share one; that only adds candidates, and every candidate is checked.
 */
export const gramAt = (text: string, i: number) =>
  (Math.imul(text.charCodeAt(i), 0x9e3779b1) ^ Math.imul(text.charCodeAt(i + 1), 0x85ebca77) ^ text.charCodeAt(i + 2)) & 0x3fffffff;

/** Adds slot to the list of every three characters in a row of text (once per slot). */
function addGrams(map: Map<number, number[]>, text: string, slot: number) {
  for (let i = 0; i + 3 <= text.length; i++) {
    const g = gramAt(text, i);
    const list = map.get(g);
    if (!list) map.set(g, [slot]);
    else if (list[list.length - 1] !== slot) list.push(slot);
  }
}

/** Each slot's place in an order of slots. */
function rankOf(order: Int32Array): Int32Array {
  const rank = new Int32Array(order.length);
  order.forEach((s, i) => (rank[s] = i));
  return rank;
}

function slotsOf<K>(map: Map<K, number[]>): Map<K, Int32Array> {
  const out = new Map<K, Int32Array>();
  for (const [k, v] of map) out.set(k, Int32Array.from(v));
  return out;
}

const OPEN_LIST = OPEN_STATES.map((s) => `'${s}'`).join(", ");

function build(studioId: string, country: string, version: string): ClientsIndex {
  const db = getDb();
  const clients = db.all<IndexedClient>(sql`
    SELECT c.id, c.name, c.email, c.phone, c.address, c.consent_service AS consentService, c.consent_offers AS consentOffers,
      c.user_id AS userId, c.created_at AS createdAt, c.updated_at AS updatedAt, 0 AS pieces, 0 AS unregistered, 0 AS openClaims,
      0 AS invited, coalesce(u.reminders_enabled = 0, 0) AS paused
    FROM clients c LEFT JOIN users u ON u.id = c.user_id WHERE c.studio_id = ${studioId}
    ORDER BY c.name COLLATE NOCASE, c.id`);
  const slotOf = new Map(clients.map((c, i) => [c.id, i]));
  const n = clients.length;
  const order = (key: (c: IndexedClient) => number) =>
    Int32Array.from(clients.keys()).sort((a, b) => key(clients[a]!) - key(clients[b]!) || (clients[a]!.id < clients[b]!.id ? -1 : 1));

  const nameFold = clients.map((c) => c.name.toLowerCase());
  const emailFold = clients.map((c) => (c.email ?? "").toLowerCase());
  const phones = clients.map((c) => c.phone ?? "");
  const grams = new Map<number, number[]>();
  const phoneGrams = new Map<number, number[]>();
  for (let s = 0; s < n; s++) {
    addGrams(grams, nameFold[s]!, s);
    addGrams(grams, emailFold[s]!, s);
    addGrams(phoneGrams, phones[s]!, s);
  }

  // One pass over the studio's pieces: the counts, paused reminders and the titles.
  const lines: string[][] = Array.from({ length: n }, () => []);
  const studioPieces = db.$client
    .prepare("SELECT client_id, title, archived_at IS NULL, owner_id IS NULL, reminders_paused FROM pieces WHERE studio_id = ? AND client_id IS NOT NULL")
    .raw(true)
    .all(studioId) as [string, string, number, number, number][];
  for (const [clientId, title, current, unowned, paused] of studioPieces) {
    const s = slotOf.get(clientId);
    if (s === undefined) continue;
    const c = clients[s]!;
    lines[s]!.push(titleWords(title).join(" "));
    if (!current) continue;
    c.pieces++;
    if (unowned) c.unregistered++;
    if (paused) c.paused = 1;
  }
  const slotsOfUser = new Map<string, number[]>();
  clients.forEach((c, s) => c.userId && slotsOfUser.set(c.userId, [...(slotsOfUser.get(c.userId) ?? []), s]));
  const openClaims = db.$client
    .prepare(`SELECT owner_id, count(*) FROM claims WHERE studio_id = ? AND state IN (${OPEN_LIST}) GROUP BY owner_id`)
    .raw(true)
    .all(studioId) as [string, number][];
  for (const [ownerId, count] of openClaims) for (const s of slotsOfUser.get(ownerId) ?? []) clients[s]!.openClaims = count;
  // The hand-over mail went out for a piece of theirs that nobody has registered yet.
  const invited = db.$client
    .prepare(
      `SELECT DISTINCT h.client_id FROM piece_handovers h JOIN pieces p ON p.id = h.piece_id
        WHERE h.studio_id = ? AND h.last_sent_at IS NOT NULL AND p.owner_id IS NULL AND p.archived_at IS NULL`,
    )
    .pluck()
    .all(studioId) as string[];
  for (const id of invited) {
    const s = slotOf.get(id);
    if (s !== undefined) clients[s]!.invited = 1;
  }
  const wordMap = new Map<string, number[]>();
  lines.forEach((l, s) => {
    for (const w of l.join(" ").split(" ")) {
      if (!w) continue;
      const list = wordMap.get(w);
      if (!list) wordMap.set(w, [s]);
      else if (list[list.length - 1] !== s) list.push(s);
    }
  });
  const words = [...wordMap.keys()].sort();
  const byCreated = order((c) => c.createdAt);
  const byUpdated = order((c) => c.updatedAt);
  return {
    version,
    clients,
    byCreated,
    byUpdated,
    createdRank: rankOf(byCreated),
    updatedRank: rankOf(byUpdated),
    nameFold,
    emailFold,
    nameAscii: clients.map((c) => asciiLower(c.name)),
    emailAscii: clients.map((c) => asciiLower(c.email ?? "")),
    phones,
    grams: slotsOf(grams),
    phoneGrams: slotsOf(phoneGrams),
    words,
    wordSlots: words.map((w) => Int32Array.from(wordMap.get(w)!)),
    titleLines: lines.map((l) => (l.length ? `\n${l.join("\n")}\n` : "")),
    shownPhones: new Array<string | undefined>(n),
    country,
  };
}

const kept = new Map<string, ClientsIndex>();
const KEPT_STUDIOS = 8;

/** The studio's index as of now: the kept one unless the database changed since it was built. */
export function clientsIndex(studio: { id: string; country: string }): ClientsIndex {
  const version = databaseVersion(getDb());
  const hit = kept.get(studio.id);
  if (hit && hit.version === version && hit.country === studio.country) return hit;
  const index = build(studio.id, studio.country, version);
  kept.delete(studio.id);
  if (kept.size >= KEPT_STUDIOS) kept.delete(kept.keys().next().value!);
  kept.set(studio.id, index);
  return index;
}

/** A slot's phone as shown (kept in the index once formatted). */
export function shownPhone(index: ClientsIndex, slot: number): string {
  let shown = index.shownPhones[slot];
  if (shown === undefined) index.shownPhones[slot] = shown = displayPhone(index.clients[slot]!.phone, index.country);
  return shown;
}
