// The registry's full-text index (pieces_fts, SQLite FTS5; db/migrations/0002). One row per piece,
// keyed by the piece's rowid, rewritten whenever the piece, its owner or its layers change. Species
// names and aliases come from lib/care's species table, which SQL cannot see. No server-only import:
// the seed scripts and the scheduler may reindex too.
//
// Anyone who changes a piece's owner (registration, transfer) calls indexPiece in the same transaction.
// Each row also carries the piece's scope word (searchScope: its studio and archived state), which
// db/migrations/0031's triggers keep right whatever changes a piece's studio or archived state, and
// remove with the piece whatever deletes it.
import { sql } from "drizzle-orm";
import type { Db } from "@/db/client";
import { getSpecies } from "@/lib/care/species";
import { FINISH_CLASS_LABELS, PIECE_KIND_LABELS, type FinishClass, type PieceKind } from "@/lib/care/vocabulary";

export type DbOrTx = Db | Parameters<Parameters<Db["transaction"]>[0]>[0];

export type SearchDocumentInput = {
  title: string;
  kind: PieceKind;
  primarySpeciesId: string;
  secondarySpeciesId: string | null;
  internalNotes: string;
  deliveryAddress: string;
  baseMaterial: string;
  baseFinish: string;
  resinTint: string | null;
  owner: { name: string; email: string } | null;
  layers: { finishClass: FinishClass; productLabel: string; batchLot: string; notes: string }[];
};

function speciesText(id: string | null): string {
  if (!id) return "";
  const s = getSpecies(id);
  return s ? [s.commonName, s.botanicalName, ...s.aliases].join(" ") : id;
}

/** The four indexed columns of one piece. */
export function searchDocument(p: SearchDocumentInput): { title: string; species: string; owner: string; notes: string } {
  return {
    title: p.title,
    species: [speciesText(p.primarySpeciesId), speciesText(p.secondarySpeciesId)].filter(Boolean).join(" "),
    owner: p.owner ? `${p.owner.name} ${p.owner.email}` : "",
    notes: [
      PIECE_KIND_LABELS[p.kind],
      p.internalNotes,
      p.deliveryAddress,
      p.baseMaterial,
      p.baseFinish,
      p.resinTint ?? "",
      ...p.layers.flatMap((l) => [FINISH_CLASS_LABELS[l.finishClass], l.productLabel, l.batchLot, l.notes]),
    ]
      .filter((s) => s && s !== "—")
      .join(" \n "),
  };
}

/**
 * The word in a piece's index row (column `scope`) that names its studio and whether it is archived:
 * 's', the studio id's UTF-8 bytes in hex, then 'live' or 'arch'. Letters and digits only, so the
 * tokenizer keeps it one word; the hex makes it one studio's alone (the tokenizer folds case, which
 * would merge ids differing only in case). The migration and triggers of db/migrations/0031 write the
 * same word in SQL ('s' || lower(hex(studio_id)) || ...).
 */
export function searchScope(studioId: string, archived: boolean): string {
  return `s${Buffer.from(studioId, "utf8").toString("hex")}${archived ? "arch" : "live"}`;
}

/** The index's text columns: what a person types is looked for in these, never in `scope`. */
const TEXT_COLUMNS = "{title species owner notes}";

/**
 * The MATCH expression for what a person typed (ftsQuery), limited to the text columns, or null when
 * nothing searchable is left (countMatches in registry-sql.ts ANDs a scope word to it).
 * Typed text reaches a scope word only through a word that starts with "s" once the tokenizer has
 * folded its case and diacritics; ASCII text without an "s" cannot, and is matched without the
 * column filter (the same rows and ranks: the scope column holds nothing else), which FTS5 would
 * otherwise apply to every match's position list: about 0.07 M instructions less per pass for
 * q=walnut and burl (cachegrind, 100,000-piece bench seed; a search makes two passes, page and count).
 */
export function pieceTextMatch(input: string): string | null {
  const typed = ftsQuery(input);
  if (!typed) return null;
  return /^[\x20-\x7e\s]*$/.test(input) && !/s/i.test(input) ? typed : `${TEXT_COLUMNS} : (${typed})`;
}

