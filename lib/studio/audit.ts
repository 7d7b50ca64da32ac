import "server-only";
// The studio's audit log (issue 10): who did what and when, newest first, filterable by kind of
// change, person and period. Staff and admins read it; rows are the studio's own.
import { and, count, desc, eq, gte, like, lt, or, sql, type SQL } from "drizzle-orm";
import { getDb } from "@/db/client";
import { auditLog, memberships, users } from "@/db/schema";
import type { StudioContext } from "@/lib/auth/guards";
import { addDays, localDateTime, zonedTimeToEpochMs } from "@/lib/care/dates";
import { forbidden } from "@/lib/errors";
import { AUDIT_GROUPS, auditQuerySchema, type AuditQuery } from "./audit-query";

export const AUDIT_PAGE_SIZE = 50;

const ACTION_LABELS: Record<string, string> = {
  "claim.submitted": "Claim filed",
  "claim.decided": "Claim decided",
  "claim.message": "Message on a claim",
  "claim.info_requested": "Asked the owner for more",
  "claim.photo_added": "Photo added to a claim",
  "claim.photo_removed": "Photo removed from a claim",
  "layer.added": "Finish layer added",
  "layer.updated": "Finish layer edited",
  "layer.moved": "Finish layer moved",
  "layer.removed": "Finish layer removed",
  "piece.created": "Piece recorded",
  "piece.updated": "Piece record edited",
  "piece.archived": "Piece archived",
  "piece.unarchived": "Piece restored",
  "piece.deleted": "Piece deleted",
  "piece.registered": "Piece registered by its owner",
  "piece.released": "Piece released by its owner",
  "piece.code_reissued": "Registration code reissued",
  "pieces.imported": "Pieces imported",
  "photo.added": "Photo added to a piece",
  "care_log.added": "Care logged",
  "care_log.corrected": "Care log corrected",
  "care_log.deleted": "Care log entry removed",
  "job.created": "Repair job created",
  "job.quote_edited": "Quote edited",
  "job.quote_sent": "Quote sent",
  "job.paid": "Repair paid",
  "job.cancelled": "Repair job cancelled",
  "payment.refunded": "Refund issued",
  "refresh_offer.accepted": "Refresh offer accepted",
  "member.invited": "Invitation sent",
  "member.joined": "Joined the team",
  "member.role_changed": "Role changed",
  "member.removed": "Removed from the team",
  "settings.profile_updated": "Studio profile or rates changed",
  "settings.reminder_timing_updated": "Reminder timing changed",
  "settings.visit_rules_updated": "Visit booking rules changed",
  "policy.version_created": "New warranty policy version",
  "finish_product.created": "Finish product added",
  "finish_product.updated": "Finish product edited",
  "finish_product.archived": "Finish product archived",
};

export function actionLabel(action: string): string {
  if (ACTION_LABELS[action]) return ACTION_LABELS[action];
  if (action.startsWith("claim.")) return `Claim moved to ${action.slice(6).replace(/_/g, " ")}`;
  const s = action.replace(/[._]/g, " ");
  return s.charAt(0).toUpperCase() + s.slice(1);
}

const SUBJECT_PATHS: Record<string, string> = { piece: "/studio/pieces/", claim: "/studio/claims/", job: "/studio/jobs/", repair_job: "/studio/jobs/" };

export type AuditRow = {
  id: string;
  at: Date;
  /** "2026-03-04 14:05" in the studio's time zone. */
  local: string;
  actor: string | null;
  action: string;
  label: string;
  subjectType: string;
  subjectId: string;
  href: string | null;
  details: string[];
};

