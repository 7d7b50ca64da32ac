// The query planner's statistics (refreshPlannerStatistics, db/client.ts): the hot reads were planned
// on analyzed bench seeds, so a database the product opens must have statistics too. A connection that
// opens a database whose tables hold rows but were never analyzed analyzes them (the server and the
// scheduler at start); the scheduler's nightly pass (jobs/search-indexes.ts) analyzes a table again once
// it has grown tenfold, and does nothing when nothing grew; another connection (the server's) plans with
// what that pass wrote once it reloads them (reloadPlannerStatistics, hourly). Its own SQLite file
// (ANALYZE changes the plans of the statements other test files run); invented studio, owners and pieces.
import { beforeAll, describe, expect, it, vi } from "vitest";
import { getDb, openDatabase, reloadPlannerStatistics, watchPlannerStatistics } from "@/db/client";
import { getLucia } from "@/lib/auth/lucia";
import { randomToken, sha256Hex } from "@/lib/crypto";
import { searchIndexesJob } from "@/jobs/search-indexes";
import type { Studio } from "@/db/schema";
import { createPiece, createStudio, createUser } from "../support/fixtures";
import { ownDatabaseFile } from "./reminders-helpers";

let file: string;
let studio: Studio;
let owners: { id: string }[];

/** Pieces of the test's studio, each held by one of its owners in turn, in one transaction. */
function addPieces(n: number, from: number): void {
  getDb().$client.transaction(() => {
    for (let i = from; i < from + n; i++) createPiece(studio, { ownerId: owners[i % owners.length]!.id, title: `Planner table ${i} (invented)` });
  })();
}

/** sqlite_stat1's row count of `index` (its first number), or null if it has none. */
function analyzedRows(index: string): number | null {
  const stat = getDb().$client.prepare("SELECT stat FROM sqlite_stat1 WHERE idx = ?").pluck().get(index) as string | undefined;
  return stat === undefined ? null : Number(stat.split(" ")[0]);
}

beforeAll(async () => {
  file = ownDatabaseFile("planner-statistics");
  studio = createStudio({ name: "Planner Statistics Studio (invented)" });
  owners = [];
  for (let i = 0; i < 5; i++) owners.push(await createUser({ name: `Planner owner ${i} (invented)` }));
  for (const owner of owners) await getLucia().createSession(owner.id, {}, { sessionId: sha256Hex(randomToken(24)) });
  addPieces(60, 0);
});

