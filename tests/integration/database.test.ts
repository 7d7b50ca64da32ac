// The connection settings every process relies on, and the refusal to run on an unmigrated file.
import fs from "node:fs";
import path from "node:path";
import { sql } from "drizzle-orm";
import { describe, expect, it } from "vitest";
import { getDb, migrationStatus, openDatabase, UnmigratedDatabaseError } from "@/db/client";
import { migrate } from "drizzle-orm/better-sqlite3/migrator";
import { applyMigrations } from "@/db/migrate";
import journal from "@/db/migrations/meta/_journal.json";
import { searchScope } from "@/lib/pieces/search-index";

/** A copy of the committed migrations in `dir` whose journal stops before (or, with `through`, just after) the migration tagged `tag`. */
function migrationsUpTo(dir: string, tag: string, through = false): string {
  const upTo = path.join(dir, `migrations-${tag}-${through ? "through" : "before"}`);
  fs.cpSync(path.join(import.meta.dirname, "../../db/migrations"), upTo, { recursive: true });
  const j = structuredClone(journal);
  const at = j.entries.findIndex((e) => e.tag.startsWith(tag));
  expect(at).toBeGreaterThan(0);
  j.entries = j.entries.slice(0, through ? at + 1 : at);
  fs.writeFileSync(path.join(upTo, "meta/_journal.json"), JSON.stringify(j));
  return upTo;
}

describe("database connection", () => {
  it("opens with WAL, foreign keys and a busy timeout", () => {
    const sqlite = getDb().$client;
    expect(sqlite.pragma("journal_mode", { simple: true })).toBe("wal");
    expect(sqlite.pragma("foreign_keys", { simple: true })).toBe(1);
    expect(sqlite.pragma("busy_timeout", { simple: true })).toBe(5000);
  });

  it("reuses prepared statements safely: the same text gives the same statement, raw mode is reset, a statement being iterated is not handed out", () => {
    const dir = fs.mkdtempSync(path.join(process.env.DATA_DIR!, "stmt-"));
    const db = openDatabase(path.join(dir, "s.db"));
    const c = db.$client;
    c.exec("CREATE TABLE t (a INTEGER, b TEXT); INSERT INTO t VALUES (1, 'x'), (2, 'y');");
    const text = "SELECT a, b FROM t ORDER BY a";
    const first = c.prepare(text);
    expect(c.prepare(text)).toBe(first);
    expect(first.raw().all()).toEqual([[1, "x"], [2, "y"]]);
    // The next user of the same text gets objects again, not the raw arrays left switched on above.
    expect(c.prepare(text).all()).toEqual([{ a: 1, b: "x" }, { a: 2, b: "y" }]);
    const seen: unknown[] = [];
    for (const row of c.prepare(text).iterate()) {
      // While the cached statement is busy iterating, the same text is prepared afresh.
      const inner = c.prepare(text);
      expect(inner).not.toBe(first);
      seen.push([row, inner.all().length]);
    }
    expect(seen).toEqual([[{ a: 1, b: "x" }, 2], [{ a: 2, b: "y" }, 2]]);
    // Drizzle's own queries go through the same cache and still map their rows.
    expect(db.all<{ n: number }>(sql`SELECT count(*) AS n FROM t`)).toEqual([{ n: 2 }]);
    expect(db.all<{ n: number }>(sql`SELECT count(*) AS n FROM t`)).toEqual([{ n: 2 }]);
    c.close();
  });

  it("counts migrations against the committed journal", () => {
    const dir = fs.mkdtempSync(path.join(process.env.DATA_DIR!, "mig-"));
    const db = openDatabase(path.join(dir, "x.db"));
    expect(migrationStatus(db)).toEqual({ applied: 0, expected: journal.entries.length });
    applyMigrations(db);
    expect(migrationStatus(db)).toEqual({ applied: journal.entries.length, expected: journal.entries.length });
    db.$client.close();
  });

  it("refuses an unmigrated database with a message that says what to run", async () => {
    const dir = fs.mkdtempSync(path.join(process.env.DATA_DIR!, "unmig-"));
    const { execFileSync } = await import("node:child_process");
    // A fresh process, so the module-level connection of this worker is not reused.
    let out = "";
    try {
      execFileSync(
        process.execPath,
        ["--import", "tsx", "-e", "import('./db/client.ts').then(m => m.getDb())"],
        { env: { ...process.env, DATABASE_URL: path.join(dir, "empty.db") }, stdio: "pipe" },
      );
    } catch (e) {
      out = String((e as { stderr?: Buffer }).stderr ?? e);
    }
    expect(out).toContain("npm run db:migrate");
    expect(UnmigratedDatabaseError.name).toBe("UnmigratedDatabaseError");
  });
});

