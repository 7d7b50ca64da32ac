// `npm run test:stress`: the product under concurrent writers and a hard kill, against a production
// build on loopback. Prints a summary and a closing "N passed, N failed" line.
//  1. 50 concurrent writers for STRESS_SECONDS (default 30): claims, care-log entries, finish-layer
//     edits over HTTP → no 5xx and no SQLITE_BUSY reaches a client; every acknowledged write is in the
//     database afterwards, and nothing unacknowledged is counted.
//  2. SIGKILL during a write burst, restart on the same file → PRAGMA integrity_check is ok and every
//     acknowledged write is present.
import fs from "node:fs";
import path from "node:path";
import { startSmtpSink } from "@/lib/fakes/smtp-sink";
import { startServer } from "../support/server";

const SECONDS = Number(process.env.STRESS_SECONDS ?? 30);
const WRITERS = 50;
const dir = path.resolve("tests/.tmp", `stress-${Date.now()}`);
fs.mkdirSync(dir, { recursive: true });
const databaseUrl = path.join(dir, "stress.db");
const sink = await startSmtpSink();
const baseEnv = {
  DATABASE_URL: databaseUrl,
  DATA_DIR: dir,
  APP_URL: "http://127.0.0.1:3290",
  SMTP_PORT: String(sink.smtpPort),
  MAIL_SINK_URL: sink.url,
  STRIPE_API_PORT: "12190",
};
Object.assign(process.env, baseEnv);

// Migrate, seed the demo studio and mint sessions in this process, before the server starts.
const { openDatabase, getDb } = await import("@/db/client");
const { applyMigrations } = await import("@/db/migrate");
const seedDb = openDatabase(databaseUrl);
applyMigrations(seedDb);
seedDb.$client.close();
const { seedDemo, DEMO_ACCOUNTS } = await import("@/db/seed/demo");
await seedDemo(getDb());
const { getLucia } = await import("@/lib/auth/lucia");
const { randomToken, sha256Hex } = await import("@/lib/crypto");
const schema = await import("@/db/schema");
const { eq, and, isNotNull, inArray, sql } = await import("drizzle-orm");
const db = getDb();
const userId = (email: string) => db.select().from(schema.users).where(eq(schema.users.email, email)).get()!.id;
async function cookieFor(email: string) {
  const token = randomToken(24);
  await getLucia().createSession(userId(email), {}, { sessionId: sha256Hex(token) });
  return `gw_session=${token}`;
}
const owners = [DEMO_ACCOUNTS.holloway.email, DEMO_ACCOUNTS.jonah.email];
const ownerCookies = await Promise.all(owners.map(cookieFor));
const staffCookie = await cookieFor(DEMO_ACCOUNTS.teo.email);
const ownedPieces = owners.map((e) => db.select({ id: schema.pieces.id }).from(schema.pieces).where(and(eq(schema.pieces.ownerId, userId(e)), isNotNull(schema.pieces.ownerId))).all().map((p) => p.id));
const allPieces = db.select({ id: schema.pieces.id }).from(schema.pieces).all().map((p) => p.id);
// Three days back: "today" in UTC can be tomorrow in the studio's or owner's time zone.
const today = new Date(Date.now() - 3 * 86_400_000).toISOString().slice(0, 10);

type Ack = { kind: "claim" | "care" | "layer"; id: string };
let failures = 0;
const results: string[] = [];
const check = (ok: boolean, label: string) => {
  results.push(`${ok ? "✓" : "✗"} ${label}`);
  if (!ok) failures++;
};

async function burst(url: string, seconds: number, acks: Ack[], statuses: Map<number, number>, stopAt?: () => boolean) {
  const end = Date.now() + seconds * 1000;
  let busyLeaks = 0;
  async function writer(n: number) {
    while (Date.now() < end && !stopAt?.()) {
      const o = n % owners.length;
      const op = n % 3;
      let res: Response;
      let kind: Ack["kind"];
      try {
        if (op === 0) {
          kind = "claim";
          res = await fetch(`${url}/api/claims`, {
            method: "POST",
            headers: { "content-type": "application/json", cookie: ownerCookies[o]! },
            body: JSON.stringify({ pieceId: ownedPieces[o]![n % ownedPieces[o]!.length], category: "scratch_dent", noticedOn: today, description: `Stress test claim from writer ${n} (invented).`, answers: { heat: "no", chemicals: "no", impact: "yes", usedOutdoors: "no", directSun: "no" } }),
          });
        } else if (op === 1) {
          kind = "care";
          res = await fetch(`${url}/api/me/pieces/${ownedPieces[o]![n % ownedPieces[o]!.length]}/care-log`, {
            method: "POST",
            headers: { "content-type": "application/json", cookie: ownerCookies[o]! },
            body: JSON.stringify({ taskKind: "annual_check", surface: "whole_piece", doneOn: today, notes: `writer ${n}` }),
          });
        } else {
          kind = "layer";
          res = await fetch(`${url}/api/pieces/${allPieces[n % allPieces.length]}/layers`, {
            method: "POST",
            headers: { "content-type": "application/json", cookie: staffCookie },
            body: JSON.stringify({ surface: "base", finishClass: "hardwax_oil", coats: 1, appliedOn: today, notes: `writer ${n}` }),
          });
        }
      } catch {
        if (stopAt?.()) return;
        continue; // the server went away (the kill test)
      }
      statuses.set(res.status, (statuses.get(res.status) ?? 0) + 1);
      const text = await res.text().catch(() => "");
      if (/SQLITE_BUSY|database is locked/i.test(text)) busyLeaks++;
      if (res.ok) {
        // A response cut off by the kill is no acknowledgement: the client never saw the id.
        let body: Record<string, { id?: string } | string | undefined>;
        try {
          body = JSON.parse(text);
        } catch {
          continue;
        }
        const pick = (k: string) => (typeof body[k] === "object" ? (body[k] as { id?: string }).id : undefined);
        const id = pick("claim") ?? pick("entry") ?? pick("layer");
        if (id) acks.push({ kind, id });
      }
    }
  }
  await Promise.all(Array.from({ length: WRITERS }, (_, n) => writer(n)));
  return { busyLeaks };
}

