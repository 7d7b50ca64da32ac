// Every scheduler module loads under plain tsx, as `npm run jobs` and `npm run demo` start it: outside
// Next.js, with none of the test runner's environment (no VITEST, no NODE_OPTIONS). A module on the
// scheduler's path that imports "server-only" (a guard for browser bundles, which throws in a plain
// Node process) stopped the whole scheduler at start-up once; this catches the next one.
import { spawnSync } from "node:child_process";
import { readdirSync } from "node:fs";
import path from "node:path";
import { describe, expect, it } from "vitest";
import { ownDatabaseFile } from "./reminders-helpers";

const dbFile = ownDatabaseFile("jobs-load");
/** jobs/index.ts starts the schedule and run-once.ts a pass; the modules they import are loaded here. */
const modules = readdirSync("jobs").filter((f) => f.endsWith(".ts") && f !== "index.ts" && f !== "run-once.ts");

describe("the scheduler's modules under plain tsx", () => {
  it("finds the pass modules", () => {
    expect(modules).toEqual(expect.arrayContaining(["plan-visits.ts", "reminders.ts", "visit-reminders.ts"]));
  });

  it.each(modules)("jobs/%s loads with a clean environment", (file) => {
    const r = spawnSync(path.resolve("node_modules/.bin/tsx"), ["--eval", `import("./jobs/${file}").then(() => console.log("loaded"))`], {
      cwd: path.resolve("."),
      env: { PATH: process.env.PATH ?? "", HOME: process.env.HOME ?? "", DATABASE_URL: dbFile, NODE_ENV: "production" },
      encoding: "utf8",
      timeout: 60_000,
    });
    expect(r.stderr).not.toContain("server-only");
    expect(r.stdout.trim()).toBe("loaded");
    expect(r.status).toBe(0);
  });
});
