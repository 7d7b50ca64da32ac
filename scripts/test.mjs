// `npm test`: every test. Unit, reference and integration tests (Vitest, real SQLite file, real SMTP
// sink), then a production build unless one is already fresh, then the end-to-end tests (Playwright
// in Debian's Chromium). Each runner prints its own summary.
import { spawnSync } from "node:child_process";
import fs from "node:fs";
import path from "node:path";
import { root } from "./services.mjs";

const run = (label, cmd, args, env = process.env) => {
  console.log(`\n▸ ${label}`);
  const r = spawnSync(path.join(root, "node_modules", ".bin", cmd), args, { cwd: root, stdio: "inherit", env });
  return r.status ?? 1;
};

if (!fs.existsSync("/usr/bin/chromium")) {
  console.error("Chromium is missing: install Debian's package (apt-get install -y chromium); .ci/run does this.");
  process.exit(1);
}

let failed = 0;
const tmp = path.join(root, "tests", ".tmp");
fs.mkdirSync(tmp, { recursive: true });
const vitestJson = path.join(tmp, "vitest-results.json");
const playwrightJson = path.join(tmp, "playwright-results.json");
for (const f of [vitestJson, playwrightJson]) fs.rmSync(f, { force: true });

failed ||= run("Unit, reference and integration tests (Vitest)", "vitest", ["run", "--reporter=default", "--reporter=json", `--outputFile.json=${vitestJson}`]);

// A build made by .ci/run (or by hand) moments ago is reused when no source is newer than it.
const buildId = path.join(root, ".next", "BUILD_ID");
const built = fs.existsSync(buildId) && process.env.GRAINWARD_BUILD_FRESH === "1";
if (!built) failed ||= run("Production build for the end-to-end tests", "next", ["build"], { ...process.env, NEXT_TELEMETRY_DISABLED: "1" });
failed = run("End-to-end tests (Playwright, Chromium)", "playwright", ["test"], { ...process.env, PLAYWRIGHT_JSON_OUTPUT_NAME: playwrightJson }) || failed;
// Then a server on an empty database (no seed, sign-up closed): a stranger starts the first studio and
// walks every studio page empty and populated (tests/e2e/studio-setup.spec.ts, which the seeded run skips).
const emptyInstallJson = path.join(tmp, "playwright-empty-install.json");
fs.rmSync(emptyInstallJson, { force: true });
failed =
  run("End-to-end from an empty install (Playwright, Chromium)", "playwright", ["test", "tests/e2e/studio-setup.spec.ts"], { ...process.env, E2E_EMPTY_DATABASE: "1", PLAYWRIGHT_JSON_OUTPUT_NAME: emptyInstallJson }) || failed;

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
