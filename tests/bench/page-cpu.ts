// Server CPU per request (user + system time of the `next start` process, from /proc), for GET /api/me and
// the owner's piece page; in a benchmark build (GRAINWARD_BENCH_BUILD=1 npx next build) also the blank page,
// signed out (app/bench/blank/page.bench.ts: what any page of the build costs before its content); plus any
// paths given as arguments (PIECE stands for the benched piece's id), requested as that piece's owner, or as
// the studio's staff member when prefixed `staff:`:
//   npx tsx tests/bench/page-cpu.ts /pieces/PIECE/log
// CLIENTS=20000 adds the clients seed of tests/bench/clients.bench.ts (tests/bench/seed-clients.ts) first:
//   CLIENTS=20000 npx tsx tests/bench/page-cpu.ts staff:/api/clients?q=Thornwick staff:/api/clients?q=burl
// Needs a production build in .next (`npx next build`). Requests go one at a time, without compression (as
// autocannon sends them), in alternating rounds so that every path sees the same load from the rest of the
// machine; each round's figure is printed, and the lowest (the least disturbed) and the median. On a shared
// machine compare paths of the same run only. Not a *.bench.ts file: `npm run bench` does not run it.
import fs from "node:fs";
import os from "node:os";
import path from "node:path";
import Database from "better-sqlite3";
import { seedClients } from "./seed-clients";
import { seededCopy, sessionCookie, startServer } from "./server-harness";

const TICK_MS = 10; // /proc/<pid>/stat counts CPU time in clock ticks of 1/100 s
const N = Number(process.env.N ?? 200);
const ROUNDS = Number(process.env.ROUNDS ?? 5);
const CLIENTS = Number(process.env.CLIENTS ?? 0);

function cpuMs(pid: number): number {
  const fields = fs.readFileSync(`/proc/${pid}/stat`, "utf8").split(") ")[1]!.split(" ");
  return (Number(fields[11]) + Number(fields[12])) * TICK_MS;
}

const dir = fs.mkdtempSync(path.join(os.tmpdir(), "gw-page-cpu-"));
const { dbFile, seeded } = seededCopy(dir);
const db = new Database(dbFile);
// The same piece as server.bench.ts benches.
const piece = db
  .prepare("SELECT p.id, p.owner_id AS ownerId FROM pieces p WHERE p.owner_id IS NOT NULL AND p.studio_id = ? ORDER BY p.rowid LIMIT 1 OFFSET ?")
  .get(seeded.studioId, Math.floor(seeded.pieces / 40)) as { id: string; ownerId: string };
db.close();
if (CLIENTS) seedClients(dbFile, seeded.studioId, seeded.staffUserId, CLIENTS);
const staff = sessionCookie(dbFile, seeded.staffUserId);
const owner = sessionCookie(dbFile, piece.ownerId);
const server = await startServer(dbFile, dir);
const blank = await fetch(`${server.base}/bench/blank`).then((r) => r.status === 200, () => false);
const paths: [string, string][] = [
  ["/api/me", staff],
  [`/pieces/${piece.id}`, owner],
  ...(blank ? ([["/bench/blank", ""]] as [string, string][]) : []),
  ...process.argv.slice(2).map((p): [string, string] => (p.startsWith("staff:") ? [p.slice("staff:".length), staff] : [p.replace("PIECE", piece.id), owner])),
];

async function run(url: string, cookie: string, n: number): Promise<void> {
  for (let i = 0; i < n; i++) {
    const res = await fetch(server.base + url, { headers: { ...(cookie ? { cookie } : {}), "accept-encoding": "identity" }, redirect: "manual" });
    await res.arrayBuffer();
    if (i === 0 && res.status !== 200) console.log(`${url} answered ${res.status}`);
  }
}

try {
  for (const [url, cookie] of paths) await run(url, cookie, N); // the JIT settles
  const perRound = new Map<string, number[]>();
  for (let round = 0; round < ROUNDS; round++) {
    for (const [url, cookie] of paths) {
      const before = cpuMs(server.pid);
      await run(url, cookie, N);
      perRound.set(url, [...(perRound.get(url) ?? []), (cpuMs(server.pid) - before) / N]);
    }
  }
  const median = (xs: number[]) => [...xs].sort((a, b) => a - b)[Math.floor((xs.length - 1) / 2)]!;
  for (const [url, ms] of perRound) console.log(`${url.padEnd(52)} ${ms.map((x) => x.toFixed(2)).join("  ")}   lowest ${Math.min(...ms).toFixed(2)}, median ${median(ms).toFixed(2)} ms CPU a request`);
} finally {
  await server.stop();
  fs.rmSync(dir, { recursive: true, force: true });
}
