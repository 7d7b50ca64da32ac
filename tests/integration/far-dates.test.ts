// Dates far outside any sensible range: refused at the door (one shared zod helper), and rows that
// already hold one (written before the ranges existed, or by hand) don't break the pages that list them.
import { describe, expect, it } from "vitest";
import { getDb } from "@/db/client";
import { careLogEntries, claims, finishLayers } from "@/db/schema";
import { listMyPieces } from "@/lib/owner/pieces";
import { listUpcoming } from "@/lib/reminders/staff";
import { remindersQuerySchema } from "@/lib/validation/reminders";
import { claimRatesCsv } from "@/lib/reports";
import { claimRatesQuerySchema } from "@/lib/reports/query";
import { listAudit } from "@/lib/studio/audit";
import { auditQuerySchema } from "@/lib/studio/audit-query";
import { calendarWeek } from "@/lib/visits/list";
import { technicianDay } from "@/lib/visits/technician-day";
import { createPiece, createStudio, createUser, memberContext } from "../support/fixtures";

const NOW = new Date("2026-12-02T15:00:00Z");

describe("far dates already in the database", () => {
  it("don't break the owner's list, the reminders view, the claims CSV, audit, today and calendar", async () => {
    const studio = createStudio();
    const staff = await memberContext(studio, "admin");
    const owner = await createUser();
    const far = createPiece(studio, { ownerId: owner.id, deliveredOn: "9999-12-31" }).piece;
    const old = createPiece(studio, { ownerId: owner.id, deliveredOn: "0001-01-01" }).piece;
    const normal = createPiece(studio, { ownerId: owner.id }).piece;
    getDb().insert(careLogEntries).values({ studioId: studio.id, pieceId: normal.id, userId: owner.id, source: "owner", taskKind: "reoil", surface: "top", doneOn: "9999-12-31" }).run();
    getDb().insert(finishLayers).values({ studioId: studio.id, pieceId: normal.id, surface: "top", position: 1, finishClass: "hardwax_oil", coats: 1, appliedOn: "9999-12-31" }).run();
    getDb().insert(claims).values({ studioId: studio.id, pieceId: normal.id, ownerId: owner.id, category: "finish_wear", noticedOn: "9999-12-31", description: "Invented test claim.", answers: {} }).run();

    const mine = listMyPieces({ id: owner.id, timeZone: "UTC", unitSystem: "metric" } as never, NOW);
    expect(mine.map((p) => p.id).sort()).toEqual([far.id, old.id, normal.id].sort());
    expect(Array.isArray(listUpcoming(staff, remindersQuerySchema.parse({}), NOW))).toBe(true);
    expect(claimRatesCsv(staff, claimRatesQuerySchema.parse({}), NOW).csv).toContain("species");
    expect(listAudit(staff, auditQuerySchema.parse({})).rows.length).toBeGreaterThanOrEqual(0);
    expect(technicianDay(staff, { date: "9999-12-31" }, NOW.getTime()).date).not.toBe("9999-12-31");
    expect(calendarWeek(staff, "9999-12-31", NOW.getTime()).monday < "2100-01-01").toBe(true);
  });
});
