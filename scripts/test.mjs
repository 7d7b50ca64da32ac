// `npm test`: every test. Unit, reference and integration tests (Vitest, real SQLite file, real SMTP
// sink), a production build unless one is already fresh, the end-to-end tests (Playwright in Debian's
// Chromium) on a seeded database, and again from an empty install. Each runner prints its own summary.
//
// Two lanes run at once, since the seeded browser run (one worker: mostly waiting on the server and
// the browser) is the long pole and leaves a core idle:
//   lane 1  [build] → Playwright on the seeded database (fixed ports; its output streams live)
//   lane 2  Vitest on all cores but one → Playwright from an empty install (its own ports and
//           database file: scripts/e2e-config.mjs); its output is printed when the lane ends.
// GRAINWARD_TEST_SERIAL=1 runs the same steps one after another, all output live.
import { spawn } from "node:child_process";
import fs from "node:fs";
import os from "node:os";
import path from "node:path";
import { root } from "./services.mjs";

const serial = process.env.GRAINWARD_TEST_SERIAL === "1";

/** Runs a local binary; resolves to its exit status. `log`: a file to write its output to instead of the terminal. */
const run = (label, cmd, args, env = process.env, log) =>
  new Promise((resolve) => {
    const out = log ? fs.openSync(log, "a") : "inherit";
    if (log) fs.appendFileSync(log, `\n▸ ${label}\n`);
    else console.log(`\n▸ ${label}`);
    const started = Date.now();
    const child = spawn(path.join(root, "node_modules", ".bin", cmd), args, { cwd: root, env, stdio: ["ignore", out, out] });
    child.on("error", (e) => {
      console.error(`${label}: ${e.message}`);
      resolve(1);
    });
    child.on("close", (code, signal) => {
      if (log) fs.closeSync(out);
      console.log(`▸ ${label}: ${code === 0 ? "done" : `failed (exit ${code ?? signal})`} in ${Math.round((Date.now() - started) / 1000)} s`);
      resolve(code ?? 1);
    });
  });

if (!fs.existsSync("/usr/bin/chromium")) {
  console.error("Chromium is missing: install Debian's package (apt-get install -y chromium); .ci/run does this.");
  process.exit(1);
}

const tmp = path.join(root, "tests", ".tmp");
fs.mkdirSync(tmp, { recursive: true });
const vitestJson = path.join(tmp, "vitest-results.json");
const playwrightJson = path.join(tmp, "playwright-results.json");
const emptyInstallJson = path.join(tmp, "playwright-empty-install.json");
const laneLog = path.join(tmp, "test-lane-2.log");
for (const f of [vitestJson, playwrightJson, emptyInstallJson, laneLog]) fs.rmSync(f, { force: true });

// Beside the browser run Vitest leaves it one core; alone it takes them all (its default).
const vitestArgs = ["run", "--reporter=default", "--reporter=json", `--outputFile.json=${vitestJson}`];
if (!serial) vitestArgs.push(`--maxWorkers=${Math.max(1, os.availableParallelism() - 1)}`);
// The empty-install run's ports: ten above the seeded run's base when one is set, else 3200–3204.
const seededBase = process.env.E2E_PORT_BASE ? Number(process.env.E2E_PORT_BASE) : undefined;
const emptyBase = String(process.env.E2E_EMPTY_PORT_BASE ?? (seededBase === undefined ? 3200 : seededBase + 10));

// A build made by .ci/run (or by hand) moments ago is reused when no source is newer than it.
const buildId = path.join(root, ".next", "BUILD_ID");
const built = fs.existsSync(buildId) && process.env.GRAINWARD_BUILD_FRESH === "1";
const build = () => (built ? Promise.resolve(0) : run("Production build for the end-to-end tests", "next", ["build"], { ...process.env, NEXT_TELEMETRY_DISABLED: "1" }));
const vitest = () => run("Unit, reference and integration tests (Vitest)", "vitest", vitestArgs, process.env, serial ? undefined : laneLog);
const seeded = () => run("End-to-end tests (Playwright, Chromium)", "playwright", ["test"], { ...process.env, PLAYWRIGHT_JSON_OUTPUT_NAME: playwrightJson });
// A server on an empty database (no seed, sign-up closed): a stranger starts the first studio and walks
// every studio page empty and populated (tests/e2e/studio-setup.spec.ts, which the seeded run skips).
const emptyInstall = () =>
  run(
    "End-to-end from an empty install (Playwright, Chromium)",
    "playwright",
    ["test", "tests/e2e/studio-setup.spec.ts"],
    { ...process.env, E2E_EMPTY_DATABASE: "1", E2E_PORT_BASE: emptyBase, PLAYWRIGHT_JSON_OUTPUT_NAME: emptyInstallJson },
    serial ? undefined : laneLog,
  );

let failed = 0;
if (serial) {
  failed ||= await vitest();
  failed ||= await build();
  failed = (await seeded()) || failed;
  failed = (await emptyInstall()) || failed;
} else {
  const building = build();
  const lane1 = building.then((b) => (b ? b : seeded()));
  const lane2 = (async () => {
    const v = await vitest();
    const e = (await building) === 0 ? await emptyInstall() : 1;
    console.log(`\n━━━ Vitest and the empty-install run (${path.relative(root, laneLog)}) ━━━`);
    process.stdout.write(fs.readFileSync(laneLog, "utf8"));
    return v || e;
  })();
  const [a, b] = await Promise.all([lane1, lane2]);
  failed = a || b;
}

// One closing line over both runners (the two Playwright runs counted together).
const read = (f) => (fs.existsSync(f) ? JSON.parse(fs.readFileSync(f, "utf8")) : null);
const v = read(vitestJson);
const p = read(playwrightJson);
const e = read(emptyInstallJson);
// The empty-install run's one test counts with the seeded run's (where the same test is skipped).
if (p && e) for (const k of ["expected", "unexpected", "flaky"]) p.stats[k] = (p.stats[k] ?? 0) + (e.stats?.[k] ?? 0);
if (p && e && e.stats?.expected) p.stats.skipped = Math.max(0, (p.stats.skipped ?? 0) - e.stats.expected);
const passed = (v?.numPassedTests ?? 0) + (p?.stats?.expected ?? 0) + (p?.stats?.flaky ?? 0);
const failedCount = (v?.numFailedTests ?? 0) + (p?.stats?.unexpected ?? 0);
const skipped = (v?.numPendingTests ?? 0) + (v?.numTodoTests ?? 0) + (p?.stats?.skipped ?? 0);
console.log(`\nVitest: ${v?.numPassedTests ?? 0} passed, ${v?.numFailedTests ?? 0} failed; Playwright: ${p?.stats?.expected ?? 0} passed, ${p?.stats?.unexpected ?? 0} failed`);
console.log(`${passed} passed, ${failedCount} failed, ${skipped} skipped`);
if (!v || !p || !e) console.error("A runner wrote no results (see above).");
process.exit(failed || !v || !p || !e || failedCount > 0 ? 1 : 0);
