// The benchmarks' seeded databases, made once and kept in tests/.tmp: one file per kind of seed, size and
// migration set (`<name>-<size>-m<migrations>.db`, with what the seed returned beside it as `.db.json`,
// written last, so a seed cut short is made again). A seed made before the newest migrations is brought
// forward (much faster than seeding again). Each run copies the file it is given; the kept file is
// never opened by a run, so every run starts from the same bytes. Delete tests/.tmp to seed afresh.
import fs from "node:fs";
import path from "node:path";
import { fileURLToPath } from "node:url";
import journal from "../../db/migrations/meta/_journal.json";

const cacheDir = path.resolve(path.dirname(fileURLToPath(import.meta.url)), "../.tmp");

/**
 * The kept seed `name` of `size` rows for the current migrations, and the seed's own description;
 * `make(file)` seeds a new file, `migrate(file)` applies the newest migrations to an older seed's copy;
 * `how` says which of the two happened ("kept": neither).
 */
export function keptSeed<T>(name: string, size: number, make: (file: string) => T, migrate: (file: string) => void): { file: string; meta: T; how: "seeded" | "brought forward" | "kept" } {
  const migrations = journal.entries.length;
  const file = path.join(cacheDir, `${name}-${size}-m${migrations}.db`);
  let how: "seeded" | "brought forward" | "kept" = "kept";
  if (!fs.existsSync(`${file}.json`)) {
    fs.mkdirSync(cacheDir, { recursive: true });
    for (const f of [file, `${file}-wal`, `${file}-shm`]) fs.rmSync(f, { force: true });
    const older = fs
      .readdirSync(cacheDir)
      .map((f) => new RegExp(`^${name}-${size}-m(\\d+)\\.db\\.json$`).exec(f))
      .filter((m): m is RegExpExecArray => !!m && Number(m[1]) < migrations)
      .sort((a, b) => Number(b[1]) - Number(a[1]))[0];
    if (older) {
      const from = path.join(cacheDir, older[0].replace(/\.json$/, ""));
      fs.copyFileSync(from, file);
      migrate(file);
      fs.copyFileSync(`${from}.json`, `${file}.json`);
      how = "brought forward";
    } else {
      const meta = make(file);
      fs.writeFileSync(`${file}.json`, JSON.stringify(meta ?? {}));
      how = "seeded";
    }
  }
  return { file, meta: JSON.parse(fs.readFileSync(`${file}.json`, "utf8")) as T, how };
}