describe("migration 0006: prefix indexes for the registry search", () => {
  it("keeps every index row with its rowid, and prefix searches give the same rows before and after", () => {
    const dir = fs.mkdtempSync(path.join(process.env.DATA_DIR!, "fts-"));
    // The migrations up to 0005, then rows in the old index (with no pieces: 0031 keeps only the rows
    // of pieces, so it is not applied here), then 0006.
    const db = openDatabase(path.join(dir, "m.db"));
    migrate(db, { migrationsFolder: migrationsUpTo(dir, "0006_") });
    const c = db.$client;
    const words = ["walnut", "walnuts", "burl", "wallaby", "oak"];
    const ins = c.prepare("INSERT INTO pieces_fts (rowid, piece_id, studio_id, title, species, owner, notes) VALUES (?, ?, 's1', ?, '', '', '')");
    for (let i = 1; i <= 300; i++) ins.run(i * 7, `p${i}`, `${words[i % words.length]} table ${i}`);
    const search = (q: string) => c.prepare("SELECT rowid, piece_id AS id FROM pieces_fts WHERE pieces_fts MATCH ? ORDER BY rowid DESC").all(q);
    const queries = ['"wal"*', '"walnut"*', '"walnuts"*', '"bu"*', '"o"*', '"table"* "wall"*', '"wallabies"*'];
    const before = queries.map(search);
    migrate(db, { migrationsFolder: migrationsUpTo(dir, "0006_", true) });
    expect(queries.map(search)).toEqual(before);
    expect(before[1]).toHaveLength(120);
    expect((c.prepare("SELECT count(*) AS n FROM pieces_fts").get() as { n: number }).n).toBe(300);
    expect((c.prepare("SELECT sql FROM sqlite_master WHERE name = 'pieces_fts'").get() as { sql: string }).sql).toContain("prefix = '2 3 4 5 6 7 8'");
    expect(c.pragma("integrity_check", { simple: true })).toBe("ok");
    c.close();
  });
});

