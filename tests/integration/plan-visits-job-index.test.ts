// A job's page finds the care plan visit it is by job (lib/repairs/jobs.ts planVisitOfJob), through
// plan_visits_job_idx (migration 0033) rather than by reading every plan visit of the studio. Checked on
// the migrated test database with EXPLAIN QUERY PLAN; the numbers for a 40,000-visit studio are in the
// commit that added the index. Invented ids; no rows are needed to plan the statement. The file has a
// database of its own: the run's shared one carries whatever statistics other files' rows and the
// connection's PRAGMA optimize (db/client.ts) left, which can change the chosen index with the order
// and timing of the other files (it failed once under load and passed alone).
import { describe, expect, it } from "vitest";
import { getDb } from "@/db/client";
import { planVisitOfJob } from "@/lib/repairs/jobs";
import { ownDatabaseFile } from "./reminders-helpers";

ownDatabaseFile("plan-visits-job-index");

describe("plan visits by job", () => {
  it("the job page's lookup searches plan_visits by job_id", () => {
    const { sql, params } = planVisitOfJob({ id: "job-invented", studioId: "studio-invented" }).toSQL();
    const plan = getDb().$client.prepare(`EXPLAIN QUERY PLAN ${sql}`).all(...params) as { detail: string }[];
    const visits = plan.map((r) => r.detail).find((d) => /\bplan_visits\b/.test(d));
    expect(visits).toBe("SEARCH plan_visits USING INDEX plan_visits_job_idx (job_id=?)");
  });
});
