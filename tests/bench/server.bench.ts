// The production server over 100,000 synthetic pieces (autocannon, 16 concurrent connections):
//   - registry search: GET /api/pieces?q=<word> p95 < 50 ms, beside GET /api/me (session check only) as
//     the floor;
//   - throughput of GET /api/pieces?q=walnut as a ratio to a bare route handler that serializes the same
//     JSON (app/api/bench/same-json/route.bench.ts, in bench builds only), measured in the same run: at least 0.4;
//   - the owner's piece page /pieces/[id], server-rendered for a signed-in owner: p95 < 200 ms (200 ms is
//     the server response time PageSpeed guidance long asked for — from memory);
//   - first-load JavaScript of the owner pages: the scripts each page's HTML loads, gzip-compressed, at most
//     170 kB (a common performance budget for a phone on a slow network, Alex Russell, "Can You Afford It?",
//     2017 — from memory), with /sign-in's scripts as the floor (the framework and shared layout);
//   - the app's peak resident memory through all of the above: under 512 MB (our choice).
// Prints one RESULT line per figure for tests/bench/run.ts's report.
// Standalone: npx tsx tests/bench/server.bench.ts   (BENCH_SKIP_BUILD=1 reuses .next)
import fs from "node:fs";
import path from "node:path";
import { fileURLToPath } from "node:url";
import { gzipSync } from "node:zlib";
import Database from "better-sqlite3";
import { benchDir, root, buildOnce, fmt, holdBuildLock, load, PIECES, seededCopy, sessionCookie, startServer, watchMemory } from "./server-harness";
import { result } from "./result";

holdBuildLock(fileURLToPath(import.meta.url));

const CONNECTIONS = 16;
const SECONDS = 10;
// A species word (about 1 in 20 pieces), a title word (1 in 12), and an owner surname (rare).
const WORDS = ["walnut", "burl", "Thornwood"];
const SEARCH_P95_MS = 50;
const RATIO_MIN = 0.4;
const PAGE_P95_MS = 200;
const JS_BUDGET_KB = 170;
const MEMORY_MB = 512;

async function scriptBytes(base: string, pagePath: string, cookie: string): Promise<{ raw: number; gzip: number; scripts: number }> {
  const res = await fetch(`${base}${pagePath}`, { headers: { cookie }, redirect: "manual" });
  if (res.status !== 200) throw new Error(`${pagePath} answered ${res.status}`);
  const html = await res.text();
  // Scripts a current browser runs: not the `nomodule` polyfills only old browsers load.
  const tags = [...html.matchAll(/<script\b([^>]*)>/gi)].map((m) => m[1]!).filter((attrs) => !/\bnomodule\b/i.test(attrs));
  const srcs = [...new Set(tags.map((attrs) => /\ssrc="([^"]+)"/.exec(attrs)?.[1]).filter((src): src is string => !!src))];
  let raw = 0;
  let gzip = 0;
  for (const src of srcs) {
    const body = Buffer.from(await (await fetch(new URL(src, base))).arrayBuffer());
    raw += body.length;
    gzip += gzipSync(body, { level: 9 }).length;
  }
  return { raw, gzip, scripts: srcs.length };
}

/** The owner area's pages from the file system: those without parameters, and a piece's own pages. */
function ownerPages(): string[] {
  const base = path.join(root, "app/(owner)");
  const out: string[] = [];
  const walk = (dir: string) => {
    for (const e of fs.readdirSync(dir, { withFileTypes: true })) {
      if (e.isDirectory()) walk(path.join(dir, e.name));
      else if (e.name === "page.tsx") {
        const route = "/" + path.relative(base, dir).split(path.sep).filter((x) => x && !/^\(.*\)$/.test(x)).join("/");
        const params = route.match(/\[[^\]]+\]/g) ?? [];
        if (params.length === 0 || (params.length === 1 && route.startsWith("/pieces/[id]"))) out.push(route);
      }
    }
  };
  walk(base);
  return out.sort();
}

