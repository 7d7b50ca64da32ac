// The full-text indexes' upkeep. SQLite's FTS5 tables (the registry's and the clients list's search)
// grow by one small segment per writing transaction; FTS5 merges them as it goes (automerge), but a
// busy database keeps several segments per index, and every search reads each of them. Merging an
// index down to one segment makes its searches cheaper (the clients list's name search about 3× in a
// measurement on the 20,000-client bench seed). The scheduler (jobs/index.ts) runs this nightly; the
// bench seeds run it too, so that they stand for a database the scheduler looks after.
//
// It merges in small steps ('merge' with a page budget, each step its own short write) rather than one
// 'optimize', which would hold the database's write lock for the whole rewrite of a large index; other
// writers wait at most one step. See https://sqlite.org/fts5.html, "The 'merge' Command" and
// "The 'usermerge' Configuration Option".
import { setImmediate as yieldToOthers } from "node:timers/promises";
import type Database from "better-sqlite3";

/** Pages written per step: about 8 MB at SQLite's default 4 kB page, a fraction of a second. */
const PAGES_PER_STEP = 2000;

export type IndexMerge = { index: string; steps: number; ms: number };

/** The database's FTS5 tables, by name. */
export function searchIndexes(sqlite: Database.Database): string[] {
  return sqlite.prepare("SELECT name FROM sqlite_master WHERE type = 'table' AND sql LIKE 'CREATE VIRTUAL TABLE%USING fts5%' ORDER BY name").pluck().all() as string[];
}

/** One index's merge: each call of the returned step does one step and says whether it did any work. */
function merger(sqlite: Database.Database, index: string): () => boolean {
  const name = `"${index.replace(/"/g, '""')}"`;
  // A negative budget merges whenever the index holds `usermerge` segments on any levels; at 2 (the
  // least FTS5 allows) the steps go on until one segment is left. The setting is stored with the
  // index and is read by this command only (the automatic merging keeps its own).
  sqlite.prepare(`INSERT INTO ${name} (${name}, rank) VALUES ('usermerge', 2)`).run();
  const step = sqlite.prepare(`INSERT INTO ${name} (${name}, rank) VALUES ('merge', ?)`);
  const totalChanges = sqlite.prepare("SELECT total_changes()").pluck();
  return () => {
    const before = totalChanges.get() as number;
    step.run(-PAGES_PER_STEP);
    // FTS5 documents a step that did work as raising total_changes() by 2 or more.
    return (totalChanges.get() as number) - before >= 2;
  };
}

/**
 * Merges every full-text index down to one segment, giving other work on this process a turn between
 * steps, and says how many steps each index took. Stops between steps once `signal` is aborted (an
 * index is whole after any step).
 */
export async function mergeSearchIndexes(sqlite: Database.Database, opts: { signal?: AbortSignal } = {}): Promise<IndexMerge[]> {
  const out: IndexMerge[] = [];
  for (const index of searchIndexes(sqlite)) {
    if (opts.signal?.aborted) break;
    const started = performance.now();
    const step = merger(sqlite, index);
    let steps = 0;
    while (step()) {
      steps++;
      if (opts.signal?.aborted) break;
      await yieldToOthers();
    }
    out.push({ index, steps, ms: performance.now() - started });
  }
  return out;
}

/** The same merge without pausing, for a database nothing else is using (the bench seeds). */
export function mergeSearchIndexesAtOnce(sqlite: Database.Database): void {
  for (const index of searchIndexes(sqlite)) {
    const step = merger(sqlite, index);
    while (step());
  }
}
