import fs from "node:fs";
import path from "node:path";
import Database from "better-sqlite3";
import type { SQL } from "drizzle-orm";
import { drizzle, type BetterSQLite3Database } from "drizzle-orm/better-sqlite3";
import { SQLiteSyncDialect } from "drizzle-orm/sqlite-core";
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
  if (file !== ":memory:") {
    // Registry searches read pages all over the pieces table; mapping the file and a 64 MiB page
    // cache keep them in memory. Both change only speed, never results.
    sqlite.pragma("mmap_size = 268435456");
    sqlite.pragma("cache_size = -65536");
  }
  return drizzle(sqlite, { schema });
}

// ---- statements prepared once per connection, for hot read paths ----

const dialect = new SQLiteSyncDialect();
const statementCaches = new WeakMap<Database.Database, Map<string, Database.Statement>>();
const STATEMENT_CACHE_SIZE = 256;

function cachedStatement(db: Db, query: SQL): { stmt: Database.Statement; params: unknown[] } {
  const { sql: text, params } = dialect.sqlToQuery(query);
  let cache = statementCaches.get(db.$client);
  if (!cache) statementCaches.set(db.$client, (cache = new Map()));
  let stmt = cache.get(text);
  if (!stmt) {
    if (cache.size >= STATEMENT_CACHE_SIZE) cache.clear();
    stmt = db.$client.prepare(text);
    cache.set(text, stmt);
  }
  return { stmt, params };
}

/** Like `db.all(query)`, but SQLite parses each distinct query text once per connection. */
export function cachedAll<T>(db: Db, query: SQL): T[] {
  const { stmt, params } = cachedStatement(db, query);
  return stmt.all(...params) as T[];
}

/** Like `db.get(query)`, with the statement cached as in cachedAll. */
export function cachedGet<T>(db: Db, query: SQL): T | undefined {
  const { stmt, params } = cachedStatement(db, query);
  return stmt.get(...params) as T | undefined;
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
