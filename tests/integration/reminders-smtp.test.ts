// The SMTP server goes away during a pass: the rest of the pass's rows are failed; once it is back,
// the next due pass sends each of them once. This file runs its own sink, so it sets SMTP_PORT before
// lib/env is first imported (vi.hoisted runs ahead of the imports).
import { eq } from "drizzle-orm";
import { afterAll, describe, expect, it, vi } from "vitest";
import type { SmtpSink } from "@/lib/fakes/smtp-sink";

const first = await vi.hoisted(async () => {
  const { startSmtpSink } = await import("@/lib/fakes/smtp-sink");
  const sink = await startSmtpSink();
  process.env.SMTP_PORT = String(sink.smtpPort);
  return sink;
});

const { getDb } = await import("@/db/client");
const { reminderSends } = await import("@/db/schema");
const { startSmtpSink } = await import("@/lib/fakes/smtp-sink");
const { runReminderPass } = await import("@/lib/reminders/pass");
const { ownDatabaseFile, seedOwner, seedPiece, seedStudio } = await import("./reminders-helpers");

ownDatabaseFile("smtp");
let second: SmtpSink | undefined;
afterAll(async () => {
  await second?.close();
});

const keys = (sink: SmtpSink) => sink.messages().map((m) => m.headers["x-grainward-reminder"]!);

describe("SMTP sink stopped mid-pass", () => {
  it("fails the rest, retries after the back-off once the sink is back, sends each once; three tries at most", async () => {
    const { studio, products } = seedStudio();
    const owners = Array.from({ length: 4 }, () => seedOwner());
    for (const o of owners) {
      seedPiece(studio, o.id, { deliveredOn: "2025-02-14", layers: [{ surface: "top", finishClass: "hardwax_oil", productId: products.oil, appliedOn: "2025-02-14" }] });
    }
    // Due 2026-02-14, first step 2026-01-31 (Los Angeles 09:00 = 17:00Z).
    const t0 = new Date("2026-01-31T17:00:00Z").getTime();
    let stopped = false;
    const r1 = await runReminderPass({
      now: new Date(t0),
      onSent: async () => {
        if (stopped) return;
        stopped = true;
        await first.close();
      },
    });
    expect(r1.sent).toHaveLength(1);
    expect(r1.failed).toHaveLength(7);
    expect(r1.failed.every((f) => f.willRetry)).toBe(true);
    const rows = () => getDb().select().from(reminderSends).where(eq(reminderSends.studioId, studio.id)).all();
    expect(rows().filter((r) => r.status === "failed")).toHaveLength(7);
    expect(rows().filter((r) => r.status === "failed").every((r) => r.attempts === 1 && r.nextAttemptAt?.getTime() === t0 + 15 * 60_000)).toBe(true);
    expect(rows().find((r) => r.status === "failed")?.lastError).toMatch(/try 1 of 3: .*ECONNREFUSED/);

    // Still down at the first retry: try 2 fails, next in an hour.
    const r2 = await runReminderPass({ now: new Date(t0 + 16 * 60_000) });
    expect(r2.failed).toHaveLength(7);
    expect(rows().filter((r) => r.status === "failed").every((r) => r.attempts === 2)).toBe(true);

    // Back (same port). Before the back-off has run out, nothing is retried.
    second = await startSmtpSink({ smtpPort: Number(process.env.SMTP_PORT) });
    const r3 = await runReminderPass({ now: new Date(t0 + 30 * 60_000) });
    expect(r3.sent).toHaveLength(0);
    const r4 = await runReminderPass({ now: new Date(t0 + 77 * 60_000) });
    expect(r4.sent).toHaveLength(7);
    const all = [...keys(first), ...keys(second)];
    expect(all).toHaveLength(8);
    expect(new Set(all).size).toBe(8);
    expect(rows().every((r) => r.status === "sent")).toBe(true);
    expect(rows().filter((r) => r.attempts === 3)).toHaveLength(7);
    const r5 = await runReminderPass({ now: new Date(t0 + 5 * 3600_000) });
    expect(r5.sent).toHaveLength(0);
  });

  it("after a third failed try there are no more automatic tries", async () => {
    const { studio, products } = seedStudio();
    const owner = seedOwner();
    seedPiece(studio, owner.id, { deliveredOn: "2025-02-20", layers: [{ surface: "top", finishClass: "hardwax_oil", productId: products.oil, appliedOn: "2025-02-20" }] });
    await second!.close();
    const t0 = new Date("2026-02-06T17:00:00Z").getTime();
    for (const offset of [0, 16, 77, 300]) await runReminderPass({ now: new Date(t0 + offset * 60_000) });
    const rows = getDb().select().from(reminderSends).where(eq(reminderSends.studioId, studio.id)).all();
    expect(rows).toHaveLength(2);
    expect(rows.every((r) => r.status === "failed" && r.attempts === 3 && r.nextAttemptAt === null)).toBe(true);
    expect(rows[0]!.lastError).toMatch(/try 3 of 3/);
  });
});
