// The connection settings every process relies on, and the refusal to run on an unmigrated file.
import fs from "node:fs";
import path from "node:path";
import { sql } from "drizzle-orm";
import { describe, expect, it } from "vitest";
import { getDb, migrationStatus, openDatabase, UnmigratedDatabaseError } from "@/db/client";
import { migrate } from "drizzle-orm/better-sqlite3/migrator";
import { applyMigrations } from "@/db/migrate";
import journal from "@/db/migrations/meta/_journal.json";

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
    // The migrations up to 0005, then rows in the old index, then the rest.
    const upTo = path.join(dir, "migrations");
    fs.cpSync(path.join(import.meta.dirname, "../../db/migrations"), upTo, { recursive: true });
    const j = structuredClone(journal);
    const at = j.entries.findIndex((e) => e.tag.startsWith("0006_"));
    expect(at).toBeGreaterThan(0);
    j.entries = j.entries.slice(0, at);
    fs.writeFileSync(path.join(upTo, "meta/_journal.json"), JSON.stringify(j));
    const db = openDatabase(path.join(dir, "m.db"));
    migrate(db, { migrationsFolder: upTo });
    const c = db.$client;
    const words = ["walnut", "walnuts", "burl", "wallaby", "oak"];
    const ins = c.prepare("INSERT INTO pieces_fts (rowid, piece_id, studio_id, title, species, owner, notes) VALUES (?, ?, 's1', ?, '', '', '')");
    for (let i = 1; i <= 300; i++) ins.run(i * 7, `p${i}`, `${words[i % words.length]} table ${i}`);
    const search = (q: string) => c.prepare("SELECT rowid, piece_id AS id FROM pieces_fts WHERE pieces_fts MATCH ? ORDER BY rowid DESC").all(q);
    const queries = ['"wal"*', '"walnut"*', '"walnuts"*', '"bu"*', '"o"*', '"table"* "wall"*', '"wallabies"*'];
    const before = queries.map(search);
    applyMigrations(db);
    expect(queries.map(search)).toEqual(before);
    expect(before[1]).toHaveLength(120);
    expect((c.prepare("SELECT count(*) AS n FROM pieces_fts").get() as { n: number }).n).toBe(300);
    expect((c.prepare("SELECT sql FROM sqlite_master WHERE name = 'pieces_fts'").get() as { sql: string }).sql).toContain("prefix = '2 3 4 5 6 7 8'");
    expect(c.pragma("integrity_check", { simple: true })).toBe("ok");
    c.close();
  });
});