describe("migration 0031: the registry index's scope words", () => {
  it("keeps every piece's index row with its rowid, gives it its studio's and archived state's word, and its triggers follow archiving, moves and deletion", () => {
    const dir = fs.mkdtempSync(path.join(process.env.DATA_DIR!, "fts-scope-"));
    const db = openDatabase(path.join(dir, "m.db"));
    migrate(db, { migrationsFolder: migrationsUpTo(dir, "0031_") });
    const c = db.$client;
    const studioIds = ["studio-One (invented)", "studio-one (invented)"]; // differ only in case: the words must not
    for (const id of studioIds) c.prepare("INSERT INTO studios (id, slug, name, time_zone, created_at) VALUES (?, ?, ?, 'UTC', 0)").run(id, id.replace(/\W+/g, "-").toLowerCase() + (id === studioIds[0] ? "1" : "2"), id);
    const insPiece = c.prepare(`INSERT INTO pieces (id, studio_id, kind, title, shape_kind, primary_species_id, use, delivered_on, registration_code_hash, registration_code_enc, archived_at, created_at, updated_at)
      VALUES (?, ?, 'desk', ?, 'rectangle', 'white_oak', 'light', '2024-01-01', ?, 'x', ?, 0, 0)`);
    const insFts = c.prepare("INSERT INTO pieces_fts (rowid, piece_id, studio_id, title, species, owner, notes) VALUES (?, ?, ?, ?, '', '', '')");
    const words = ["walnut", "burl", "oak"];
    const made: { rowid: number; id: string; studio: string; archived: boolean }[] = [];
    for (let i = 1; i <= 60; i++) {
      const studio = studioIds[i % 2]!;
      const archived = i % 5 === 0;
      const id = `piece-${i}`;
      const rowid = Number(insPiece.run(id, studio, `${words[i % 3]} desk ${i}`, `h${i}`, archived ? 1 : null).lastInsertRowid);
      insFts.run(rowid, id, studio, `${words[i % 3]} desk ${i}`);
      made.push({ rowid, id, studio, archived });
    }
    // Rows of no piece (its piece deleted before the triggers existed), and of another piece's rowid: left behind.
    insFts.run(9001, "piece-gone", studioIds[0], "walnut desk gone");
    insFts.run(made[0]!.rowid + 1000, made[0]!.id, studioIds[0], "walnut desk elsewhere");
    const search = (q: string) => (c.prepare("SELECT rowid FROM pieces_fts WHERE pieces_fts MATCH ? ORDER BY rowid").all(q) as { rowid: number }[]).map((r) => r.rowid);
    const queries = ['"walnut"*', '"wal"*', '"desk"* "burl"*', '"o"*'];
    const before = queries.map(search);

    applyMigrations(db);
    const kept = new Set(made.map((p) => p.rowid));
    expect(queries.map((q) => search(`{title species owner notes} : (${q})`))).toEqual(before.map((rows) => rows.filter((r) => kept.has(r))));
    const rows = c.prepare("SELECT rowid, piece_id AS id, studio_id AS studio, scope FROM pieces_fts ORDER BY rowid").all();
    expect(rows).toEqual(made.map((p) => ({ rowid: p.rowid, id: p.id, studio: p.studio, scope: searchScope(p.studio, p.archived) })));
    const inScope = (studio: string, archived: boolean) => search(`scope : "${searchScope(studio, archived)}"`);
    const expectScopes = () => {
      for (const studio of studioIds)
        for (const archived of [false, true]) expect(inScope(studio, archived), `${studio} ${archived}`).toEqual(made.filter((p) => p.studio === studio && p.archived === archived).map((p) => p.rowid));
    };
    expectScopes();
    expect(new Set(studioIds.map((s) => searchScope(s, false))).size).toBe(2);

    // Archived, unarchived and moved by plain UPDATEs, deleted by a plain DELETE: the triggers follow.
    const [a, b, d] = [made[2]!, made[3]!, made[4]!];
    c.prepare("UPDATE pieces SET archived_at = 5 WHERE id = ?").run(a.id);
    a.archived = true;
    c.prepare("UPDATE pieces SET archived_at = NULL WHERE id = ?").run(made[9]!.id);
    made[9]!.archived = false;
    c.prepare("UPDATE pieces SET studio_id = ? WHERE id = ?").run(studioIds[0], b.id);
    c.prepare("UPDATE pieces SET title = 'renamed', archived_at = archived_at WHERE id = ?").run(d.id); // no change of scope: row kept as it was
    b.studio = studioIds[0]!;
    expectScopes();
    expect(c.prepare("SELECT studio_id AS studio FROM pieces_fts WHERE rowid = ?").get(b.rowid)).toEqual({ studio: studioIds[0] });
    c.prepare("DELETE FROM pieces WHERE id = ?").run(a.id);
    made.splice(made.indexOf(a), 1);
    expectScopes();
    expect(c.prepare("SELECT count(*) AS n FROM pieces_fts WHERE rowid = ?").get(a.rowid)).toEqual({ n: 0 });
    expect(search('{title species owner notes} : ("walnut"*)')).toEqual(before[0]!.filter((r) => r !== a.rowid && kept.has(r)));
    expect(c.pragma("integrity_check", { simple: true })).toBe("ok");
    c.close();
  });
});