describe("planner statistics", () => {
  it("a connection opened on a database never analyzed analyzes its tables", () => {
    // getDb() opened the file when the studio's tables were still empty (only the migrations' own
    // rows were there to analyze).
    const analyzedTables = () => getDb().$client.prepare("SELECT DISTINCT tbl FROM sqlite_stat1 WHERE tbl NOT LIKE '%fts%' ORDER BY tbl").pluck().all();
    expect(analyzedTables()).not.toEqual(expect.arrayContaining(["pieces"]));
    expect(analyzedRows("pieces_owner_idx")).toBeNull();

    const opened = openDatabase(file); // as the server and the scheduler open it at start
    opened.$client.close();
    const tables = analyzedTables();
    expect(tables).toEqual(expect.arrayContaining(["pieces", "finish_layers", "sessions", "users", "studios"]));
    // 60 pieces over 5 owners: 12 to an owner, as ANALYZE counts them.
    const ownerIdx = getDb().$client.prepare("SELECT stat FROM sqlite_stat1 WHERE idx = 'pieces_owner_idx'").pluck().get();
    expect(ownerIdx).toBe("60 12");
    expect(getDb().$client.prepare("SELECT count(*) FROM sqlite_stat4 WHERE tbl = 'pieces'").pluck().get()).toBeGreaterThan(0);

    // Opened again with nothing changed: nothing more to analyze.
    const again = openDatabase(file);
    const before = getDb().$client.prepare("SELECT tbl, idx, stat FROM sqlite_stat1 ORDER BY tbl, idx").all();
    again.$client.close();
    expect(getDb().$client.prepare("SELECT tbl, idx, stat FROM sqlite_stat1 ORDER BY tbl, idx").all()).toEqual(before);
  });

  it("the nightly pass analyzes a table again once it has grown tenfold, and only then", async () => {
    expect(analyzedRows("pieces_owner_idx")).toBe(60);
    // Twice as many pieces: the statistics still hold, nothing to do.
    addPieces(60, 60);
    expect((await searchIndexesJob()).filter((l) => l.startsWith("planner statistics"))).toEqual([]);
    expect(analyzedRows("pieces_owner_idx")).toBe(60);

    // Over ten times as many: analyzed again, and the pass says so.
    addPieces(540, 120);
    const lines = (await searchIndexesJob()).filter((l) => l.startsWith("planner statistics"));
    expect(lines).toHaveLength(1);
    expect(lines[0]).toMatch(/^planner statistics: (.+, )?pieces(, .+)? analyzed in \d+ ms$/);
    expect(analyzedRows("pieces_owner_idx")).toBe(660);
    expect(analyzedRows("finish_layers_piece_idx")).toBe(660);

    expect((await searchIndexesJob()).filter((l) => l.startsWith("planner statistics"))).toEqual([]);
  });

  it("a database kept busy past the timeout still opens, without fresh statistics", () => {
    // The pieces' statistics gone, so opening wants to analyze them; another connection holds the
    // write lock all the while (as a long write in another process would).
    const sqlite = getDb().$client;
    sqlite.exec("DELETE FROM sqlite_stat1 WHERE tbl = 'pieces'");
    sqlite.exec("BEGIN IMMEDIATE");
    try {
      const opened = openDatabase(file); // waits out busy_timeout (5 s), then opens anyway
      expect(opened.$client.prepare("SELECT count(*) FROM pieces").pluck().get()).toBe(660);
      opened.$client.close();
    } finally {
      sqlite.exec("ROLLBACK");
    }
    expect(analyzedRows("pieces_owner_idx")).toBeNull();
    // Once the lock is free, the next open analyzes them.
    openDatabase(file).$client.close();
    expect(analyzedRows("pieces_owner_idx")).toBe(660);
  }, 20_000);

  it("another connection plans with the statistics the nightly pass wrote once it reloads them, hourly, without waiting for a writer", async () => {
    // A probe table (only in this test's file) with two indexes; the planner picks the one its loaded
    // statistics call the more selective. Made before the second connection opens: a schema change
    // would make that connection reload everything, statistics included, and hide what is tested.
    const first = getDb().$client;
    first.exec("CREATE TABLE planner_probe (a INTEGER, b INTEGER); CREATE INDEX planner_probe_a ON planner_probe (a); CREATE INDEX planner_probe_b ON planner_probe (b)");
    const insert = first.prepare("INSERT INTO planner_probe (a, b) VALUES (?, ?)");
    first.transaction(() => {
      for (let i = 0; i < 100; i++) insert.run(i, i % 10); // a: 1 row a value, b: 10
    })();
    first.exec("ANALYZE planner_probe");
    const plan = (db: typeof first) => (db.prepare("EXPLAIN QUERY PLAN SELECT * FROM planner_probe WHERE a = ? AND b = ?").all(1, 1) as { detail: string }[]).map((r) => r.detail).join("; ");

    const server = openDatabase(file).$client; // as the server opens it at start
    try {
      expect(plan(server)).toMatch(/USING INDEX planner_probe_a\b/);
      // Eleven times as many rows, now 110 to each a and one to each b (evenly: sqlite_stat4 would see
      // through a skew): the nightly pass (run here, in the "scheduler's" connection) analyzes the
      // table again, and its own plans turn to b.
      first.transaction(() => {
        for (let i = 0; i < 1000; i++) insert.run(0, 0);
        first.exec("UPDATE planner_probe SET a = rowid % 10, b = rowid");
      })();
      expect((await searchIndexesJob()).filter((l) => l.startsWith("planner statistics"))).toEqual([expect.stringMatching(/planner_probe/)]);
      expect(plan(first)).toMatch(/USING INDEX planner_probe_b\b/);
      // The server's connection still plans with what it loaded at open, though sqlite_stat1 says otherwise.
      expect(plan(server)).toMatch(/USING INDEX planner_probe_a\b/);
      expect(reloadPlannerStatistics(server)).toBe(true);
      expect(plan(server)).toMatch(/USING INDEX planner_probe_b\b/);
      // Nothing new: nothing reloaded (no lock taken).
      expect(reloadPlannerStatistics(server)).toBe(false);

      // Back the other way (each a its own value, 110 to each b), analyzed; while another connection
      // holds the write lock the reload does not wait for it (busy_timeout is 5 s) and the plan stays.
      first.exec("UPDATE planner_probe SET a = rowid, b = rowid % 10");
      first.exec("ANALYZE planner_probe");
      first.exec("BEGIN IMMEDIATE");
      try {
        const started = performance.now();
        expect(reloadPlannerStatistics(server)).toBe(false);
        expect(performance.now() - started).toBeLessThan(1000);
        expect(plan(server)).toMatch(/USING INDEX planner_probe_b\b/);
      } finally {
        first.exec("ROLLBACK");
      }
      expect(server.pragma("busy_timeout", { simple: true })).toBe(5000);
      // The watch getDb() keeps (hourly, here every 20 ms) picks it up once the lock is free.
      const stop = watchPlannerStatistics(server, 20);
      try {
        await vi.waitFor(() => expect(plan(server)).toMatch(/USING INDEX planner_probe_a\b/), { timeout: 5000, interval: 20 });
      } finally {
        stop();
      }
    } finally {
      server.close();
    }
  });
});
