import fs from "node:fs";
import path from "node:path";
import Database from "better-sqlite3";
import { drizzle, type BetterSQLite3Database } from "drizzle-orm/better-sqlite3";
import { DEFAULT_DATABASE_URL } from "./config";
import journal from "./migrations/meta/_journal.json";
import * as schema from "./schema";

export type Db = BetterSQLite3Database<typeof schema> & { $client: Database.Database };

/** Opens a SQLite file with the settings every process of the product uses. */
export function openDatabase(file: string): Db {
  if (file !== ":memory:") fs.mkdirSync(path.dirname(path.resolve(file)), { recursive: true });
  const sqlite = new Database(file);
  sqlite.pragma("journal_mode = WAL");
  sqlite.pragma("foreign_keys = ON");
  // Writers wait for each other instead of failing with SQLITE_BUSY.
  sqlite.pragma("busy_timeout = 5000");
  sqlite.pragma("synchronous = NORMAL");
  cacheStatements(sqlite);
  return drizzle(sqlite, { schema });
}

const STATEMENT_CACHE_SIZE = 500;

/**
 * Drizzle prepares every query it runs; parsing the SQL again each time cost more than running most of
 * our queries. This keeps the most recent statements per connection by their text and hands one out
 * again unless it is still being iterated, switched back out of raw mode (drizzle turns it on for
 * the queries that need it).
 */
function cacheStatements(sqlite: Database.Database): void {
  const cache = new Map<string, Database.Statement>();
  const prepare = sqlite.prepare.bind(sqlite);
  sqlite.prepare = ((source: string) => {
    const hit = cache.get(source);
    if (hit && !hit.busy) {
      if (hit.reader) hit.raw(false);
      return hit;
    }
    const stmt = prepare(source);
    if (!hit) {
      if (cache.size >= STATEMENT_CACHE_SIZE) cache.delete(cache.keys().next().value!);
      cache.set(source, stmt);
    }
    return stmt;
  }) as typeof sqlite.prepare;
}

/**
 * A value built once per connection and kept as long as it lives: the prepared queries of the paths
 * every request takes (building a drizzle query costs more than running most of ours).
 */
export function perConnection<T>(build: (db: Db) => T): (db: Db) => T {
  const built = new WeakMap<Database.Database, T>();
  return (db) => {
    let value = built.get(db.$client);
    if (value === undefined) built.set(db.$client, (value = build(db)));
    return value;
  };
}

export class UnmigratedDatabaseError extends Error {
  constructor(file: string, applied: number, expected: number) {
    super(
      `The database at ${file} has ${applied} of ${expected} migrations applied. ` +
        `Run \`npm run db:migrate\` (with the same DATABASE_URL) before starting Grainward.`,
    );
    this.name = "UnmigratedDatabaseError";
  }
}

/** Counts applied migrations against the committed journal (drizzle's own bookkeeping table). */
export function migrationStatus(db: Db): { applied: number; expected: number } {
  const expected = journal.entries.length;
  const table = db.$client
    .prepare("SELECT name FROM sqlite_master WHERE type = 'table' AND name = '__drizzle_migrations'")
    .get();
  if (!table) return { applied: 0, expected };
  const row = db.$client.prepare("SELECT COUNT(*) AS n FROM __drizzle_migrations").get() as { n: number };
  return { applied: row.n, expected };
}

export function databaseFile(): string {
  return process.env.DATABASE_URL || DEFAULT_DATABASE_URL;
}

const globalForDb = globalThis as unknown as { grainwardDb?: Db };

/** The process's one connection, opened on first use; refuses an unmigrated database. */
export function getDb(): Db {
  if (globalForDb.grainwardDb) return globalForDb.grainwardDb;
  const file = databaseFile();
  const db = openDatabase(file);
  const { applied, expected } = migrationStatus(db);
  if (applied < expected) {
    db.$client.close();
    throw new UnmigratedDatabaseError(file, applied, expected);
  }
  globalForDb.grainwardDb = db;
  return db;
}

export { schema };
