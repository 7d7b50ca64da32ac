// A reminder pass (and a visit reminder pass) stopped by its AbortSignal, in process, at a chosen
// point: the message in hand is finished, the rest of the chunk's claims are put back (due now, never
// handed to SMTP), later chunks are not touched, and the next pass sends each remaining reminder once
// and keeps the refresh offers linked. Own database file; the global SMTP sink. The scheduler process
// itself is tested in scheduler-stop.test.ts. Invented studio, owners and pieces.
import { eq } from "drizzle-orm";
import { DateTime } from "luxon";
import { describe, expect, it } from "vitest";
import { getDb } from "@/db/client";
import { refreshOffers, reminderSends, visitMailSends } from "@/db/schema";
import { runReminderPass } from "@/lib/reminders/pass";
import { runVisitReminderPass } from "@/lib/visits/reminders";
import { bookVisit } from "@/lib/visits/book";
import { listJobSlots } from "@/lib/visits/slots";
import { listMail } from "../support/mail";
import { ownDatabaseFile, seedOwner, seedPiece, seedStudio } from "./reminders-helpers";
import { ownerActor, visitWorld } from "./visits-helpers";

ownDatabaseFile("stop");

// 17:00Z on 2030-05-06 is 10:00 in Los Angeles; the pieces' first reminders are on that day.
const NOW = new Date("2030-05-06T17:00:00Z");

describe("a reminder pass stopped by its signal", () => {
  it("finishes the message in hand, puts back the chunk's other leases, and the next pass sends the rest once", async () => {
    const { studio, products } = seedStudio();
    // Due 2030-05-20 (hardwax oil, heavy use: 12 months, lib/care/intervals.ts): first reminder 2030-05-06.
    const oiled = DateTime.fromISO("2030-05-20").minus({ months: 12 }).toISODate()!;
    const owners = Array.from({ length: 10 }, (_, i) => seedOwner({ name: `Stop Owner ${i} (invented)` }));
    for (const o of owners) seedPiece(studio, o.id, { deliveredOn: oiled, layers: [{ surface: "top", finishClass: "hardwax_oil", productId: products.oil, appliedOn: oiled, coats: 2 }] });
    const rows = () => getDb().select().from(reminderSends).where(eq(reminderSends.studioId, studio.id)).all();

    // Already aborted: nothing is read or leased.
    const before = await runReminderPass({ now: NOW, signal: AbortSignal.abort() });
    expect(before).toMatchObject({ stopped: true, pieces: 0, leased: 0, released: 0 });
    expect(rows()).toHaveLength(0);

    // Chunks of 4 pieces (8 reminders); stop once the third message has gone.
    const ctl = new AbortController();
    let sentSoFar = 0;
    const first = await runReminderPass({
      now: NOW,
      chunkSize: 4,
      signal: ctl.signal,
      onSent: () => {
        if (++sentSoFar === 3) ctl.abort();
      },
    });
    expect(first).toMatchObject({ stopped: true, pieces: 4, leased: 8, released: 5 });
    expect(first.sent).toHaveLength(3);
    const after1 = rows();
    expect(after1.map((r) => r.status).sort()).toEqual(["failed", "failed", "failed", "failed", "failed", "sent", "sent", "sent"]);
    for (const r of after1.filter((x) => x.status === "failed")) {
      expect(r).toMatchObject({ attempts: 0, sentAt: null, messageId: null, nextAttemptAt: NOW });
      expect(r.lastError).toMatch(/stopped before handing it to SMTP \(certainly not sent\)/);
    }
    let mailed = 0;
    for (const o of owners) mailed += (await listMail({ to: o.email })).length;
    expect(mailed).toBe(3);

    // The next pass at the same instant: the 5 put back (retries due now) and the 12 never leased.
    const second = await runReminderPass({ now: NOW, chunkSize: 4 });
    expect(second).toMatchObject({ stopped: false, released: 0, leased: 17, failed: [] });
    expect(second.sent).toHaveLength(17);
    const after2 = rows();
    expect(after2).toHaveLength(20);
    expect(after2.every((r) => r.status === "sent" && r.attempts === 1)).toBe(true);
    const keys: string[] = [];
    for (const o of owners) for (const m of await listMail({ to: o.email })) keys.push(m.headers["x-grainward-reminder"]!);
    expect(keys.sort()).toEqual(after2.map((r) => r.reminderKey).sort());
    // One refresh offer per re-oil task, each riding on a sent reminder.
    const offers = getDb().select().from(refreshOffers).where(eq(refreshOffers.studioId, studio.id)).all();
    expect(offers).toHaveLength(10);
    const sentIds = new Set(after2.filter((r) => r.taskKind === "reoil").map((r) => r.id));
    expect(offers.every((o) => o.status === "offered" && sentIds.has(o.reminderSendId!))).toBe(true);
    // And a third pass has nothing left to do.
    expect((await runReminderPass({ now: NOW })).sent.filter((s) => owners.some((o) => o.email === s.to))).toHaveLength(0);
  });
});

describe("a visit reminder pass stopped by its signal", () => {
  it("leases nothing once aborted; the next pass sends the reminder", async () => {
    const w = await visitWorld();
    // A Monday at least 60 days ahead, 12:00 UTC (inside the visit calendar whatever day the suite runs).
    const bookAt = DateTime.utc().plus({ days: 60 }).startOf("week").plus({ weeks: 1 }).set({ hour: 12, minute: 0, second: 0, millisecond: 0 }).toMillis();
    const slot = listJobSlots(ownerActor(w.owner), w.job.id, { from: new Date(bookAt + 2 * 86_400_000).toISOString(), to: new Date(bookAt + 9 * 86_400_000).toISOString() }, bookAt).slots[0]!;
    const v = await bookVisit(ownerActor(w.owner), { jobId: w.job.id, technicianId: slot.technicianId, start: slot.start }, bookAt);
    const at = new Date(Date.parse(v.start) - 23 * 3_600_000);
    const stopped = await runVisitReminderPass({ now: at, signal: AbortSignal.abort() });
    expect(stopped).toMatchObject({ stopped: true, sent: [], skipped: 0 });
    expect(getDb().select().from(visitMailSends).where(eq(visitMailSends.visitId, v.id)).all()).toHaveLength(0);
    const next = await runVisitReminderPass({ now: at });
    expect(next.stopped).toBe(false);
    expect(next.sent.filter((s) => s.visitId === v.id)).toHaveLength(1);
    expect(getDb().select().from(visitMailSends).where(eq(visitMailSends.visitId, v.id)).all().map((r) => r.status)).toEqual(["sent"]);
  });
});
