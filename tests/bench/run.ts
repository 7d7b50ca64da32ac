// `npm run bench`: builds the app once, then runs every tests/bench/*.bench.ts in turn (any file of that
// name is picked up: a script that prints its figures with result() from ./result), each in its own
// `tsx` child process, holding the shared build lock throughout; writes tests/bench/REPORT.md with one
// row per figure (target, measured, floor, ratio to the floor) and each benchmark's output, and exits
// non-zero if any figure missed its target. `npm run bench -- server` runs only the files whose names
// match (and leaves REPORT.md alone); `npm run bench -- --large` adds the sweep's largest sizes
// (BENCH_LARGE=1 in each benchmark: 1,000,000 pieces). The largest points alone, without the rest:
// `BENCH_PIECES=1000000 npm run bench -- reminder-pass` and `BENCH_SWEEP=1000000 npm run bench -- server`.
import { spawnSync } from "node:child_process";
import { createHash } from "node:crypto";
import { readdirSync, writeFileSync } from "node:fs";
import os from "node:os";
import path from "node:path";
import { fileURLToPath } from "node:url";
import type { BenchResult } from "./result";
import { bin, buildOnce, holdBuildLock, PIECES, root } from "./server-harness";

holdBuildLock(fileURLToPath(import.meta.url));

const dir = path.dirname(fileURLToPath(import.meta.url));
const args = process.argv.slice(2);
const large = args.includes("--large");
const only = args.filter((a) => !a.startsWith("--"));
const files = readdirSync(dir)
  .filter((f) => f.endsWith(".bench.ts") && (only.length === 0 || only.some((o) => f.includes(o))))
  .sort();

// How fast this machine is today, so that runs on different machines can be compared: SHA-256 over
// 256 MiB (native code) and a fixed JavaScript loop (the engine), each the best of 3.
function calibrate(): string {
  const buf = Buffer.alloc(256 * 2 ** 20, 7);
  const best = (f: () => void) => Math.min(...[0, 1, 2].map(() => { const t = performance.now(); f(); return performance.now() - t; }));
  const hashMs = best(() => createHash("sha256").update(buf).digest());
  let x = 0;
  const loopMs = best(() => { for (let i = 0; i < 50_000_000; i++) x = (x * 31 + i) % 1_000_003; });
  (globalThis as { benchSink?: number }).benchSink = x; // keeps the loop's result alive
  return `SHA-256 ${(256 / (hashMs / 1000)).toFixed(0)} MiB/s; a 50M-step JavaScript loop ${loopMs.toFixed(0)} ms`;
}

const started = Date.now();
const speed = calibrate();
console.log(`machine speed: ${speed}`);
buildOnce();

type Row = { file: string; status: number | null; seconds: number; output: string; results: BenchResult[] };
const rows: Row[] = [];
for (const file of files) {
  console.log(`\n▶ ${file}`);
  const t0 = Date.now();
  const r = spawnSync(bin("tsx"), [path.join(dir, file)], { cwd: root, encoding: "utf8", maxBuffer: 64 * 1024 * 1024, env: { ...process.env, BENCH_SKIP_BUILD: "1", ...(large ? { BENCH_LARGE: "1" } : {}) } });
  const output = `${r.stdout ?? ""}${r.stderr ?? ""}`;
  process.stdout.write(output);
  const results = output
    .split("\n")
    .filter((l) => l.startsWith("RESULT "))
    .map((l) => JSON.parse(l.slice(7)) as BenchResult);
  rows.push({ file, status: r.status, seconds: (Date.now() - t0) / 1000, output, results });
}

const cell = (s: string) => s.replace(/\|/g, "\\|");
const machine = `${os.cpus().length} × ${os.cpus()[0]?.model ?? "CPU"}, ${(os.totalmem() / 2 ** 30).toFixed(0)} GiB, Node ${process.version}`;
const all = rows.flatMap((r) => r.results.map((x) => ({ ...x, file: r.file })));
const report = [
  "# Benchmark report",
  "",
  `Written by \`npm run bench\` on ${new Date().toISOString()}: ${machine}; ${PIECES.toLocaleString("en-US")} synthetic pieces; a production build; load average ${os.loadavg().map((l) => l.toFixed(1)).join(" / ")} at the end; ${((Date.now() - started) / 1000).toFixed(0)} s in all.`,
  `Machine speed at the start (for comparing runs on different machines): ${speed}.`,
  "Each benchmark file says where its target comes from; the floor is what the figure is compared with in the same run (ratio = measured ÷ floor, except throughput, where it is measured ÷ bare route). A figure without a floor is marked so.",
  "",
  "| figure | target | measured | floor | ratio | verdict |",
  "|---|---|---|---|---|---|",
  ...all.map((x) => `| ${cell(x.figure)} | ${cell(x.target)} | ${cell(x.measured)} | ${cell(x.floor)} | ${x.ratio === null ? "no floor" : x.ratio.toFixed(2)} | ${x.ok ? "met" : "**missed**"} |`),
  ...rows.filter((r) => r.status !== 0 && r.results.every((x) => x.ok)).map((r) => `| ${r.file} | runs to the end | exit ${r.status} | — | — | **failed** |`),
  ...rows.filter((r) => r.status === 0 && r.results.length === 0).map((r) => `| ${r.file} | prints its figures with result() | no figures | — | — | **no figures** |`),
  "",
  ...rows.flatMap((r) => [`## ${r.file} (${r.seconds.toFixed(0)} s)`, "", "```", r.output.split("\n").filter((l) => !l.startsWith("RESULT ")).join("\n").trim().split("\n").slice(-30).join("\n"), "```", ""]),
].join("\n");
if (only.length === 0) writeFileSync(path.join(dir, "REPORT.md"), report);

const failed = rows.filter((r) => r.status !== 0);
console.log(`\n${all.filter((x) => x.ok).length}/${all.length} figures met their targets; ${rows.length - failed.length}/${rows.length} benchmarks exited cleanly`);
if (failed.length > 0) {
  console.error(`missed or failed: ${failed.map((r) => r.file).join(", ")}`);
  process.exit(1);
}
