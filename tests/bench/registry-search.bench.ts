// GET /api/pieces?q=<word> on a production build over 100,000 synthetic pieces, 16 concurrent
// connections (autocannon). Target (issue 4): p95 under 50 ms. Prints p50/p95/p99, requests, and the
// rows in the registry and matched by each word.
//
// Builds the app (`next build`) and starts its own `next start` on a free port with its own database,
// holding /tmp/gw-e2e.lock for the build and the run (the shared .next directory). Standalone:
//   npx tsx tests/bench/registry-search.bench.ts        (BENCH_SKIP_BUILD=1 reuses .next)
import { spawn, spawnSync } from "node:child_process";
import { createHash, randomBytes } from "node:crypto";
import fs from "node:fs";
import net from "node:net";
import path from "node:path";
import { fileURLToPath } from "node:url";
import autocannon from "autocannon";
import Database from "better-sqlite3";
import { seedRegistry } from "./seed-registry";

const TARGET_P95_MS = 50;
const PIECES = Number(process.env.BENCH_PIECES ?? 100_000);
const CONNECTIONS = 16;
const DURATION_S = 10;
// A species word (about 1 in 20 pieces), a title word (1 in 12), and an owner surname (rare).
const WORDS = ["walnut", "burl", "Thornwood"];

const root = path.resolve(path.dirname(fileURLToPath(import.meta.url)), "../..");
const bin = (n: string) => path.join(root, "node_modules", ".bin", n);

if (!process.env.GW_BENCH_LOCKED) {
  // Re-run this file holding the shared build/e2e lock.
  const r = spawnSync("flock", ["/tmp/gw-e2e.lock", bin("tsx"), fileURLToPath(import.meta.url)], { cwd: root, stdio: "inherit", env: { ...process.env, GW_BENCH_LOCKED: "1" } });
  process.exit(r.status ?? 1);
}

function freePort(): Promise<number> {
  return new Promise((resolve, reject) => {
    const s = net.createServer();
    s.listen(0, "127.0.0.1", () => {
      const port = (s.address() as net.AddressInfo).port;
      s.close(() => (port === 3000 || port === 3100 ? freePort().then(resolve, reject) : resolve(port)));
    });
  });
}

function percentile(sorted: number[], p: number): number {
  return sorted[Math.min(sorted.length - 1, Math.ceil((p / 100) * sorted.length) - 1)]!;
}

async function main() {
  const dir = path.join(root, "tests/.tmp", `bench-registry-${process.pid}`);
  fs.rmSync(dir, { recursive: true, force: true });
  fs.mkdirSync(dir, { recursive: true });
  const dbFile = path.join(dir, "bench.db");
  let server: ReturnType<typeof spawn> | undefined;
  try {
    let t = performance.now();
    const seeded = seedRegistry(dbFile, PIECES);
    console.log(`seeded ${seeded.pieces.toLocaleString("en")} pieces (${seeded.owners} owners) in ${((performance.now() - t) / 1000).toFixed(1)} s`);

    // A session for the studio's staff member, as lucia stores it: the row id is the token's SHA-256.
    const token = randomBytes(20).toString("base64url");
    const db = new Database(dbFile);
    db.prepare("INSERT INTO sessions (id, user_id, expires_at) VALUES (?, ?, ?)").run(createHash("sha256").update(token).digest("hex"), seeded.staffUserId, Math.floor(Date.now() / 1000) + 30 * 86400);
    const matched = Object.fromEntries(
      WORDS.map((w) => [w, (db.prepare("SELECT count(*) AS n FROM pieces_fts WHERE pieces_fts MATCH ?").get(`"${w}"*`) as { n: number }).n]),
    );
    db.close();

    if (!process.env.BENCH_SKIP_BUILD) {
      t = performance.now();
      const b = spawnSync(bin("next"), ["build"], { cwd: root, env: { ...process.env, NEXT_TELEMETRY_DISABLED: "1", NODE_ENV: "production" }, stdio: ["ignore", "ignore", "inherit"] });
      if (b.status !== 0) throw new Error("next build failed");
      console.log(`built in ${((performance.now() - t) / 1000).toFixed(0)} s`);
    }
    const port = await freePort();
    const base = `http://127.0.0.1:${port}`;
    server = spawn(bin("next"), ["start", "-p", String(port), "-H", "127.0.0.1"], {
      cwd: root,
      env: { ...process.env, NODE_ENV: "production", NEXT_TELEMETRY_DISABLED: "1", DATABASE_URL: dbFile, DATA_DIR: dir, APP_URL: base, SMTP_PORT: "1", MAIL_SINK_URL: "http://127.0.0.1:1" },
      stdio: ["ignore", "ignore", "inherit"],
    });
    for (let i = 0; ; i++) {
      const ok = await fetch(`${base}/api/health`).then((r) => r.ok, () => false);
      if (ok) break;
      if (i > 120) throw new Error("the server did not start");
      await new Promise((r) => setTimeout(r, 500));
    }
    const headers = { cookie: `gw_session=${token}` };
    const probe = await fetch(`${base}/api/pieces?q=walnut`, { headers });
    if (!probe.ok) throw new Error(`GET /api/pieces answered ${probe.status}: ${await probe.text()}`);
    const total = ((await probe.json()) as { total: number }).total;
    console.log(`GET /api/pieces?q=walnut → ${total.toLocaleString("en")} matches`);

    // The floor on this machine: a route that only checks the session (no registry query).
    {
      const lat: number[] = [];
      const inst = autocannon({ url: `${base}/api/me`, connections: CONNECTIONS, duration: 3, headers });
      inst.on("response", (_c: unknown, _s: number, _b: number, ms: number) => lat.push(ms));
      await inst;
      lat.sort((a, b) => a - b);
      console.log(`baseline GET /api/me (session check only): p50 ${percentile(lat, 50).toFixed(1)} ms, p95 ${percentile(lat, 95).toFixed(1)} ms, ${(lat.length / 3).toFixed(0)} req/s`);
    }

    let failed = false;
    for (const word of WORDS) {
      const url = `${base}/api/pieces?q=${encodeURIComponent(word)}`;
      await autocannon({ url, connections: CONNECTIONS, duration: 2, headers }); // warm-up, not judged
      const latencies: number[] = [];
      const inst = autocannon({ url, connections: CONNECTIONS, duration: DURATION_S, headers });
      inst.on("response", (_c: unknown, _status: number, _bytes: number, ms: number) => latencies.push(ms));
      const result = await inst;
      latencies.sort((a, b) => a - b);
      const p95 = percentile(latencies, 95);
      const bad = result.non2xx + result.errors + result.timeouts;
      const ok = p95 < TARGET_P95_MS && bad === 0;
      failed ||= !ok;
      console.log(
        `${ok ? "✓" : "✗"} q=${word}: p50 ${percentile(latencies, 50).toFixed(1)} ms, p95 ${p95.toFixed(1)} ms, p99 ${percentile(latencies, 99).toFixed(1)} ms ` +
          `(${latencies.length} requests, ${(latencies.length / DURATION_S).toFixed(0)} req/s, ${CONNECTIONS} connections, ${bad} non-2xx/errors); ` +
          `${PIECES.toLocaleString("en")} rows, ${matched[word]!.toLocaleString("en")} matching — target p95 < ${TARGET_P95_MS} ms`,
      );
    }
    if (failed) process.exitCode = 1;
  } finally {
    server?.kill("SIGTERM");
    await new Promise((r) => setTimeout(r, 500));
    fs.rmSync(dir, { recursive: true, force: true });
  }
}

await main();
