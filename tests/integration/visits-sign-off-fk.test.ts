// visits.signed_off_by_id: deleting the person who signed a visit off keeps the visit and empties the
// field (ON DELETE SET NULL, migration 0021 rebuilds the table for it). Real SQLite files: the run's
// migrated database, and a database migrated up to the migration before, filled, then migrated on, to
// show that the rebuild keeps every visit and every row that refers to one. All data is invented.
import fs from "node:fs";
import os from "node:os";
import path from "node:path";
import { eq } from "drizzle-orm";
import { describe, expect, it } from "vitest";
import { getDb, type Db } from "@/db/client";
import { applyMigrations } from "@/db/migrate";
import { users, visits } from "@/db/schema";
import { bookVisit } from "@/lib/visits/book";
import { listJobSlots } from "@/lib/visits/slots";
import { createUser } from "../support/fixtures";
import { databaseBefore, fillRow } from "../support/migrated-before";
import { staffActor, visitWorld } from "./visits-helpers";

const NOW = Date.parse("2027-05-03T12:00:00Z");
const REBUILD = "0021_visits_signed_off_set_null";

function signedOffFk(db: Db) {
  const fks = db.$client.pragma("foreign_key_list(visits)") as { from: string; table: string; on_delete: string }[];
  return fks.find((f) => f.from === "signed_off_by_id");
}

describe("deleting the user who signed a visit off", () => {
  it("keeps the visit and empties signed_off_by_id", async () => {
    const w = await visitWorld();
    const slot = listJobSlots(staffActor(w.staff), w.job.id, { from: "2027-05-04T12:00:00Z", to: "2027-05-07T00:00:00Z" }, NOW).slots[0]!;
    const visit = await bookVisit(staffActor(w.staff), { jobId: w.job.id, technicianId: slot.technicianId, start: slot.start }, NOW);
    const signer = await createUser({ name: "Signed it off (invented)" });
    getDb().update(visits).set({ signedOffById: signer.id, signedOffAt: new Date(NOW) }).where(eq(visits.id, visit.id)).run();

    expect(signedOffFk(getDb())).toMatchObject({ table: "users", on_delete: "SET NULL" });
    getDb().delete(users).where(eq(users.id, signer.id)).run();
    const row = getDb().select().from(visits).where(eq(visits.id, visit.id)).get();
    expect(row).toBeDefined();
    expect(row!.signedOffById).toBeNull();
    expect(row!.signedOffAt).toEqual(new Date(NOW));
  });
});

describe(`migration ${REBUILD}`, () => {
  it("rebuilds visits keeping every row and what refers to them (photos, mail sends, threads), with the rule in place", () => {
    const dir = fs.mkdtempSync(path.join(os.tmpdir(), "gw-fk-"));
    // The migrations before the rebuild (the later ones run after it, in applyMigrations below).
    const db = databaseBefore(dir, REBUILD);
    try {
      expect(signedOffFk(db)?.on_delete).toBe("NO ACTION");
      // One row in each table on the way to a visit and in each that refers to a visit: every NOT NULL
      // column without a default gets a value, every reference the row it names.
      const sqlite = db.$client;
      const fill = (table: string, id: string, set: Record<string, string> = {}) => fillRow(db, table, id, set);
      fill("users", "row-users", { email: "rebuild@test.example" });
      fill("users", "row-signer", { email: "signer@test.example" });
      fill("studios", "row-studios");
      fill("pieces", "row-pieces");
      fill("repair_jobs", "row-repair_jobs");
      fill("visits", "row-visits", { signed_off_by_id: "row-signer" });
      fill("files", "row-files");
      fill("visit_photos", "row-visit_photos", { visit_id: "row-visits", file_id: "row-files" });
      fill("visit_mail_sends", "row-visit_mail_sends", { visit_id: "row-visits" });
      fill("threads", "row-threads", { visit_id: "row-visits", subject: "visit" });
      const count = (table: string) => (sqlite.prepare(`SELECT count(*) AS n FROM ${table}`).get() as { n: number }).n;
      const counts = () => Object.fromEntries(["visits", "visit_photos", "visit_mail_sends", "threads"].map((t) => [t, count(t)]));
      const visitBefore = sqlite.prepare("SELECT * FROM visits WHERE id = 'row-visits'").get();
      expect(counts()).toEqual({ visits: 1, visit_photos: 1, visit_mail_sends: 1, threads: 1 });

      applyMigrations(db);

      expect(counts()).toEqual({ visits: 1, visit_photos: 1, visit_mail_sends: 1, threads: 1 });
      expect(sqlite.prepare("SELECT * FROM visits WHERE id = 'row-visits'").get()).toEqual(visitBefore);
      expect((sqlite.prepare("SELECT visit_id FROM threads").get() as { visit_id: string }).visit_id).toBe("row-visits");
      expect(signedOffFk(db)).toMatchObject({ table: "users", on_delete: "SET NULL" });
      const indexes = (sqlite.pragma("index_list(visits)") as { name: string }[]).map((i) => i.name).filter((n) => !n.startsWith("sqlite_")).sort();
      expect(indexes).toEqual(["visits_ics_uid_unique", "visits_job_booked_uq", "visits_job_idx", "visits_sign_off_token_hash_unique", "visits_studio_start_idx", "visits_studio_tech_start_idx"]);
      expect(sqlite.pragma("foreign_keys", { simple: true })).toBe(1);

      sqlite.prepare("DELETE FROM users WHERE id = 'row-signer'").run();
      expect(sqlite.prepare("SELECT signed_off_by_id FROM visits WHERE id = 'row-visits'").get()).toEqual({ signed_off_by_id: null });
      expect(counts()).toEqual({ visits: 1, visit_photos: 1, visit_mail_sends: 1, threads: 1 });
    } finally {
      db.$client.close();
      fs.rmSync(dir, { recursive: true, force: true });
    }
  });
});