function present(acks: Ack[]) {
  const ids = (kind: Ack["kind"]) => acks.filter((a) => a.kind === kind).map((a) => a.id);
  const count = (table: typeof schema.claims | typeof schema.careLogEntries | typeof schema.finishLayers, list: string[]) =>
    list.length === 0 ? 0 : list.reduce((n, _, i) => (i % 500 ? n : n + Number(db.select({ n: sql<number>`count(*)` }).from(table).where(inArray(table.id, list.slice(i, i + 500))).get()!.n)), 0);
  return {
    claims: [ids("claim").length, count(schema.claims, ids("claim"))],
    care: [ids("care").length, count(schema.careLogEntries, ids("care"))],
    layers: [ids("layer").length, count(schema.finishLayers, ids("layer"))],
  };
}

// 1. Concurrent writers.
{
  const server = await startServer({ port: 3290, env: baseEnv });
  const acks: Ack[] = [];
  const statuses = new Map<number, number>();
  const t0 = Date.now();
  const { busyLeaks } = await burst(server.url, SECONDS, acks, statuses);
  const elapsed = (Date.now() - t0) / 1000;
  await server.stop();
  const p = present(acks);
  const fiveXX = [...statuses].filter(([s]) => s >= 500).reduce((n, [, c]) => n + c, 0);
  console.log(`load: ${WRITERS} writers × ${elapsed.toFixed(1)} s → ${acks.length} acknowledged writes (${(acks.length / elapsed).toFixed(0)}/s); statuses ${JSON.stringify(Object.fromEntries(statuses))}`);
  console.log(`load: present after the run — claims ${p.claims[1]}/${p.claims[0]}, care log ${p.care[1]}/${p.care[0]}, layers ${p.layers[1]}/${p.layers[0]}`);
  check(fiveXX === 0, `no 5xx under ${WRITERS} concurrent writers (${fiveXX})`);
  check(busyLeaks === 0, `no SQLITE_BUSY reached a client (${busyLeaks})`);
  check(acks.length > WRITERS, `writes were acknowledged (${acks.length})`);
  check(p.claims[0] === p.claims[1] && p.care[0] === p.care[1] && p.layers[0] === p.layers[1], "every acknowledged write is in the database");
}

// 2. SIGKILL during a burst, then restart.
{
  const server = await startServer({ port: 3290, env: baseEnv });
  const acks: Ack[] = [];
  const statuses = new Map<number, number>();
  let killed = false;
  // Kill once the burst is well under way (40 writes acknowledged), whatever the machine's speed.
  const killer = setInterval(() => {
    if (acks.length >= 40 && !killed) {
      killed = true;
      server.child.kill("SIGKILL");
    }
  }, 5);
  await burst(server.url, 60, acks, statuses, () => killed);
  clearInterval(killer);
  await server.stop();
  const restarted = await startServer({ port: 3290, env: baseEnv });
  const integrity = String(db.$client.pragma("integrity_check", { simple: true }));
  const p = present(acks);
  await restarted.stop();
  console.log(`kill: ${acks.length} writes acknowledged before SIGKILL; after restart integrity_check=${integrity}; claims ${p.claims[1]}/${p.claims[0]}, care ${p.care[1]}/${p.care[0]}, layers ${p.layers[1]}/${p.layers[0]}`);
  check(killed, "the server was killed mid-burst");
  check(integrity === "ok", `PRAGMA integrity_check after SIGKILL (${integrity})`);
  check(p.claims[0] === p.claims[1] && p.care[0] === p.care[1] && p.layers[0] === p.layers[1], "every write acknowledged before the kill is present after restart");
}

await sink.close();
db.$client.close();
fs.rmSync(dir, { recursive: true, force: true });
console.log(results.join("\n"));
console.log(`${results.length - failures} passed, ${failures} failed`);
process.exit(failures ? 1 : 0);
