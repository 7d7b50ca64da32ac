// What the server benchmarks share: one seeded copy of the 100,000-piece registry (seeded once, then
// copied for each benchmark), a production build (built once unless BENCH_SKIP_BUILD is set — `npm run
// bench` builds first and sets it), the server started as package.json's `start` script starts it (on a
// free port, with its own database), signed-in sessions for a staff member and an owner, autocannon runs
// with exact percentiles, and the server's memory once idle and its high-water mark. Holds
// /tmp/gw-e2e.lock (the shared .next directory) for the build and runs.
import { spawn, spawnSync, type ChildProcess } from "node:child_process";
import { createHash, randomBytes } from "node:crypto";
import fs from "node:fs";
import net from "node:net";
import path from "node:path";
import { fileURLToPath } from "node:url";
import autocannon from "autocannon";
import Database from "better-sqlite3";
import { openDatabase } from "../../db/client";
import { applyMigrations } from "../../db/migrate";
import { mergeSearchIndexesAtOnce } from "../../db/search-indexes";
import { keptSeed } from "./seed-cache";
import { seedRegistry } from "./seed-registry";
import { startCommand } from "../../scripts/start-command.mjs";

export const root = path.resolve(path.dirname(fileURLToPath(import.meta.url)), "../..");
export const bin = (n: string) => path.join(root, "node_modules", ".bin", n);
export const PIECES = Number(process.env.BENCH_PIECES ?? 100_000);

/** Re-runs the calling benchmark file, with its arguments, under the shared build lock (once; children inherit it). */
export function holdBuildLock(file: string): void {
  if (process.env.GW_BENCH_LOCKED) return;
  const r = spawnSync("flock", ["/tmp/gw-e2e.lock", bin("tsx"), file, ...process.argv.slice(2)], { cwd: root, stdio: "inherit", env: { ...process.env, GW_BENCH_LOCKED: "1" } });
  process.exit(r.status ?? 1);
}

export function buildOnce(): void {
  if (process.env.BENCH_SKIP_BUILD) return;
  const t = performance.now();
  // GRAINWARD_BENCH_BUILD adds the bench-only floor route (app/api/bench/same-json/route.bench.ts).
  const b = spawnSync(bin("next"), ["build"], { cwd: root, env: { ...process.env, NEXT_TELEMETRY_DISABLED: "1", NODE_ENV: "production", GRAINWARD_BENCH_BUILD: "1" }, stdio: ["ignore", "ignore", "inherit"] });
  if (b.status !== 0) throw new Error("next build failed");
  console.log(`built in ${((performance.now() - t) / 1000).toFixed(0)} s`);
}

export type Seeded = { studioId: string; staffUserId: string; pieces: number; owners: number };

/** A fresh copy of the seeded registry in `dir`; the seed itself is made once per migration set and size (tests/bench/seed-cache.ts). */
export function seededCopy(dir: string, size = PIECES): { dbFile: string; seeded: Seeded } {
  const t = performance.now();
  const migrate = (file: string) => {
    const db = openDatabase(file);
    applyMigrations(db);
    mergeSearchIndexesAtOnce(db.$client); // as the scheduler's nightly merge leaves them
    db.$client.pragma("wal_checkpoint(TRUNCATE)");
    db.$client.close();
  };
  const kept = keptSeed("bench-seed", size, (file) => seedRegistry(file, size), migrate);
  if (kept.how !== "kept") console.log(`${kept.how} the ${size.toLocaleString("en")}-piece seed (${kept.meta.owners} owners) in ${((performance.now() - t) / 1000).toFixed(1)} s`);
  const dbFile = path.join(dir, `bench-${size}.db`);
  fs.copyFileSync(kept.file, dbFile);
  return { dbFile, seeded: kept.meta };
}

/** A session row as lucia stores it (the id is the cookie token's SHA-256); returns the cookie header. */
export function sessionCookie(dbFile: string, userId: string): string {
  const token = randomBytes(20).toString("base64url");
  const db = new Database(dbFile);
  db.prepare("UPDATE users SET email_verified_at = coalesce(email_verified_at, ?) WHERE id = ?").run(Date.now(), userId);
  db.prepare("INSERT INTO sessions (id, user_id, expires_at) VALUES (?, ?, ?)").run(createHash("sha256").update(token).digest("hex"), userId, Math.floor(Date.now() / 1000) + 30 * 86400);
  db.close();
  return `gw_session=${token}`;
}

function freePort(): Promise<number> {
  return new Promise((resolve, reject) => {
    const s = net.createServer();
    s.on("error", reject);
    s.listen(0, "127.0.0.1", () => {
      const port = (s.address() as net.AddressInfo).port;
      s.close(() => (port === 3000 || port === 3100 ? freePort().then(resolve, reject) : resolve(port)));
    });
  });
}

export type Server = { base: string; pid: number; stop: () => Promise<void> };

export async function startServer(dbFile: string, dir: string, env: Record<string, string> = {}): Promise<Server> {
  const port = await freePort();
  const base = `http://127.0.0.1:${port}`;
  const start = startCommand();
  const child: ChildProcess = spawn(start.command, [...start.args, "-p", String(port), "-H", "127.0.0.1"], {
    cwd: root,
    env: { ...process.env, NODE_ENV: "production", NEXT_TELEMETRY_DISABLED: "1", DATABASE_URL: dbFile, DATA_DIR: dir, APP_URL: base, SMTP_PORT: "1", MAIL_SINK_URL: "http://127.0.0.1:1", ...env },
    stdio: ["ignore", "ignore", "inherit"],
  });
  for (let i = 0; ; i++) {
    if (await fetch(`${base}/api/health`).then((r) => r.ok, () => false)) break;
    if (i > 120) throw new Error("the server did not start");
    await new Promise((r) => setTimeout(r, 500));
  }
  return {
    base,
    pid: child.pid!,
    stop: async () => {
      child.kill("SIGTERM");
      await new Promise((r) => setTimeout(r, 500));
    },
  };
}