async function main() {
  const dir = benchDir("server");
  const { dbFile, seeded } = seededCopy(dir);
  const staff = sessionCookie(dbFile, seeded.staffUserId);
  const db = new Database(dbFile, { readonly: true });
  const piece = db
    .prepare("SELECT p.id, p.owner_id AS ownerId FROM pieces p WHERE p.owner_id IS NOT NULL AND p.studio_id = ? ORDER BY p.rowid LIMIT 1 OFFSET ?")
    .get(seeded.studioId, Math.floor(seeded.pieces / 40)) as { id: string; ownerId: string };
  const ownerPieces = (db.prepare("SELECT count(*) AS n FROM pieces WHERE owner_id = ?").get(piece.ownerId) as { n: number }).n;
  const matched = Object.fromEntries(WORDS.map((w) => [w, (db.prepare("SELECT count(*) AS n FROM pieces_fts WHERE pieces_fts MATCH ?").get(`"${w}"*`) as { n: number }).n]));
  db.close();
  const owner = sessionCookie(dbFile, piece.ownerId);

  buildOnce();
  const bareJson = path.join(dir, "same.json");
  const server = await startServer(dbFile, dir, { GRAINWARD_BENCH_JSON: bareJson });
  const memory = watchMemory(server.pid);
  try {
    const probe = await fetch(`${server.base}/api/pieces?q=walnut`, { headers: { cookie: staff } });
    if (!probe.ok) throw new Error(`GET /api/pieces answered ${probe.status}: ${await probe.text()}`);
    const body = await probe.text();
    fs.writeFileSync(bareJson, body);
    const floorProbe = await fetch(`${server.base}/api/bench/same-json`);
    if (!floorProbe.ok) throw new Error(`the bare-route floor answered ${floorProbe.status}: this build has no bench route; build with GRAINWARD_BENCH_BUILD=1 (npm run bench does)`);
    console.log(`GET /api/pieces?q=walnut → ${(JSON.parse(body) as { rows: unknown[] }).rows.length} rows of ${PIECES.toLocaleString("en")} pieces, ${body.length.toLocaleString("en")} bytes`);

    // Warm the whole server first: the JIT needs several seconds of every path before figures settle.
    for (const [url, cookie] of [["/api/me", staff], ["/api/pieces?q=walnut", staff], ["/api/bench/same-json", ""], [`/pieces/${piece.id}`, owner]] as const) {
      await load(`${server.base}${url}`, { connections: CONNECTIONS, seconds: 4, headers: cookie ? { cookie } : {} });
    }
    const me = await load(`${server.base}/api/me`, { connections: CONNECTIONS, seconds: 5, headers: { cookie: staff } });
    console.log(`floor GET /api/me (session check only): ${fmt(me)}`);
    for (const word of WORDS) {
      const l = await load(`${server.base}/api/pieces?q=${encodeURIComponent(word)}`, { connections: CONNECTIONS, seconds: SECONDS, headers: { cookie: staff } });
      console.log(`q=${word} (${matched[word]!.toLocaleString("en")} matching of ${PIECES.toLocaleString("en")}): ${fmt(l)}`);
      result({ figure: `registry search p95, q=${word}, ${CONNECTIONS} connections`, target: `< ${SEARCH_P95_MS} ms`, measured: `${l.p95.toFixed(1)} ms`, floor: `GET /api/me p95 ${me.p95.toFixed(1)} ms`, ratio: l.p95 / me.p95, ok: l.p95 < SEARCH_P95_MS && l.bad === 0 });
    }

    const bare = await load(`${server.base}/api/bench/same-json`, { connections: CONNECTIONS, seconds: SECONDS });
    const real = await load(`${server.base}/api/pieces?q=walnut`, { connections: CONNECTIONS, seconds: SECONDS, headers: { cookie: staff } });
    console.log(`bare route, same JSON: ${fmt(bare)}`);
    console.log(`GET /api/pieces?q=walnut: ${fmt(real)}`);
    const ratio = real.perSecond / bare.perSecond;
    result({ figure: "GET /api/pieces?q=walnut throughput vs a bare route with the same JSON", target: `≥ ${RATIO_MIN}`, measured: `${real.perSecond.toFixed(0)} req/s`, floor: `bare ${bare.perSecond.toFixed(0)} req/s`, ratio, ok: ratio >= RATIO_MIN && real.bad === 0 && bare.bad === 0 });

    const page = await load(`${server.base}/pieces/${piece.id}`, { connections: CONNECTIONS, seconds: SECONDS, headers: { cookie: owner } });
    console.log(`owner piece page /pieces/[id] (owner of ${ownerPieces} pieces): ${fmt(page)}`);
    result({ figure: `owner piece page p95, ${CONNECTIONS} connections`, target: `< ${PAGE_P95_MS} ms`, measured: `${page.p95.toFixed(1)} ms`, floor: `GET /api/me p95 ${me.p95.toFixed(1)} ms`, ratio: page.p95 / me.p95, ok: page.p95 < PAGE_P95_MS && page.bad === 0 });

    const floorJs = await scriptBytes(server.base, "/sign-in", "");
    console.log(`floor /sign-in: ${floorJs.scripts} scripts, ${(floorJs.gzip / 1024).toFixed(1)} kB gzip (${(floorJs.raw / 1024).toFixed(0)} kB raw)`);
    for (const p of ownerPages().map((x) => x.replace("[id]", piece.id))) {
      const js = await scriptBytes(server.base, p, owner);
      const label = p.replace(piece.id, "[id]");
      console.log(`${label}: ${js.scripts} scripts, ${(js.gzip / 1024).toFixed(1)} kB gzip (${(js.raw / 1024).toFixed(0)} kB raw)`);
      result({ figure: `first-load JS ${label}`, target: `≤ ${JS_BUDGET_KB} kB gzip`, measured: `${(js.gzip / 1024).toFixed(1)} kB`, floor: `/sign-in ${(floorJs.gzip / 1024).toFixed(1)} kB`, ratio: js.gzip / floorJs.gzip, ok: js.gzip <= JS_BUDGET_KB * 1024 });
    }
  } finally {
    const peak = memory.stop();
    await server.stop();
    console.log(`app peak resident memory: ${(peak / 2 ** 20).toFixed(0)} MB`);
    result({ figure: "app peak resident memory under the loads above", target: `< ${MEMORY_MB} MB`, measured: `${(peak / 2 ** 20).toFixed(0)} MB`, floor: "—", ratio: null, ok: peak < MEMORY_MB * 2 ** 20 });
    fs.rmSync(dir, { recursive: true, force: true });
  }
}

await main();
