// No server-only import: the inbound mail listener (lib/mail/inbound.ts) runs under tsx and records owners' e-mailed answers.
import { auditLog } from "@/db/schema";
import type { Db } from "@/db/client";

type Tx = Pick<Db, "insert">;

export type AuditInput = {
  studioId: string | null;
  actorId: string | null;
  action: string;
  subjectType: string;
  subjectId: string;
  data?: Record<string, unknown>;
};

/** Writes one audit row; pass the transaction so the row lands (or not) with the change it records. */
export function recordAudit(tx: Tx, entry: AuditInput): void {
  tx.insert(auditLog).values({ ...entry, data: entry.data ?? {} }).run();
}