export function percentile(sorted: number[], p: number): number {
  return sorted[Math.min(sorted.length - 1, Math.ceil((p / 100) * sorted.length) - 1)] ?? NaN;
}

export type Load = { p50: number; p95: number; p99: number; requests: number; perSecond: number; bad: number };

/** autocannon for `seconds` after a 4 s warm-up (the JIT settles), with percentiles from every response's own latency. */
export async function load(url: string, opts: { connections: number; seconds: number; headers?: Record<string, string> }): Promise<Load> {
  await autocannon({ url, connections: opts.connections, duration: 4, headers: opts.headers });
  const lat: number[] = [];
  const inst = autocannon({ url, connections: opts.connections, duration: opts.seconds, headers: opts.headers });
  inst.on("response", (_c: unknown, _s: number, _b: number, ms: number) => lat.push(ms));
  const r = await inst;
  lat.sort((a, b) => a - b);
  return { p50: percentile(lat, 50), p95: percentile(lat, 95), p99: percentile(lat, 99), requests: lat.length, perSecond: lat.length / opts.seconds, bad: r.non2xx + r.errors + r.timeouts };
}

/**
 * A figure and its floor measured in alternating rounds (floor, figure, floor, figure, …), so that both
 * see the same load from the rest of the machine; the latencies of each side's rounds are pooled.
 */
export async function paired(
  floor: { url: string; headers?: Record<string, string> },
  figure: { url: string; headers?: Record<string, string> },
  opts: { connections: number; rounds: number; seconds: number },
): Promise<{ floor: Load; figure: Load }> {
  const side = () => ({ lat: [] as number[], bad: 0 });
  const f = side();
  const m = side();
  const run = async (t: { url: string; headers?: Record<string, string> }, into: ReturnType<typeof side>) => {
    const inst = autocannon({ url: t.url, connections: opts.connections, duration: opts.seconds, headers: t.headers });
    inst.on("response", (_c: unknown, _s: number, _b: number, ms: number) => into.lat.push(ms));
    const r = await inst;
    into.bad += r.non2xx + r.errors + r.timeouts;
  };
  for (let i = 0; i < opts.rounds; i++) {
    await run(floor, f);
    await run(figure, m);
  }
  const done = (x: ReturnType<typeof side>): Load => {
    x.lat.sort((a, b) => a - b);
    const secs = opts.rounds * opts.seconds;
    return { p50: percentile(x.lat, 50), p95: percentile(x.lat, 95), p99: percentile(x.lat, 99), requests: x.lat.length, perSecond: x.lat.length / secs, bad: x.bad };
  };
  return { floor: done(f), figure: done(m) };
}

export const fmt = (l: Load) => `p50 ${l.p50.toFixed(1)} ms, p95 ${l.p95.toFixed(1)} ms, p99 ${l.p99.toFixed(1)} ms, ${l.perSecond.toFixed(0)} req/s (${l.requests} requests, ${l.bad} non-2xx/errors)`;

/** Resident memory of a process and its descendants, in bytes (Linux /proc). */
function treeRss(pid: number): number {
  const children = new Map<number, number[]>();
  for (const d of fs.readdirSync("/proc")) {
    if (!/^\d+$/.test(d)) continue;
    try {
      const stat = fs.readFileSync(`/proc/${d}/stat`, "utf8");
      const ppid = Number(stat.slice(stat.lastIndexOf(")") + 2).split(" ")[1]);
      children.set(ppid, [...(children.get(ppid) ?? []), Number(d)]);
    } catch {
      // the process ended while we looked
    }
  }
  let total = 0;
  const stack = [pid];
  while (stack.length) {
    const p = stack.pop()!;
    try {
      const m = /VmRSS:\s+(\d+) kB/.exec(fs.readFileSync(`/proc/${p}/status`, "utf8"));
      total += m ? Number(m[1]) * 1024 : 0;
    } catch {
      // gone
    }
    stack.push(...(children.get(p) ?? []));
  }
  return total;
}

/**
 * The server's resident memory once it has finished starting, with no request in flight: `next start`
 * answers its first request while it is still loading every route's modules in the background (Next's
 * preloadEntriesOnStart), so on a busy machine memory read at the first answer can be tens of MB short
 * of what it settles at, and varies with timing. Samples every 500 ms until two readings a second apart
 * differ by under 1 MB (at most 20 s); returns the settled figure and the one at the first answer.
 */
export async function idleMemory(pid: number): Promise<{ settled: number; atFirstAnswer: number }> {
  const readings = [treeRss(pid)];
  for (let i = 0; i < 40; i++) {
    await new Promise((r) => setTimeout(r, 500));
    readings.push(treeRss(pid));
    if (readings.length >= 3 && Math.abs(readings.at(-1)! - readings.at(-3)!) < 2 ** 20) break;
  }
  return { settled: readings.at(-1)!, atFirstAnswer: readings[0]! };
}

/** Samples the server's resident memory every 100 ms until stopped; returns the peak. */
export function watchMemory(pid: number): { stop: () => number } {
  let peak = treeRss(pid);
  const timer = setInterval(() => (peak = Math.max(peak, treeRss(pid))), 100);
  return {
    stop: () => {
      clearInterval(timer);
      return Math.max(peak, treeRss(pid));
    },
  };
}

export function benchDir(name: string): string {
  const dir = path.join(root, "tests/.tmp", `bench-${name}-${process.pid}`);
  fs.rmSync(dir, { recursive: true, force: true });
  fs.mkdirSync(dir, { recursive: true });
  return dir;
}
