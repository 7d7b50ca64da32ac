// Who among owners reaches a repair job, written once and used by every owner query of jobs and visits
// (lib/repairs/jobs.ts, lib/visits/visit-row.ts, lib/visits/mail.tsx). No server-only import: the
// scheduler's visit mail uses it too.
//
// An owner reaches a job of theirs (repair_jobs.owner_id) fully — sees it, approves, pays, books and
// moves its visits, gets its visit mail — only while they hold its piece. When the piece has been
// handed on (released or transferred, pieces.owner_id is someone else or nobody), the former owner
// keeps only the jobs they paid for, as history: the job and its payments, never its visits or the
// piece's address (which may now be the new owner's). Studio staff reach jobs by studio, elsewhere.
import { and, eq, exists, inArray, or, sql, type SQL } from "drizzle-orm";
import { getDb } from "@/db/client";
import { payments, pieces, repairJobs } from "@/db/schema";

/** "act": everything about the job; "history": a former owner's paid job, read-only, no visits. */
export type OwnerReach = "act" | "history";

/** Payments that make a job the payer's history (money changed hands, refunded or not). */
const PAID_STATUSES = ["paid", "partially_refunded", "refunded"] as const;

function holdsPiece(userId: string): SQL {
  return exists(
    getDb()
      .select({ one: sql`1` })
      .from(pieces)
      .where(and(eq(pieces.id, repairJobs.pieceId), eq(pieces.ownerId, userId))),
  );
}

function paidFor(): SQL {
  return exists(
    getDb()
      .select({ one: sql`1` })
      .from(payments)
      .where(and(eq(payments.jobId, repairJobs.id), inArray(payments.status, [...PAID_STATUSES]))),
  );
}

/** WHERE over repair_jobs: the jobs this owner reaches ("act"), or also sees as history ("history"). */
export function ownerJobWhere(userId: string, reach: OwnerReach): SQL {
  const holds = holdsPiece(userId);
  return and(eq(repairJobs.ownerId, userId), reach === "act" ? holds : or(holds, paidFor()))!;
}

/** The same rule for rows already read: the job's owner acts on it only while holding its piece. */
export function ownerActsOnJob(job: { ownerId: string | null }, piece: { ownerId: string | null }): boolean {
  return job.ownerId !== null && piece.ownerId === job.ownerId;
}
