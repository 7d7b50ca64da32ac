// Migration 0032 brings care plan visit jobs made before it forward: every job a plan_visits row points
// at carries origin 'plan', so it reads as paid by the plan, not the warranty (coverWords in
// lib/repairs/states.ts). A real SQLite file migrated up to the migration before, filled with raw rows,
// then migrated on. All data is invented.
import fs from "node:fs";
import os from "node:os";
import path from "node:path";
import { eq } from "drizzle-orm";
import { describe, expect, it } from "vitest";
import { applyMigrations } from "@/db/migrate";
import { repairJobs } from "@/db/schema";
import { jobFigures } from "@/lib/repairs/figures";
import { databaseBefore, fillRow } from "../support/migrated-before";

const MIGRATION = "0032_plan_visit_jobs_origin";

describe(`migration ${MIGRATION}`, () => {
  it("marks the jobs of plan visits as the plan's and leaves every other job as it was", () => {
    const dir = fs.mkdtempSync(path.join(os.tmpdir(), "gw-plan-origin-"));
    const db = databaseBefore(dir, MIGRATION);
    try {
      fillRow(db, "users", "row-users", { email: "plan-origin@test.example" });
      fillRow(db, "studios", "row-studios");
      fillRow(db, "pieces", "row-pieces");
      fillRow(db, "plan_templates", "row-plan_templates");
      fillRow(db, "plan_subscriptions", "row-plan_subscriptions");
      const job = (id: string, origin: string) => fillRow(db, "repair_jobs", id, { origin, covered_pct: 60, subtotal_minor: 20_000, covered_minor: 12_000, net_minor: 8_000, tax_minor: 0, total_minor: 8_000, lines: "[]", pricing_rules: "{}" });
      job("job-plan-visit", "studio");
      job("job-studio", "studio");
      job("job-claim", "claim");
      fillRow(db, "plan_visits", "visit-with-job", { due_on: "2027-01-15", job_id: "job-plan-visit" });
      // A visit claimed whose job was deleted since (ON DELETE SET NULL): nothing to bring forward.
      fillRow(db, "plan_visits", "visit-without-job", { due_on: "2027-07-15", job_id: null });
      const origins = () => Object.fromEntries((db.$client.prepare("SELECT id, origin FROM repair_jobs ORDER BY id").all() as { id: string; origin: string }[]).map((r) => [r.id, r.origin]));
      expect(origins()).toEqual({ "job-claim": "claim", "job-plan-visit": "studio", "job-studio": "studio" });

      applyMigrations(db);

      expect(origins()).toEqual({ "job-claim": "claim", "job-plan-visit": "plan", "job-studio": "studio" });
      const read = (id: string) => {
        const { origin, coveredPct } = db.select({ origin: repairJobs.origin, coveredPct: repairJobs.coveredPct }).from(repairJobs).where(eq(repairJobs.id, id)).get()!;
        return jobFigures({ origin, coveredPct, currency: "USD", subtotalMinor: 20_000, coveredMinor: 12_000, netMinor: 8_000, taxMinor: 0, totalMinor: 8_000, title: "Invented", lines: [], pricingRules: {} }, { country: "US", taxNumber: "" }).coveredLabel;
      };
      expect(read("job-plan-visit")).toBe("Paid by the care plan (60 %)");
      expect(read("job-studio")).toBe("Covered by the warranty (60 %)");
    } finally {
      db.$client.close();
      fs.rmSync(dir, { recursive: true, force: true });
    }
  });
});
