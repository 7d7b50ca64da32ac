// Straight into the e2e database (the way far-dates.spec writes rows), for what a spec stands in for:
// a visit's day coming (the server's clock is the real one, and a report can't be filed before the
// visit starts), or a step another spec covers. Everything else goes through the app.
import Database from "better-sqlite3";
import { DATABASE_FILE } from "./helpers";

function withDb<T>(fn: (db: Database.Database) => T): T {
  const db = new Database(DATABASE_FILE, {
    fileMustExist: true,
    timeout: 10_000,
  });
  try {
    return fn(db);
  } finally {
    db.close();
  }
}

/** Moves the visit to start a minute ago (same length); answers the new start. */
export function startVisitNow(visitId: string): number {
  return withDb((db) => {
    const row = db.prepare("SELECT start_at AS s, end_at AS e FROM visits WHERE id = ?").get(visitId) as { s: number; e: number };
    const start = Date.now() - 60_000;
    db.prepare("UPDATE visits SET start_at = ?, end_at = ? WHERE id = ?").run(start, start + (row.e - row.s), visitId);
    return start;
  });
}

/** One write; answers how many rows it changed. */
export function writeE2eDb(sql: string, ...params: unknown[]): number {
  return withDb((db) => db.prepare(sql).run(...params).changes);
}

/** One row, or undefined. */
export function readE2eDb<T>(sql: string, ...params: unknown[]): T | undefined {
  return withDb((db) => db.prepare(sql).get(...params) as T | undefined);
}
