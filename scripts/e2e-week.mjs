// The whole e2e suite once for each day of one week, at a different hour each day, and once across a
// daylight-saving change, with every process's clock shifted by libfaketime (Debian package
// `faketime`): Playwright's runner and the e2e server (migrate, seed, app, mail sink, Stripe fake) start
// at the chosen moment and tick on from there; Chromium, which misbehaves under libfaketime, gets the
// same time in every context through Playwright's clock API (tests/support/browser-clock.ts). They all
// agree with one another without a test-only setting in the product. It shows that no spec depends on the day or hour it runs.
//
// Not part of `npm test`. Needs the production build (`npm run build` first) and the fixed e2e ports.
//   node scripts/e2e-week.mjs                      every run below
//   node scripts/e2e-week.mjs --only=mon,tue,dst   some of them (by label)
//   node scripts/e2e-week.mjs --only=wed -- tests/e2e/visits.spec.ts   extra args go to `playwright test`
// Each run's list output and JSON report land in tests/.tmp/e2e-week/; a summary table is printed.
import { spawn, spawnSync } from "node:child_process";
import fs from "node:fs";
import path from "node:path";
import Database from "better-sqlite3";

const root = path.resolve(import.meta.dirname, "..");
const outDir = path.join(root, "tests/.tmp/e2e-week");
const ZONE = "America/Los_Angeles"; // the demo studio's zone (db/seed/demo.ts)

// Moments in the demo studio's zone, with their UTC offset. The hours differ on purpose: before the
// technicians' day, in Sol's lunch gap, just before the 48-hour booking notice crosses a seeded visit,
// at the end of the day, and late evening when the UTC date is already the next day.
const RUNS = [
  { label: "mon", at: "2026-11-30T08:10:00-08:00" },
  { label: "tue", at: "2026-12-01T12:40:00-08:00" },
  { label: "wed", at: "2026-12-02T09:50:00-08:00" },
  { label: "thu", at: "2026-12-03T16:55:00-08:00" },
  { label: "fri", at: "2026-12-04T21:30:00-08:00" },
  { label: "sat", at: "2026-12-05T06:15:00-08:00" },
  { label: "sun", at: "2026-12-06T23:40:00-08:00" },
  // 01:57 PST on the night the US clocks go from 02:00 to 03:00: the change comes a few minutes into
  // the run, and the seed's relative dates (days and months back, the week ahead) straddle it.
  { label: "dst", at: "2027-03-14T01:57:00-08:00" },
];

const LIBS = ["/usr/lib/x86_64-linux-gnu/faketime/libfaketime.so.1", "/usr/lib/aarch64-linux-gnu/faketime/libfaketime.so.1", "/usr/lib/faketime/libfaketime.so.1"];

function parseArgs(argv) {
  const sep = argv.indexOf("--");
  const own = sep === -1 ? argv : argv.slice(0, sep);
  const playwrightArgs = sep === -1 ? [] : argv.slice(sep + 1);
  const only = own.find((a) => a.startsWith("--only="))?.slice("--only=".length).split(",").filter(Boolean);
  const unknown = only?.filter((l) => !RUNS.some((r) => r.label === l)) ?? [];
  if (unknown.length) throw new Error(`No run called ${unknown.join(", ")}; choose from ${RUNS.map((r) => r.label).join(", ")}.`);
  return { runs: only ? RUNS.filter((r) => only.includes(r.label)) : RUNS, playwrightArgs };
}

/** The environment that shifts every child process's clock so it reads `at` now and ticks on. */
function shiftedEnv(lib, at) {
  const seconds = Math.round((Date.parse(at) - Date.now()) / 1000);
  return {
    ...process.env,
    LD_PRELOAD: [lib, process.env.LD_PRELOAD].filter(Boolean).join(" "),
    FAKETIME: `${seconds >= 0 ? "+" : ""}${seconds}`,
    // Timers and timeouts keep the real monotonic clock; only the wall clock moves.
    FAKETIME_DONT_FAKE_MONOTONIC: "1",
    // Chromium stays off libfaketime; playwright.config.ts gives each browser context the runner's
    // shifted time through Playwright's clock API instead.
    E2E_SHIFTED_CLOCK: "1",
  };
}

/** Checks that a Node process under `env` reads `at` (within a minute). */
function checkClock(env, at) {
  const node = spawnSync(process.execPath, ["-e", "process.stdout.write(String(Date.now()))"], { env, encoding: "utf8" });
  const ms = Number(node.stdout);
  if (!Number.isFinite(ms) || Math.abs(ms - Date.parse(at)) > 60_000) throw new Error(`Node under libfaketime reads ${Number.isFinite(ms) ? new Date(ms).toISOString() : "nothing"}, not ${at}.`);
}

const local = (ms) => new Intl.DateTimeFormat("en-CA", { timeZone: ZONE, weekday: "short", year: "numeric", month: "2-digit", day: "2-digit", hour: "2-digit", minute: "2-digit", hourCycle: "h23", timeZoneName: "short" }).format(new Date(ms));

