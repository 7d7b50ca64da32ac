// The scheduler's refund pass (jobs/job-refunds.ts) reads only refunds still pending, through the partial
// index job_refunds_pending_idx (migration 0035), rather than every refund the studios ever made. Checked on
// a migrated database of the file's own with EXPLAIN QUERY PLAN; no rows are needed to plan the statement
// (the run's shared database carries other files' statistics: tests/integration/plan-visits-job-index.test.ts).
import { describe, expect, it } from "vitest";
import { getDb } from "@/db/client";
import { refundsPendingBefore } from "@/lib/repairs/refunds";
import { ownDatabaseFile } from "./reminders-helpers";

ownDatabaseFile("job-refunds-pending-index");

describe("pending job refunds", () => {
  it("the scheduler's pass searches job_refunds by the pending index", () => {
    const { sql, params } = refundsPendingBefore(new Date("2026-12-05T08:00:00Z")).toSQL();
    const plan = getDb().$client.prepare(`EXPLAIN QUERY PLAN ${sql}`).all(...params) as { detail: string }[];
    expect(plan.map((r) => r.detail)).toEqual(["SEARCH job_refunds USING INDEX job_refunds_pending_idx (created_at<?)"]);
  });
});
