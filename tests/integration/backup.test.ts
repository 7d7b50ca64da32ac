// Online backup while another process keeps writing: the copy passes the integrity check and holds
// every row written before the backup began.
import { spawn } from "node:child_process";
import fs from "node:fs";
import path from "node:path";
import Database from "better-sqlite3";
import { describe, expect, it } from "vitest";
import { openDatabase } from "@/db/client";
import { applyMigrations } from "@/db/migrate";
import { backupDatabase } from "@/db/backup";

describe("npm run db:backup", () => {
  it("copies a live database consistently while a writer runs", async () => {
    const dir = fs.mkdtempSync(path.join(process.env.DATA_DIR!, "backup-"));
    const file = path.join(dir, "live.db");
    const db = openDatabase(file);
    applyMigrations(db);
    db.$client.exec("CREATE TABLE burst (id INTEGER PRIMARY KEY, at INTEGER NOT NULL, pad TEXT NOT NULL)");
    const insert = db.$client.prepare("INSERT INTO burst (at, pad) VALUES (?, ?)");
    for (let i = 0; i < 5000; i++) insert.run(Date.now(), "x".repeat(200));
    db.$client.close();

    // A second process writes for the whole backup.
    const writer = spawn(
      process.execPath,
      [
        "-e",
        `const D=require("better-sqlite3");const d=new D(${JSON.stringify(file)});d.pragma("journal_mode=WAL");d.pragma("busy_timeout=5000");
         const s=d.prepare("INSERT INTO burst (at, pad) VALUES (?, ?)");const end=Date.now()+1500;let n=0;
         while(Date.now()<end){s.run(Date.now(),"y".repeat(200));n++}console.log(n)`,
      ],
      { cwd: process.cwd(), stdio: ["ignore", "pipe", "inherit"] },
    );
    let written = "";
    writer.stdout.on("data", (c) => (written += c));
    await new Promise((r) => setTimeout(r, 200));
    const out = path.join(dir, "copy.db");
    const { integrity } = await backupDatabase(file, out);
    await new Promise((r) => writer.on("exit", r));

    expect(integrity).toBe("ok");
    const copy = new Database(out, { readonly: true });
    const rows = (copy.prepare("SELECT COUNT(*) AS n FROM burst").get() as { n: number }).n;
    expect(rows).toBeGreaterThanOrEqual(5000);
    expect(copy.prepare("SELECT COUNT(*) AS n FROM __drizzle_migrations").get()).toMatchObject({ n: expect.any(Number) });
    copy.close();
    const live = new Database(file, { readonly: true });
    const liveRows = (live.prepare("SELECT COUNT(*) AS n FROM burst").get() as { n: number }).n;
    live.close();
    expect(Number(written.trim())).toBeGreaterThan(0);
    expect(liveRows).toBe(5000 + Number(written.trim()));
    expect(rows).toBeLessThanOrEqual(liveRows);
  });
});