/** Failed tests in a Playwright JSON report: "file:line title — first line of the error". */
function failures(report) {
  const out = [];
  const walk = (suite) => {
    for (const spec of suite.specs ?? []) {
      for (const t of spec.tests ?? []) {
        if (t.status === "unexpected" || t.status === "flaky") {
          const err = (t.results ?? []).map((r) => r.error?.message).find(Boolean) ?? "";
          const line = err.replace(/\u001b\[[0-9;]*m/g, "").split("\n").find((l) => l.trim()) ?? "(no message)";
          out.push(`${t.status === "flaky" ? "flaky " : ""}${spec.file}:${spec.line} ${spec.title} — ${line.trim()}`);
        }
      }
    }
    for (const s of suite.suites ?? []) walk(s);
  };
  for (const s of report.suites ?? []) walk(s);
  return out;
}

/** When the seed ran, as the e2e database recorded it (the demo studio's created_at). */
function seededAt() {
  const db = new Database(path.join(root, "tests/.tmp/e2e.db"), { readonly: true, fileMustExist: true });
  try {
    return db.prepare("SELECT created_at AS at FROM studios WHERE slug = 'larchmere'").get()?.at ?? null;
  } finally {
    db.close();
  }
}

function runOnce(run, lib, playwrightArgs) {
  const env = shiftedEnv(lib, run.at);
  checkClock(env, run.at);
  const json = path.join(outDir, `${run.label}.json`);
  const log = path.join(outDir, `${run.label}.log`);
  fs.rmSync(json, { force: true });
  const logStream = fs.openSync(log, "w");
  console.log(`▸ ${run.label}: clocks at ${local(Date.parse(run.at))} (${new Date(run.at).toISOString()}) …`);
  const started = Date.now();
  return new Promise((resolve) => {
    const child = spawn(path.join(root, "node_modules/.bin/playwright"), ["test", ...playwrightArgs], {
      cwd: root,
      env: { ...env, PLAYWRIGHT_JSON_OUTPUT_NAME: json, FORCE_COLOR: "0" },
      stdio: ["ignore", logStream, logStream],
    });
    child.on("exit", (code) => {
      fs.closeSync(logStream);
      const report = fs.existsSync(json) ? JSON.parse(fs.readFileSync(json, "utf8")) : null;
      const stats = report?.stats ?? {};
      let seed = null;
      try {
        seed = seededAt();
      } catch {
        // no database: the server never started (see the log)
      }
      resolve({
        ...run,
        code,
        passed: stats.expected ?? 0,
        failed: stats.unexpected ?? (report ? 0 : NaN),
        flaky: stats.flaky ?? 0,
        skipped: stats.skipped ?? 0,
        seconds: Math.round((stats.duration ?? Date.now() - started) / 1000),
        seededAt: seed,
        failures: report ? failures(report) : [`no report; see ${path.relative(root, log)}`],
      });
    });
  });
}

async function main() {
  const { runs, playwrightArgs } = parseArgs(process.argv.slice(2));
  const lib = process.env.FAKETIME_LIB ?? LIBS.find((l) => fs.existsSync(l));
  if (!lib) throw new Error("libfaketime not found: install the Debian package `faketime` (or set FAKETIME_LIB).");
  if (!fs.existsSync(path.join(root, ".next/BUILD_ID"))) throw new Error("No production build: run `npm run build` first.");
  fs.mkdirSync(outDir, { recursive: true });
  const results = [];
  for (const run of runs) {
    const r = await runOnce(run, lib, playwrightArgs);
    results.push(r);
    const seed = r.seededAt ? `seeded ${new Date(r.seededAt).toISOString()}` : "no seed recorded";
    console.log(`  ${r.failed === 0 && r.code === 0 ? "passed" : "FAILED"}: ${r.passed} passed, ${r.failed} failed, ${r.flaky} flaky, ${r.skipped} skipped in ${r.seconds} s (${seed})`);
    for (const f of r.failures) console.log(`    ✗ ${f}`);
  }
  const table = [
    "| run | clock at start (studio zone) | passed | failed | flaky | skipped | duration |",
    "|---|---|---|---|---|---|---|",
    ...results.map((r) => `| ${r.label} | ${local(Date.parse(r.at))} | ${r.passed} | ${r.failed} | ${r.flaky} | ${r.skipped} | ${Math.floor(r.seconds / 60)} min ${r.seconds % 60} s |`),
  ].join("\n");
  fs.writeFileSync(path.join(outDir, `summary-${runs.map((r) => r.label).join("-")}.md`), `${table}\n\n${results.flatMap((r) => r.failures.map((f) => `- ${r.label}: ${f}`)).join("\n")}\n`);
  console.log(`\n${table}`);
  process.exit(results.every((r) => r.code === 0 && r.failed === 0) ? 0 : 1);
}

main().catch((e) => {
  console.error(e instanceof Error ? e.message : e);
  process.exit(1);
});
