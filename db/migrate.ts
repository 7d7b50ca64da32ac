import path from "node:path";
import { migrate } from "drizzle-orm/better-sqlite3/migrator";
import { databaseFile, openDatabase, type Db } from "./client";

export const MIGRATIONS_FOLDER = path.join(import.meta.dirname, "migrations");

/**
 * Applies the committed migrations (drizzle runs the pending ones in one transaction). Foreign keys are
 * off meanwhile, as SQLite's table-rebuild procedure asks (the pragma is ignored inside a transaction,
 * so it is set around it): dropping a rebuilt table must not fire the ON DELETE actions of the rows that
 * reference it. Afterwards no reference may point nowhere.
 */
export function applyMigrations(db: Db, migrationsFolder = MIGRATIONS_FOLDER): void {
  db.$client.pragma("foreign_keys = OFF");
  try {
    migrate(db, { migrationsFolder });
    const dangling = db.$client.pragma("foreign_key_check") as { table: string; rowid: number; parent: string }[];
    if (dangling.length) throw new Error(`After the migrations, ${dangling.length} rows refer to rows that do not exist, e.g. ${JSON.stringify(dangling.slice(0, 3))}.`);
  } finally {
    db.$client.pragma("foreign_keys = ON");
  }
}

// `npm run db:migrate`
if (process.argv[1] && path.resolve(process.argv[1]) === path.resolve(import.meta.filename)) {
  const file = databaseFile();
  const db = openDatabase(file);
  applyMigrations(db);
  db.$client.close();
  console.log(`Migrated ${file}`);
}
