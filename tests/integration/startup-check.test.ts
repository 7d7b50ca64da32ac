// The start-up check (lib/startup-check.ts, run by instrumentation.ts) in a child process, as the
// server runs it: off localhost, the demo's secrets and the local Stripe fake stop the start with a
// line per setting saying what to set; on localhost (the demo, the tests) they are fine.
import { spawnSync } from "node:child_process";
import path from "node:path";
import { describe, expect, it } from "vitest";

const root = path.resolve(import.meta.dirname, "../..");

function start(extra: Record<string, string>) {
  const env: NodeJS.ProcessEnv = {
    PATH: process.env.PATH ?? "",
    HOME: process.env.HOME ?? "",
    NODE_ENV: "production",
    DATABASE_URL: process.env.DATABASE_URL!,
    DATA_DIR: process.env.DATA_DIR!,
    ...extra,
  };
  const r = spawnSync(path.join(root, "node_modules/.bin/tsx"), ["-e", 'import("./lib/startup-check.ts").then((m) => m.checkStartup()).then(() => console.log("started"))'], { cwd: root, env, encoding: "utf8", timeout: 60_000 });
  return { code: r.status, out: `${r.stdout}${r.stderr}` };
}

const REAL = {
  APP_SECRET: "invented-test-secret-9f8e7d6c5b4a39281706f5e4d3c2b1a0",
  STRIPE_SECRET_KEY: "sk_live_invented_for_a_test",
  STRIPE_WEBHOOK_SECRET: "whsec_invented_for_a_test",
  STRIPE_API_HOST: "",
};

describe("start-up check", () => {
  it("off localhost, refuses the demo secrets and the local Stripe fake, naming what to set", () => {
    const r = start({ APP_URL: "https://care.studio.example" });
    expect(r.code).toBe(1);
    expect(r.out).toMatch(/cannot start/);
    expect(r.out).toMatch(/APP_SECRET is the demo secret: set APP_SECRET/);
    expect(r.out).toMatch(/STRIPE_SECRET_KEY is the demo key: set it/);
    expect(r.out).toMatch(/STRIPE_WEBHOOK_SECRET is the demo secret/);
    expect(r.out).toMatch(/STRIPE_API_HOST points at the local Stripe fake \(127\.0\.0\.1\): set STRIPE_API_HOST to an empty value/);
    expect(r.out).not.toMatch(/started/);
  });

  it("refuses each one on its own", () => {
    for (const [key, value, words] of [
      ["APP_SECRET", "grainward-demo-secret-not-for-production-use", /APP_SECRET is the demo secret/],
      ["STRIPE_SECRET_KEY", "sk_test_grainward_demo", /STRIPE_SECRET_KEY is the demo key/],
      ["STRIPE_API_HOST", "localhost", /STRIPE_API_HOST points at the local Stripe fake \(localhost\)/],
      ["STRIPE_API_HOST", "127.0.0.1", /STRIPE_API_HOST points at the local Stripe fake/],
    ] as const) {
      const r = start({ APP_URL: "https://care.studio.example", ...REAL, [key]: value });
      expect(r.code, `${key}=${value}`).toBe(1);
      expect(r.out).toMatch(words);
      expect(r.out.match(/^ {2}\w+ /gm)).toHaveLength(1);
    }
  });

  it("starts off localhost with real settings, and on localhost with the demo's", () => {
    const real = start({ APP_URL: "https://care.studio.example", ...REAL });
    expect(real.out).toMatch(/started/);
    expect(real.code).toBe(0);
    for (const url of ["http://localhost:3000", "http://127.0.0.1:3100", "http://[::1]:3000"]) {
      const demo = start({ APP_URL: url });
      expect(demo.out, url).toMatch(/started/);
    }
  });
});
