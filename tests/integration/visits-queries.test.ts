// How many SQL statements the technician list, the slot search and the technician's day run, counted on
// the real SQLite file: every execution of a prepared statement (all, get, run, iterate) of the app's
// connection while the call runs. Each must stay the same whether the studio has 1 or 5 technicians
// (a day with 1 or 4 visits): a read per technician or per visit would grow with them. All data is invented.
import type Database from "better-sqlite3";
import { describe, expect, it } from "vitest";
import { getDb } from "@/db/client";
import { memberships, type Studio } from "@/db/schema";
import type { StudioContext } from "@/lib/auth/guards";
import { bookVisit } from "@/lib/visits/book";
import { listJobSlots } from "@/lib/visits/slots";
import { technicianDay } from "@/lib/visits/technician-day";
import { listTechnicians, putTechnicianHours } from "@/lib/visits/technicians";
import { createPiece, memberContext } from "../support/fixtures";
import { addJob, ownerActor, staffActor, visitWorld, WEEKDAYS_9_TO_5 } from "./visits-helpers";

const NOW = Date.parse("2027-05-03T12:00:00Z"); // Monday 3 May 2027, 08:00 in New York
const WINDOW = { from: "2027-05-04T00:00:00Z", to: "2027-05-11T00:00:00Z" };

/** Runs `fn` and answers how many statements the app's connection executed meanwhile, with its result. */
function countStatements<T>(fn: () => T): { n: number; sql: string[]; result: T } {
  const sqlite: Database.Database = getDb().$client;
  const proto = Object.getPrototypeOf(sqlite.prepare("SELECT 1")) as Record<string, (...a: unknown[]) => unknown>;
  const methods = ["all", "get", "run", "iterate"] as const;
  const saved = methods.map((m) => proto[m]!);
  const sql: string[] = [];
  methods.forEach((m, i) => {
    proto[m] = function (this: Database.Statement, ...args: unknown[]) {
      sql.push(this.source);
      return saved[i]!.apply(this, args);
    };
  });
  try {
    const result = fn();
    return { n: sql.length, sql, result };
  } finally {
    methods.forEach((m, i) => (proto[m] = saved[i]!));
  }
}

/** Another technician of the studio with the same weekday hours and a day off. */
async function addTechnician(studio: Studio, staff: StudioContext): Promise<StudioContext> {
  const tech = await memberContext(studio, "technician");
  putTechnicianHours(staff, tech.user.id, { hours: WEEKDAYS_9_TO_5, timeOff: [{ date: "2027-05-06", start: null, end: null, note: "Course (invented)" }] });
  return tech;
}

describe("statements per request do not grow with the team or the day", () => {
  it("the technician list: the same count for 1 and 5 technicians", async () => {
    const w = await visitWorld();
    const one = countStatements(() => listTechnicians(w.staff));
    expect(one.result).toHaveLength(1);
    for (let i = 0; i < 4; i++) await addTechnician(w.studio, w.staff);
    const five = countStatements(() => listTechnicians(w.staff));
    expect(five.result).toHaveLength(5);
    expect(five.result.filter((t) => t.timeOff.length === 1)).toHaveLength(4);
    expect(five.n).toBe(one.n);
    expect(five.n).toBeLessThanOrEqual(3);
  });

  it("the slot search: the same count for 1 and 5 technicians, and every technician's slots found", async () => {
    const w = await visitWorld();
    const one = countStatements(() => listJobSlots(ownerActor(w.owner), w.job.id, WINDOW, NOW));
    const techs = [w.tech];
    for (let i = 0; i < 4; i++) techs.push(await addTechnician(w.studio, w.staff));
    // One booked visit, so the booked-visits read has a row to keep out.
    const first = one.result.slots[0]!;
    await bookVisit(staffActor(w.staff), { jobId: addJob(w.studio, w.piece.id, w.owner.id, w.product.id).id, technicianId: first.technicianId, start: first.start }, NOW);
    const five = countStatements(() => listJobSlots(ownerActor(w.owner), w.job.id, WINDOW, NOW));
    expect(new Set(five.result.slots.map((s) => s.technicianId))).toEqual(new Set(techs.map((t) => t.user.id)));
    expect(five.result.slots.some((s) => s.technicianId === first.technicianId && s.start === first.start)).toBe(false);
    // The day off (Thursday 6 May in New York) has no slot of the technicians who took it.
    expect(five.result.slots.some((s) => s.localDate === "2027-05-06" && s.technicianId !== w.tech.user.id)).toBe(false);
    expect(five.n).toBe(one.n);
    expect(five.n).toBeLessThanOrEqual(9);
  });

  it("the technician's day: the same count for 1 and 4 visits", async () => {
    const w = await visitWorld();
    const slots = listJobSlots(staffActor(w.staff), w.job.id, { from: "2027-05-04T12:00:00Z", to: "2027-05-05T04:00:00Z" }, NOW).slots.filter((s) => s.technicianId === w.tech.user.id);
    const day = slots[0]!.localDate;
    await bookVisit(staffActor(w.staff), { jobId: w.job.id, technicianId: w.tech.user.id, start: slots[0]!.start }, NOW);
    const one = countStatements(() => technicianDay(w.tech, { date: day }, NOW));
    expect(one.result.items).toHaveLength(1);
    for (let i = 0; i < 3; i++) {
      const { piece } = createPiece(w.studio, { ownerId: w.owner.id, deliveryAddress: `${i + 6} Test Road, Testville (invented)` });
      const job = addJob(w.studio, piece.id, w.owner.id, w.product.id);
      const free = listJobSlots(staffActor(w.staff), job.id, { from: "2027-05-04T12:00:00Z", to: "2027-05-05T04:00:00Z" }, NOW).slots.find((s) => s.technicianId === w.tech.user.id)!;
      await bookVisit(staffActor(w.staff), { jobId: job.id, technicianId: w.tech.user.id, start: free.start }, NOW);
    }
    const four = countStatements(() => technicianDay(w.tech, { date: day }, NOW));
    expect(four.result.items).toHaveLength(4);
    expect(four.n).toBe(one.n);
  });

  it("counts what the connection runs (the counter itself: one statement per read)", async () => {
    const w = await visitWorld();
    const { n } = countStatements(() => getDb().select().from(memberships).all().length + getDb().select().from(memberships).all().length);
    expect(n).toBe(2);
    void w;
  });
});
