// A real SQLite file migrated up to just before one migration, for tests that show a migration brings
// the rows of an older database forward (the later migrations then run through applyMigrations).
import fs from "node:fs";
import path from "node:path";
import { migrate } from "drizzle-orm/better-sqlite3/migrator";
import { expect } from "vitest";
import { openDatabase, type Db } from "@/db/client";
import { MIGRATIONS_FOLDER } from "@/db/migrate";

/** Opens `dir`/old.db migrated through every committed migration before `tag`. */
export function databaseBefore(dir: string, tag: string): Db {
  const before = path.join(dir, "migrations");
  fs.cpSync(MIGRATIONS_FOLDER, before, { recursive: true });
  const journalFile = path.join(before, "meta", "_journal.json");
  const journal = JSON.parse(fs.readFileSync(journalFile, "utf8")) as { entries: { tag: string }[] };
  const at = journal.entries.findIndex((e) => e.tag === tag);
  expect(at).toBeGreaterThan(0);
  journal.entries = journal.entries.slice(0, at);
  fs.writeFileSync(journalFile, JSON.stringify(journal));
  const db = openDatabase(path.join(dir, "old.db"));
  migrate(db, { migrationsFolder: before });
  return db;
}

/**
 * Inserts one row into `table` with raw SQL: every NOT NULL column without a default gets a value, a
 * reference the row `row-<table it names>`, the primary key `id`; `set` gives columns of its own.
 */
export function fillRow(db: Db, table: string, id: string, set: Record<string, unknown> = {}): void {
  const sqlite = db.$client;
  const cols = sqlite.pragma(`table_info(${table})`) as { name: string; type: string; notnull: number; dflt_value: unknown; pk: number }[];
  const fks = sqlite.pragma(`foreign_key_list(${table})`) as { from: string; table: string }[];
  const row: Record<string, unknown> = {};
  for (const c of cols) {
    const fk = fks.find((f) => f.from === c.name);
    if (c.name in set) row[c.name] = set[c.name];
    else if (c.pk) row[c.name] = id;
    else if (fk && c.notnull) row[c.name] = `row-${fk.table}`;
    else if (c.notnull && c.dflt_value === null) row[c.name] = c.type.toLowerCase() === "integer" || c.type.toLowerCase() === "real" ? 1 : `${table}-${c.name}`;
  }
  const names = Object.keys(row);
  sqlite.prepare(`INSERT INTO ${table} (${names.map((n) => `"${n}"`).join(", ")}) VALUES (${names.map(() => "?").join(", ")})`).run(...names.map((n) => row[n]));
}
