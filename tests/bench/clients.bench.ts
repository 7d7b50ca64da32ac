// The studio's clients over the bench registry (100,000 synthetic pieces) with 20,000 synthetic clients
// (tests/bench/seed-clients.ts), production server, autocannon at 16 concurrent connections:
//   - clients list search, GET /api/clients?q=<word>: p95 < 50 ms, for a surname (a few hundred
//     clients), a word of piece titles (thousands of clients through their pieces) and phone digits;
//   - a client's timeline, GET /api/clients/[id]/timeline: p95 < 100 ms, for a client with an account,
//     registered pieces, care logged and record changes.
// The targets are the ones the clients work set itself (our choice). Each figure is measured in
// alternating rounds with its floor: the bench-only bare route (app/api/bench/same-json/route.bench.ts)
// serving a JSON body of the same size, with no session check and no query; the verdict is the
// absolute p95 against the target, and the ratio to the floor is reported beside it.
// Standalone: npx tsx tests/bench/clients.bench.ts   (BENCH_SKIP_BUILD=1 reuses .next)
import fs from "node:fs";
import path from "node:path";
import { fileURLToPath } from "node:url";
import { result } from "./result";
import { seedClients } from "./seed-clients";
import { benchDir, buildOnce, fmt, holdBuildLock, load, paired, PIECES, seededCopy, sessionCookie, startServer } from "./server-harness";

holdBuildLock(fileURLToPath(import.meta.url));

const CONNECTIONS = 16;
const CLIENTS = 20_000;
const ROUNDS = 3;
const SECONDS = 4;
const LIST_P95_MS = 50;
const TIMELINE_P95_MS = 100;
// A surname stem of the registry's owners, a word in 1 of 12 piece titles, and phone digits.
const SEARCHES = ["Thornwick", "burl", "5550147"];

/** One figure against its own floor: a server whose bare route serves this figure's JSON (it reads its file once). */
async function measure(dbFile: string, dir: string, cookie: string, f: { label: string; path: string; target: number }) {
  const bareJson = path.join(dir, `same-${f.label.replace(/\W+/g, "-")}.json`);
  const server = await startServer(dbFile, dir, { GRAINWARD_BENCH_JSON: bareJson });
  try {
    const probe = await fetch(`${server.base}${f.path}`, { headers: { cookie } });
    if (!probe.ok) throw new Error(`${f.path} answered ${probe.status}: ${await probe.text()}`);
    const body = await probe.text();
    fs.writeFileSync(bareJson, body);
    const floorUrl = `${server.base}/api/bench/same-json`;
    if (!(await fetch(floorUrl)).ok) throw new Error("this build has no bench floor route; build with GRAINWARD_BENCH_BUILD=1 (npm run bench does)");
    await load(`${server.base}${f.path}`, { connections: CONNECTIONS, seconds: 3, headers: { cookie } });
    await load(floorUrl, { connections: CONNECTIONS, seconds: 3 });
    {
      const { floor, figure } = await paired({ url: floorUrl }, { url: `${server.base}${f.path}`, headers: { cookie } }, { connections: CONNECTIONS, rounds: ROUNDS, seconds: SECONDS });
      console.log(`${f.label} (${body.length.toLocaleString("en")} bytes): ${fmt(figure)}`);
      console.log(`  floor, bare route with ${body.length.toLocaleString("en")} bytes of the same JSON: ${fmt(floor)}`);
      result({
        figure: `${f.label}, ${CONNECTIONS} connections, ${CLIENTS.toLocaleString("en")} clients / ${PIECES.toLocaleString("en")} pieces`,
        target: `p95 < ${f.target} ms`,
        measured: `p95 ${figure.p95.toFixed(1)} ms`,
        floor: `bare route, same JSON size: p95 ${floor.p95.toFixed(1)} ms`,
        ratio: figure.p95 / floor.p95,
        ok: figure.p95 < f.target && figure.bad === 0 && floor.bad === 0,
      });
    }
  } finally {
    await server.stop();
  }
}

async function main() {
  const dir = benchDir("clients");
  const { dbFile, seeded } = seededCopy(dir);
  const t = performance.now();
  const { historyClientId } = seedClients(dbFile, seeded.studioId, seeded.staffUserId, CLIENTS);
  console.log(`added ${CLIENTS.toLocaleString("en")} clients in ${((performance.now() - t) / 1000).toFixed(1)} s`);
  const cookie = sessionCookie(dbFile, seeded.staffUserId);
  buildOnce();
  try {
    for (const q of SEARCHES) await measure(dbFile, dir, cookie, { label: `clients list search q=${q}`, path: `/api/clients?q=${encodeURIComponent(q)}`, target: LIST_P95_MS });
    await measure(dbFile, dir, cookie, { label: "client timeline (50 newest entries)", path: `/api/clients/${historyClientId}/timeline?limit=50`, target: TIMELINE_P95_MS });
  } finally {
    fs.rmSync(dir, { recursive: true, force: true });
  }
}

await main();
