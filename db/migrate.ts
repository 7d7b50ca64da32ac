import path from "node:path";
import { migrate } from "drizzle-orm/better-sqlite3/migrator";
import { databaseFile, openDatabase, type Db } from "./client";

export const MIGRATIONS_FOLDER = path.join(import.meta.dirname, "migrations");

export function applyMigrations(db: Db): void {
  migrate(db, { migrationsFolder: MIGRATIONS_FOLDER });
}

// `npm run db:migrate`
if (process.argv[1] && path.resolve(process.argv[1]) === path.resolve(import.meta.filename)) {
  const file = databaseFile();
  const db = openDatabase(file);
  applyMigrations(db);
  db.$client.close();
  console.log(`Migrated ${file}`);
}
