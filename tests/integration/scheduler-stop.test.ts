// The scheduler stops cleanly on SIGTERM in the middle of a reminder pass, and the next pass finishes
// the work without sending anything twice. For real: this file's own freshly
// migrated SQLite file, its own SMTP sink (the real one, so the counts are this file's alone), the real
// scheduler process (`node --import tsx jobs/index.ts`, which runs a pass at start-up on the real clock) and then the
// real `jobs/run-once.ts`. Invented studio, owners and pieces.
//
// The seed is dated from the real clock: every piece's first reminder (14 days before its due date)
// fell four days ago (UTC), so in every owner's zone it has come, whatever the hour, and the due-day
// reminder is still about ten days off — each task's current step is "14 days before" at any instant
// of the test.
import { spawn, type ChildProcess } from "node:child_process";
import path from "node:path";
import { eq } from "drizzle-orm";
import { DateTime } from "luxon";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { getDb } from "@/db/client";
import { reminderSends, users } from "@/db/schema";
import { startSmtpSink, type SmtpSink } from "@/lib/fakes/smtp-sink";
import { listMail } from "../support/mail";
import { ownDatabaseFile, runOnce, seedOwner, seedPiece, seedStudio } from "./reminders-helpers";

const dbFile = ownDatabaseFile("scheduler-stop");

const PIECES = 100;
/**
 * Reminders due: a hardwax-oiled top in heavy use has two care tasks, re-oil (every 12 months) and the
 * yearly clean and check (lib/care/intervals.ts), each with its first reminder due now.
 */
const DUE = PIECES * 2;
const ZONES = ["America/Los_Angeles", "America/New_York", "Europe/Berlin", "Asia/Tokyo", "Pacific/Auckland"];

let sink: SmtpSink;
let studioId: string;
let childEnv: Record<string, string>;

beforeAll(async () => {
  sink = await startSmtpSink();
  childEnv = {
    DATABASE_URL: dbFile,
    SMTP_HOST: "127.0.0.1",
    SMTP_PORT: String(sink.smtpPort),
    MAIL_SINK_URL: sink.url,
    // Chunks of 40 pieces, so a stop can leave both claimed-but-unsent rows and pieces never reached.
    GW_PASS_CHUNK: "40",
  };
  const firstStep = DateTime.utc().minus({ days: 4 }).toISODate()!;
  const oiled = DateTime.fromISO(firstStep).plus({ days: 14 }).minus({ months: 12 }).toISODate()!;
  const { studio, products } = seedStudio({ name: "Stop-test Studio (invented)" });
  studioId = studio.id;
  for (let i = 0; i < PIECES; i++) {
    const owner = seedOwner({ name: `Stop-test Owner ${i} (invented)`, timeZone: ZONES[i % ZONES.length]! });
    seedPiece(studio, owner.id, { deliveredOn: oiled, title: `Test oak table ${i} (invented)`, layers: [{ surface: "top", finishClass: "hardwax_oil", productId: products.oil, appliedOn: oiled, coats: 2 }] });
  }
});

afterAll(async () => {
  await sink?.close();
});

const ledger = () => getDb().select().from(reminderSends).where(eq(reminderSends.studioId, studioId)).all();
const reminderKeyOf = (m: { headers: Record<string, string> }) => m.headers["x-grainward-reminder"] ?? "";
const sleep = (ms: number) => new Promise((r) => setTimeout(r, ms));

function startScheduler(): { child: ChildProcess; output: () => string; exited: Promise<{ code: number | null; signal: NodeJS.Signals | null; at: number }> } {
  // As `npm run jobs` starts it: Node with tsx as a loader, so SIGTERM reaches the scheduler itself.
  const child = spawn(process.execPath, ["--import", "tsx", "jobs/index.ts"], {
    cwd: path.resolve("."),
    env: { ...process.env, ...childEnv },
    stdio: ["ignore", "pipe", "pipe"],
  });
  let out = "";
  child.stdout!.on("data", (c) => (out += c));
  child.stderr!.on("data", (c) => (out += c));
  const exited = new Promise<{ code: number | null; signal: NodeJS.Signals | null; at: number }>((resolve) =>
    child.on("exit", (code, signal) => resolve({ code, signal, at: Date.now() })),
  );
  return { child, output: () => out, exited };
}

