// `npm run bench`: every tests/bench/*.bench.ts in turn, each in its own `tsx` child process; writes
// tests/bench/REPORT.md with each benchmark's verdict, wall time and the figures it printed, and exits
// non-zero if any missed its target.
import { spawnSync } from "node:child_process";
import { readdirSync, writeFileSync } from "node:fs";
import os from "node:os";
import path from "node:path";
import { fileURLToPath } from "node:url";

const dir = path.dirname(fileURLToPath(import.meta.url));
const root = path.resolve(dir, "../..");
const tsx = path.join(root, "node_modules", ".bin", process.platform === "win32" ? "tsx.cmd" : "tsx");
const only = process.argv.slice(2);
const files = readdirSync(dir)
  .filter((f) => f.endsWith(".bench.ts") && (only.length === 0 || only.some((o) => f.includes(o))))
  .sort();

type Row = { file: string; ok: boolean; seconds: number; output: string };
const rows: Row[] = [];
for (const file of files) {
  console.log(`\n▶ ${file}`);
  const t0 = Date.now();
  const r = spawnSync(tsx, [path.join(dir, file)], { cwd: root, encoding: "utf8", maxBuffer: 64 * 1024 * 1024 });
  const output = `${r.stdout ?? ""}${r.stderr ?? ""}`;
  process.stdout.write(output);
  rows.push({ file, ok: r.status === 0, seconds: (Date.now() - t0) / 1000, output });
}

const machine = `${os.cpus().length} × ${os.cpus()[0]?.model ?? "CPU"}, ${(os.totalmem() / 2 ** 30).toFixed(0)} GiB, Node ${process.version}, load average ${os.loadavg().map((l) => l.toFixed(1)).join(" / ")} at the end`;
const report = [
  "# Benchmark report",
  "",
  `Run ${new Date().toISOString()} on ${machine}. Each benchmark states its own target and the floor it is compared with; its printed figures follow.`,
  "",
  "| benchmark | verdict | wall time |",
  "|---|---|---|",
  ...rows.map((r) => `| ${r.file} | ${r.ok ? "met its target" : "MISSED its target"} | ${r.seconds.toFixed(1)} s |`),
  "",
  ...rows.flatMap((r) => [`## ${r.file}`, "", "```", r.output.trim().split("\n").slice(-25).join("\n"), "```", ""]),
].join("\n");
if (only.length === 0) writeFileSync(path.join(dir, "REPORT.md"), report);

const failed = rows.filter((r) => !r.ok);
console.log(`\n${rows.length - failed.length}/${rows.length} benchmarks passed`);
if (failed.length > 0) {
  console.error(`failed: ${failed.map((r) => r.file).join(", ")}`);
  process.exit(1);
}