type PieceRow = {
  rowid: number;
  id: string;
  studio_id: string;
  archived_at: number | null;
  title: string;
  kind: PieceKind;
  primary_species_id: string;
  secondary_species_id: string | null;
  internal_notes: string;
  delivery_address: string;
  base_material: string;
  base_finish: string;
  resin_tint: string | null;
  owner_name: string | null;
  owner_email: string | null;
};

/** Rewrites the index row of one piece (or removes it when the piece is gone). Pass the transaction. */
export function indexPiece(db: DbOrTx, pieceId: string): void {
  const row = db.get<PieceRow | undefined>(sql`
    SELECT p.rowid AS rowid, p.id, p.studio_id, p.archived_at, p.title, p.kind, p.primary_species_id, p.secondary_species_id,
           p.internal_notes, p.delivery_address, p.base_material, p.base_finish, p.resin_tint,
           u.name AS owner_name, u.email AS owner_email
    FROM pieces p LEFT JOIN users u ON u.id = p.owner_id WHERE p.id = ${pieceId}`);
  if (!row) {
    db.run(sql`DELETE FROM pieces_fts WHERE piece_id = ${pieceId}`);
    return;
  }
  const layers = db.all<{ finish_class: FinishClass; product_label: string; batch_lot: string; notes: string }>(
    sql`SELECT finish_class, product_label, batch_lot, notes FROM finish_layers WHERE piece_id = ${pieceId} ORDER BY surface, position`,
  );
  const doc = searchDocument({
    title: row.title,
    kind: row.kind,
    primarySpeciesId: row.primary_species_id,
    secondarySpeciesId: row.secondary_species_id,
    internalNotes: row.internal_notes,
    deliveryAddress: row.delivery_address,
    baseMaterial: row.base_material,
    baseFinish: row.base_finish,
    resinTint: row.resin_tint,
    owner: row.owner_name != null ? { name: row.owner_name, email: row.owner_email ?? "" } : null,
    layers: layers.map((l) => ({ finishClass: l.finish_class, productLabel: l.product_label, batchLot: l.batch_lot, notes: l.notes })),
  });
  db.run(sql`DELETE FROM pieces_fts WHERE rowid = ${row.rowid}`);
  db.run(sql`INSERT INTO pieces_fts (rowid, scope, piece_id, studio_id, title, species, owner, notes)
             VALUES (${row.rowid}, ${searchScope(row.studio_id, row.archived_at !== null)}, ${row.id}, ${row.studio_id}, ${doc.title}, ${doc.species}, ${doc.owner}, ${doc.notes})`);
}

/** Rebuilds the whole index (after a VACUUM, which may renumber the pieces' rowids, or a bulk load). */
export function rebuildSearchIndex(db: Db, studioId?: string): number {
  const ids = db.all<{ id: string }>(studioId ? sql`SELECT id FROM pieces WHERE studio_id = ${studioId}` : sql`SELECT id FROM pieces`);
  db.transaction((tx) => {
    if (studioId) tx.run(sql`DELETE FROM pieces_fts WHERE studio_id = ${studioId}`);
    else tx.run(sql`DELETE FROM pieces_fts`);
    for (const { id } of ids) indexPiece(tx, id);
  });
  return ids.length;
}

const MAX_TOKENS = 12;

/**
 * An FTS5 MATCH expression for what a person typed, or null when nothing searchable is left. Every
 * whitespace-separated token becomes a quoted string (inner quotes doubled) with a prefix star, so
 * FTS5 syntax — quotes, *, NEAR, AND/OR/NOT, -, ^, column filters, parentheses — is only ever text.
 * Tokens are ANDed; tokens without a letter or digit are dropped.
 */
export function ftsQuery(input: string): string | null {
  const tokens = input
    .normalize("NFKC")
    .split(/\s+/)
    .filter((t) => /[\p{L}\p{N}]/u.test(t))
    .slice(0, MAX_TOKENS);
  if (tokens.length === 0) return null;
  return tokens.map((t) => `"${t.replace(/"/g, '""')}"*`).join(" ");
}