describe("the scheduler on SIGTERM in the middle of a pass", () => {
  it("exits 0 within seconds, leaves no reminder half-claimed, and the next pass sends each missing one exactly once", async () => {
    expect(sink.messages()).toHaveLength(0);
    const s = startScheduler();
    try {
      // Wait for the start-up pass to be under way: at least 10 messages in the sink.
      const deadline = Date.now() + 60_000;
      while (sink.messages().length < 10) {
        if (Date.now() > deadline) throw new Error(`the scheduler sent fewer than 10 messages in 60 s; its output:\n${s.output()}`);
        if (s.child.exitCode !== null) throw new Error(`the scheduler exited early (${s.child.exitCode}); its output:\n${s.output()}`);
        await sleep(5);
      }
      const killedAt = Date.now();
      s.child.kill("SIGTERM");
      const exit = await Promise.race([s.exited, sleep(10_000).then(() => null)]);
      expect(exit, `the scheduler did not exit within 10 s of SIGTERM; its output:\n${s.output()}`).not.toBeNull();
      expect(exit!.code, s.output()).toBe(0);
      expect(exit!.at - killedAt, "seconds from SIGTERM to exit").toBeLessThan(5_000);
      expect(s.output()).toMatch(/scheduler: SIGTERM, stopping/);
      expect(s.output()).toMatch(/stopped before the end; \d+ reminders it held for sending put back for the next pass/);
      expect(s.output()).toMatch(/scheduler: stopped/);
    } finally {
      if (s.child.exitCode === null && s.child.signalCode === null) s.child.kill("SIGKILL");
    }

    // What the stopped pass left: fewer than all sent; every sent row is in the sink once; no row queued
    // (the claimed-but-unsent ones were put back, never handed to SMTP: attempts 0).
    const afterStop = await listMail({ sinkUrl: sink.url });
    expect(afterStop.length).toBeGreaterThanOrEqual(10);
    expect(afterStop.length).toBeLessThan(DUE);
    const rows1 = ledger();
    expect(rows1.filter((r) => r.status === "queued")).toEqual([]);
    const sent1 = rows1.filter((r) => r.status === "sent");
    expect(sent1.map((r) => r.reminderKey).sort()).toEqual(afterStop.map(reminderKeyOf).sort());
    expect(new Set(afterStop.map(reminderKeyOf)).size).toBe(afterStop.length);
    // Stopped inside a chunk (claims put back) and before the last one (pieces never reached).
    const released = rows1.filter((r) => r.status === "failed");
    expect(released.length).toBeGreaterThan(0);
    expect(rows1.length).toBeLessThan(DUE);
    expect(released.every((r) => r.attempts === 0 && r.sentAt === null && /pass was stopped before handing it to SMTP/.test(r.lastError ?? ""))).toBe(true);
    expect(rows1.every((r) => r.status === "sent" || r.status === "failed")).toBe(true);

    // The next pass, on the real clock (the released rows are due for retry from the stopped pass's instant).
    const next = await runOnce(new Date().toISOString(), childEnv);
    expect(next.code, next.stdout + next.stderr).toBe(0);
    const m = /sent (\d+), skipped (\d+), failed (\d+)/.exec(next.stdout);
    expect(m, next.stdout).not.toBeNull();
    expect(Number(m![1])).toBe(DUE - afterStop.length);
    expect(Number(m![3])).toBe(0);

    // Exactly one message per due reminder: DUE distinct (recipient, reminder key) pairs, none twice,
    // and each matches a sent ledger row handed to SMTP once.
    const all = await listMail({ sinkUrl: sink.url });
    expect(all).toHaveLength(DUE);
    const pairs = all.map((x) => `${x.to.join(",")}|${reminderKeyOf(x)}`);
    expect(new Set(pairs).size).toBe(DUE);
    expect(all.every((x) => x.to.length === 1 && reminderKeyOf(x) !== "")).toBe(true);
    const rows2 = ledger();
    expect(rows2).toHaveLength(DUE);
    expect(rows2.filter((r) => r.status !== "sent")).toEqual([]);
    expect(rows2.every((r) => r.attempts === 1 && r.step === "before_14d")).toBe(true);
    expect(rows2.map((r) => r.reminderKey).sort()).toEqual(all.map(reminderKeyOf).sort());
    // Each message went to the owner its ledger row names.
    const expected = getDb()
      .select({ key: reminderSends.reminderKey, email: users.email })
      .from(reminderSends)
      .innerJoin(users, eq(users.id, reminderSends.userId))
      .where(eq(reminderSends.studioId, studioId))
      .all()
      .map((r) => `${r.email}|${r.key}`);
    expect(pairs.sort()).toEqual(expected.sort());
  }, 120_000);
});
