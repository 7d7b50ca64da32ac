// Ten bookings of one technician's slot at the same moment, from ten separate processes (ten SQLite
// connections to the same file), each for a different paid job: exactly one wins, nine get 409.
import { execFile } from "node:child_process";
import path from "node:path";
import { promisify } from "node:util";
import { and, eq } from "drizzle-orm";
import { describe, expect, it } from "vitest";
import { getDb } from "@/db/client";
import { repairJobs, visits } from "@/db/schema";
import { listJobSlots } from "@/lib/visits/slots";
import { addJob, staffActor, visitWorld } from "./visits-helpers";

const run = promisify(execFile);
const NOW = Date.parse("2027-05-03T12:00:00Z");

describe("simultaneous bookings", () => {
  it("10 processes book the same slot for 10 jobs → one 201, nine 409, one visit in the database", async () => {
    const w = await visitWorld();
    const jobs = [w.job, ...Array.from({ length: 9 }, () => addJob(w.studio, w.piece.id, w.owner.id, w.product.id, "paid"))];
    const slot = listJobSlots(staffActor(w.staff), w.job.id, { from: "2027-05-10T00:00:00Z", to: "2027-05-11T00:00:00Z" }, NOW).slots[0]!;
    const goAt = Date.now() + 6000; // every process is started and connected well before this
    const child = path.resolve("tests/integration/visits-concurrency.child.ts");
    const results = await Promise.all(
      jobs.map((j) =>
        run(process.execPath, ["--conditions=react-server", "--import", "tsx", child, w.studio.id, j.id, slot.technicianId, slot.start, String(NOW), String(goAt)], { env: process.env, timeout: 60_000 }).then((r) => JSON.parse(r.stdout).status as number),
      ),
    );
    expect(results.filter((s) => s === 201)).toHaveLength(1);
    expect(results.filter((s) => s === 409)).toHaveLength(9);
    const booked = getDb().select().from(visits).where(and(eq(visits.studioId, w.studio.id), eq(visits.state, "booked"))).all();
    expect(booked).toHaveLength(1);
    expect(booked[0]!.startAt.toISOString()).toBe(slot.start);
    const states = getDb().select({ state: repairJobs.state }).from(repairJobs).where(eq(repairJobs.studioId, w.studio.id)).all().map((r) => r.state).sort();
    expect(states).toEqual([...Array(9).fill("paid"), "scheduled"]);
  }, 90_000);
});
