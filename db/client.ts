import fs from "node:fs";
import path from "node:path";
import Database from "better-sqlite3";
import { drizzle, type BetterSQLite3Database } from "drizzle-orm/better-sqlite3";
import { DEFAULT_DATABASE_URL } from "./config";
import journal from "./migrations/meta/_journal.json";
import * as schema from "./schema";

export type Db = BetterSQLite3Database<typeof schema> & { $client: Database.Database };
/** A transaction of `Db`, as `getDb().transaction((tx) => …)` hands it over. */
export type Tx = Parameters<Parameters<Db["transaction"]>[0]>[0];

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
    // Statistics only help the planner: a database kept busy past the timeout above (another process
    // writing a long transaction) opens without fresh ones rather than not at all; the nightly pass
    // and the next open try again.
    try {
      refreshPlannerStatistics(sqlite);
    } catch (e) {
      if (!(e instanceof Database.SqliteError && e.code.startsWith("SQLITE_BUSY"))) throw e;
      console.error(`planner statistics not refreshed at open (${e.code}); the nightly pass refreshes them`);
    }
  }
  cacheStatements(sqlite);
  return drizzle(sqlite, { schema });
}

/**
 * The query planner's statistics (sqlite_stat1, and sqlite_stat4: the SQLite better-sqlite3 builds has
 * STAT4) brought up to date where SQLite judges them missing or stale: every table checked, not only
 * those this connection has used (0x10000), and ANALYZE run (0x02) on each one with an index that was
 * never analyzed or whose row count has grown or shrunk tenfold since its last analysis; otherwise it
 * only compares sizes (about a millisecond). The hot queries were planned on fully analyzed bench seeds
 * (tests/bench/seed-registry.ts, db/bound.ts, lib/pieces/registry-sql.ts); without statistics a real
 * studio's database could be planned otherwise. Run when a connection opens and nightly by the
 * scheduler (jobs/search-indexes.ts). See https://sqlite.org/lang_analyze.html, "Recommended usage
 * pattern", and https://sqlite.org/pragma.html#pragma_optimize.
 *
 * Not the plain `PRAGMA optimize` that page suggests for the periodic run: its temporary analysis_limit
 * (bit 0x10) skips sqlite_stat4 and estimates sqlite_stat1 from a sample; on a copy of the
 * 100,000-piece bench seed that estimated one studio's pieces at 1,059 rows instead of 100,000. A full
 * analysis of the tables that need one took 0.16-0.31 s there. Other open connections (the server's)
 * keep the statistics they loaded until they reload them (reloadPlannerStatistics below, hourly in
 * the process's own connection). Says the tables whose statistics it changed (none: nothing to do).
 */
export function refreshPlannerStatistics(sqlite: Database.Database): string[] {
  const before = plannerStatistics(sqlite);
  // Reads the statistics again first: this connection keeps those it loaded when it opened, and
  // another process may have analyzed since (ANALYZE on sqlite_schema only reloads them).
  if (before.size > 0) sqlite.exec("ANALYZE sqlite_schema");
  sqlite.pragma("optimize = 0x10002");
  const after = plannerStatistics(sqlite);
  loadedStatistics.set(sqlite, statisticsKey(after));
  return [...after.keys()].filter((table) => after.get(table) !== before.get(table));
}

/** How often the process's connection looks for statistics another process wrote (getDb below). */
export const STATISTICS_CHECK_MS = 60 * 60_000;

/** sqlite_stat1 as each connection's planner last loaded it (statisticsKey), where that is known. */
const loadedStatistics = new WeakMap<Database.Database, string>();
const statisticsKey = (stats: Map<string, string>) => JSON.stringify([...stats]);

/**
 * Makes this connection's planner use the statistics another connection wrote since it loaded its own:
 * SQLite reads sqlite_stat1/sqlite_stat4 when a connection opens or analyzes, never when another one
 * writes them (https://sqlite.org/lang_analyze.html: "ANALYZE sqlite_schema" reloads them). The
 * nightly pass analyzes in the scheduler's process (jobs/search-indexes.ts), so without this the
 * server planned with the statistics of its start until it restarted.
 *
 * It compares sqlite_stat1 (a row per index, read without a lock) with what this connection loaded and
 * reloads only when it differs: every analysis our passes run changes it (optimize analyzes a table
 * that was never analyzed or has grown or shrunk tenfold, and the full analysis counts its rows
 * exactly). The reload takes the write lock for a moment, so it does not wait for it: while another
 * connection writes it says false, and the next check tries again. Says whether it reloaded.
 */
export function reloadPlannerStatistics(sqlite: Database.Database): boolean {
  if (sqlite.inTransaction) return false;
  const current = statisticsKey(plannerStatistics(sqlite));
  if (loadedStatistics.get(sqlite) === current) return false;
  const timeout = sqlite.pragma("busy_timeout", { simple: true }) as number;
  sqlite.pragma("busy_timeout = 0");
  try {
    sqlite.exec("ANALYZE sqlite_schema");
  } catch (e) {
    if (e instanceof Database.SqliteError && e.code.startsWith("SQLITE_BUSY")) return false;
    throw e;
  } finally {
    sqlite.pragma(`busy_timeout = ${timeout}`);
  }
  loadedStatistics.set(sqlite, current);
  return true;
}

/**
 * Runs reloadPlannerStatistics on `sqlite` every `everyMs`, between requests, never in one: a timer
 * that does not keep the process alive and stops once the connection is closed. Returns its stop.
 */
export function watchPlannerStatistics(sqlite: Database.Database, everyMs = STATISTICS_CHECK_MS): () => void {
  const timer = setInterval(() => {
    if (!sqlite.open) return clearInterval(timer);
    try {
      reloadPlannerStatistics(sqlite);
    } catch (e) {
      console.error("planner statistics not reloaded", e);
    }
  }, everyMs);
  timer.unref();
  return () => clearInterval(timer);
}

/** sqlite_stat1's rows by table, one string each (none before the first ANALYZE creates it). */
function plannerStatistics(sqlite: Database.Database): Map<string, string> {
  const exists = sqlite.prepare("SELECT 1 FROM sqlite_master WHERE type = 'table' AND name = 'sqlite_stat1'").get();
  if (!exists) return new Map();
  const rows = sqlite.prepare("SELECT tbl, group_concat(idx || ' ' || stat, ';') AS stats FROM (SELECT tbl, coalesce(idx, '') AS idx, stat FROM sqlite_stat1 ORDER BY tbl, idx) GROUP BY tbl").all() as { tbl: string; stats: string }[];
  return new Map(rows.map((r) => [r.tbl, r.stats]));
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

/** The process's one connection, opened on first use; refuses an unmigrated database; reloads the planner statistics others write. */
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
  // The nightly pass analyzes in the scheduler's process; this connection picks that up within the hour.
  watchPlannerStatistics(db.$client);
  return db;
}

export { schema };
