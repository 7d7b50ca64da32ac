// Runs every tests/bench/*.bench.ts in turn, each in its own `tsx` child process, and exits non-zero if any fails.
import { spawnSync } from "node:child_process";
import { readdirSync } from "node:fs";
import path from "node:path";
import { fileURLToPath } from "node:url";

const dir = path.dirname(fileURLToPath(import.meta.url));
const root = path.resolve(dir, "../..");
const tsx = path.join(root, "node_modules", ".bin", process.platform === "win32" ? "tsx.cmd" : "tsx");
const files = readdirSync(dir).filter((f) => f.endsWith(".bench.ts")).sort();

const failed: string[] = [];
for (const file of files) {
  console.log(`\n▶ ${file}`);
  const r = spawnSync(tsx, [path.join(dir, file)], { cwd: root, stdio: "inherit" });
  if (r.status !== 0) failed.push(`${file} (${r.error ? r.error.message : r.signal ? `signal ${r.signal}` : `exit ${r.status}`})`);
}
console.log(`\n${files.length - failed.length}/${files.length} benchmarks passed`);
if (failed.length > 0) {
  console.error(`failed: ${failed.join(", ")}`);
  process.exit(1);
}
