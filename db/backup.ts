// `npm run db:backup [-- --out <file>]`: an online backup of the SQLite file with better-sqlite3's
// backup API (SQLite's online backup), safe while the app serves traffic. Restore: stop the app,
// replace DATABASE_URL's file with the backup (and delete its -wal/-shm files), start the app.
import path from "node:path";
import Database from "better-sqlite3";
import { databaseFile } from "./client";

export async function backupDatabase(source: string, destination: string): Promise<{ pages: number; integrity: string }> {
  const db = new Database(source, { fileMustExist: true });
  db.pragma("busy_timeout = 5000");
  try {
    let pages = 0;
    await db.backup(destination, {
      progress: ({ totalPages }) => {
        pages = totalPages;
        return 200; // pages per step; the app keeps writing between steps
      },
    });
    const copy = new Database(destination, { readonly: true });
    const integrity = String(copy.pragma("integrity_check", { simple: true }));
    copy.close();
    return { pages, integrity };
  } finally {
    db.close();
  }
}

if (process.argv[1] && path.resolve(process.argv[1]) === path.resolve(import.meta.filename)) {
  const i = process.argv.indexOf("--out");
  const stamp = new Date().toISOString().replace(/[:.]/g, "-");
  const source = databaseFile();
  const out = i > 0 && process.argv[i + 1] ? process.argv[i + 1]! : source.replace(/\.db$/, "") + `.backup-${stamp}.db`;
  const { pages, integrity } = await backupDatabase(source, out);
  console.log(`Backed up ${source} → ${out} (${pages} pages, integrity_check: ${integrity})`);
  if (integrity !== "ok") process.exit(1);
}
