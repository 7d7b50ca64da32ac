// Two `jobs:run-once` processes at once over one SQLite file, and a pass killed half way: every
// reminder reaches the sink once. Real child processes, the real sink; invented data.
import { once } from "node:events";
import { spawn } from "node:child_process";
import path from "node:path";
import { SMTPServer } from "smtp-server";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { listMail } from "../support/mail";
import { ledgerOf, ownDatabaseFile, runOnce, seedOwner, seedPiece, seedStudio } from "./reminders-helpers";

ownDatabaseFile("concurrency");

function seedOwners(count: number, deliveredOn: string) {
  const { studio, products } = seedStudio();
  return Array.from({ length: count }, (_, i) => {
    const owner = seedOwner({ name: `Concurrent Owner ${i} (invented)` });
    const piece = seedPiece(studio, owner.id, { deliveredOn, layers: [{ surface: "top", finishClass: "hardwax_oil", productId: products.oil, appliedOn: deliveredOn }] });
    return { owner, piece };
  });
}

describe("two passes at once", () => {
  it("each reminder arrives once", async () => {
    // Heavy use hardwax oil and the annual check: both due 2026-04-10; first step 2026-03-27.
    const seeded = seedOwners(12, "2025-04-10");
    const now = "2026-03-27T17:30:00Z";
    const [a, b] = await Promise.all([runOnce(now), runOnce(now)]);
    expect(a.code, a.stderr).toBe(0);
    expect(b.code, b.stderr).toBe(0);
    const sentBy = (out: string) => Number(/sent (\d+), skipped/.exec(out)?.[1] ?? NaN);
    expect(sentBy(a.stdout) + sentBy(b.stdout)).toBe(24);
    for (const { owner, piece } of seeded) {
      const mails = await listMail({ to: owner.email });
      const keys = mails.map((m) => m.headers["x-grainward-reminder"]);
      expect(keys).toHaveLength(2);
      expect(new Set(keys).size).toBe(2);
      expect(ledgerOf(piece.id).map((r) => r.status)).toEqual(["sent", "sent"]);
    }
  }, 60_000);
});

describe("a pass killed half way", () => {
  // A relay that accepts the first message's data and never answers: the pass hangs in its first
  // hand-off, with the other claims of its chunk still waiting, and is killed there.
  let hung: SMTPServer;
  let hungPort = 0;
  let gotData: () => void;
  const dataArrived = new Promise<void>((r) => (gotData = r));
  beforeAll(async () => {
    hung = new SMTPServer({
      authOptional: true,
      disabledCommands: ["STARTTLS"],
      logger: false,
      closeTimeout: 100,
      onData(stream) {
        stream.resume();
        stream.on("end", () => gotData()); // and never call back
      },
    });
    hung.listen(0, "127.0.0.1");
    await once(hung.server, "listening");
    hungPort = (hung.server.address() as { port: number }).port;
  });
  afterAll(() => new Promise<void>((r) => hung.close(() => r())));

  it("never sends the one whose hand-off began, and sends every other one exactly once", async () => {
    // Rewax (paste wax, heavy use: 6 months) and the annual check; the rewax is due 2026-01-20, first step 2026-01-06.
    const { studio, products } = seedStudio();
    const owners = Array.from({ length: 5 }, (_, i) => {
      const owner = seedOwner({ name: `Killed-pass Owner ${i} (invented)` });
      seedPiece(studio, owner.id, { deliveredOn: "2025-07-20", layers: [{ surface: "top", finishClass: "paste_wax", productId: products.wax, appliedOn: "2025-07-20" }] });
      return owner;
    });
    const now = "2026-01-06T18:00:00Z";
    const child = spawn(path.resolve("node_modules/.bin/tsx"), ["jobs/run-once.ts", "--now", now], {
      env: { ...process.env, SMTP_PORT: String(hungPort) },
      stdio: "ignore",
    });
    await dataArrived;
    child.kill("SIGKILL");
    await once(child, "exit");

    const { getDb } = await import("@/db/client");
    const { reminderSends } = await import("@/db/schema");
    const { inArray } = await import("drizzle-orm");
    const rows = () => getDb().select().from(reminderSends).where(inArray(reminderSends.userId, owners.map((o) => o.id))).all();
    expect(rows()).toHaveLength(5);
    expect(rows().every((r) => r.status === "queued")).toBe(true);
    const handedOff = rows().filter((r) => r.sentAt !== null);
    expect(handedOff).toHaveLength(1);

    // Five minutes later the claims still look live: a new pass leaves them alone.
    const early = await runOnce("2026-01-06T18:05:00Z");
    expect(early.stdout).toMatch(/sent 0,.*recovered 0, interrupted 0/);

    // Twenty minutes later they are stale: the four never handed off go out; the one that was is not retried.
    const late = await runOnce("2026-01-06T18:20:00Z");
    expect(late.code, late.stderr).toBe(0);
    expect(late.stdout).toMatch(/sent 4,.*recovered 4, interrupted 1/);
    const hungRow = rows().find((r) => r.id === handedOff[0]!.id)!;
    expect(hungRow).toMatchObject({ status: "failed", nextAttemptAt: null, attempts: 1 });
    expect(hungRow.lastError).toMatch(/delivery unknown/);
    let total = 0;
    for (const o of owners) {
      const mails = await listMail({ to: o.email });
      total += mails.length;
      expect(mails.every((m) => m.headers["x-grainward-reminder"] !== hungRow.reminderKey)).toBe(true);
    }
    expect(total).toBe(4);

    // And again: nothing more.
    const again = await runOnce("2026-01-06T20:00:00Z");
    expect(again.stdout).toMatch(/sent 0,/);
  }, 90_000);
});