/** A few readable lines from an entry's data (the keys most entries carry). */
function describe(data: Record<string, unknown>): string[] {
  const out: string[] = [];
  const str = (v: unknown) => (typeof v === "string" || typeof v === "number" || typeof v === "boolean" ? String(v) : v == null ? "—" : JSON.stringify(v));
  if ("from" in data && "to" in data && typeof data.from !== "object") out.push(`${str(data.from)} → ${str(data.to)}`);
  for (const key of ["name", "title", "email", "role", "decision", "reason", "amount", "amountMinor", "version", "effectiveFrom", "via"]) {
    if (key in data && data[key] != null && typeof data[key] !== "object") out.push(`${key}: ${str(data[key])}`);
  }
  if (Array.isArray(data.changes)) out.push(...(data.changes as unknown[]).slice(0, 6).map(str));
  if (data.changed && typeof data.changed === "object") {
    for (const [k, v] of Object.entries(data.changed as Record<string, { from: unknown; to: unknown }>).slice(0, 8)) out.push(`${k}: ${str(v?.from)} → ${str(v?.to)}`);
  }
  return out;
}

function pad(n: number) {
  return String(n).padStart(2, "0");
}

export function listAudit(ctx: StudioContext, raw: unknown) {
  if (ctx.role !== "admin" && ctx.role !== "staff") throw forbidden("The audit log is for the studio's admins and staff.");
  const q: AuditQuery = auditQuerySchema.parse(raw ?? {});
  const tz = ctx.studio.timeZone;
  const conds: (SQL | undefined)[] = [eq(auditLog.studioId, ctx.studio.id)];
  if (q.group) conds.push(or(...AUDIT_GROUPS[q.group].prefixes.map((p) => (p.endsWith(".") ? like(auditLog.action, `${p}%`) : eq(auditLog.action, p)))));
  if (q.actor) conds.push(eq(auditLog.actorId, q.actor));
  if (q.from) conds.push(gte(auditLog.createdAt, new Date(zonedTimeToEpochMs(q.from, 0, tz))));
  if (q.to) conds.push(lt(auditLog.createdAt, new Date(zonedTimeToEpochMs(addDays(q.to, 1), 0, tz))));
  const where = and(...conds);
  const db = getDb();
  const total = db.select({ n: count() }).from(auditLog).where(where).get()?.n ?? 0;
  const rows = db
    .select({ e: auditLog, actor: users.name })
    .from(auditLog)
    .leftJoin(users, eq(users.id, auditLog.actorId))
    .where(where)
    // rowid breaks ties between rows written in the same millisecond: newest written first.
    .orderBy(desc(auditLog.createdAt), desc(sql`${auditLog}.rowid`))
    .limit(AUDIT_PAGE_SIZE)
    .offset((q.page - 1) * AUDIT_PAGE_SIZE)
    .all()
    .map(({ e, actor }): AuditRow => {
      const l = localDateTime(e.createdAt.getTime(), tz);
      const base = SUBJECT_PATHS[e.subjectType];
      return {
        id: e.id,
        at: e.createdAt,
        local: `${l.year}-${pad(l.month)}-${pad(l.day)} ${pad(l.hour)}:${pad(l.minute)}`,
        actor,
        action: e.action,
        label: actionLabel(e.action),
        subjectType: e.subjectType,
        subjectId: e.subjectId,
        href: base ? base + e.subjectId : null,
        details: describe(e.data ?? {}),
      };
    });
  // People to filter by: the studio's members, and anyone else who appears in its log (owners, former staff).
  const people = db
    .selectDistinct({ id: users.id, name: users.name })
    .from(auditLog)
    .innerJoin(users, eq(users.id, auditLog.actorId))
    .where(eq(auditLog.studioId, ctx.studio.id))
    .all();
  const members = new Set(db.select({ id: memberships.userId }).from(memberships).where(eq(memberships.studioId, ctx.studio.id)).all().map((m) => m.id));
  return {
    query: q,
    total,
    pageSize: AUDIT_PAGE_SIZE,
    rows,
    people: people.map((p) => ({ ...p, member: members.has(p.id) })).sort((a, b) => Number(b.member) - Number(a.member) || a.name.localeCompare(b.name)),
  };
}
