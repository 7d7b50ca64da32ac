import { defineConfig } from "@playwright/test";
import { E2E_APP_URL, E2E_EMPTY_DATABASE } from "./scripts/e2e-config.mjs";
import { shiftBrowserClocks, withoutFaketime } from "./tests/support/browser-clock";

// Set by scripts/e2e-week.mjs, which runs this suite under libfaketime: Chromium is kept off it and its
// contexts get the shifted time from Playwright's clock API instead (tests/support/browser-clock.ts).
const shiftedClock = process.env.E2E_SHIFTED_CLOCK === "1";
if (shiftedClock) shiftBrowserClocks();

// End-to-end tests in Debian's Chromium (never a downloaded browser) against a production build.
export default defineConfig({
  testDir: "tests/e2e",
  fullyParallel: false,
  workers: 1,
  retries: 0,
  // Per test; generous because npm test runs Vitest beside this run on a 2-core machine (speed targets live in `npm run bench`).
  timeout: 90_000,
  expect: { timeout: 10_000 },
  reporter: [["list"], ["json", { outputFile: process.env.PLAYWRIGHT_JSON_OUTPUT_NAME ?? "test-results/results.json" }]],
  // The empty-install run keeps its traces apart: it may run beside the seeded one (scripts/test.mjs),
  // and each run empties its output folder when it starts.
  outputDir: E2E_EMPTY_DATABASE ? "tests/.tmp/test-results-empty-install" : "test-results",
  use: {
    baseURL: E2E_APP_URL,
    trace: "retain-on-failure",
    screenshot: "only-on-failure",
    // Toasts appear and fade without animation (sonner honours prefers-reduced-motion): an accessibility
    // check that ran while one was half faded measured its text's contrast at half opacity and failed.
    contextOptions: { reducedMotion: "reduce" },
    launchOptions: {
      executablePath: "/usr/bin/chromium",
      args: ["--no-sandbox", "--disable-gpu", "--disable-background-networking", "--disable-component-update", "--disable-sync", "--no-first-run", "--disable-quic"],
      ...(shiftedClock ? { env: withoutFaketime(process.env) } : {}),
    },
  },
  projects: [{ name: "chromium", use: { browserName: "chromium" } }],
  webServer: {
    command: "node scripts/e2e-server.mjs",
    url: `${E2E_APP_URL}/api/health`,
    reuseExistingServer: false,
    timeout: 120_000,
    stdout: "pipe",
    stderr: "pipe",
  },
});
