// The connection settings every process relies on, and the refusal to run on an unmigrated file.
import fs from "node:fs";
import path from "node:path";
import { describe, expect, it } from "vitest";
import { getDb, migrationStatus, openDatabase, UnmigratedDatabaseError } from "@/db/client";
import { applyMigrations } from "@/db/migrate";
import journal from "@/db/migrations/meta/_journal.json";

describe("database connection", () => {
  it("opens with WAL, foreign keys and a busy timeout", () => {
    const sqlite = getDb().$client;
    expect(sqlite.pragma("journal_mode", { simple: true })).toBe("wal");
    expect(sqlite.pragma("foreign_keys", { simple: true })).toBe(1);
    expect(sqlite.pragma("busy_timeout", { simple: true })).toBe(5000);
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
