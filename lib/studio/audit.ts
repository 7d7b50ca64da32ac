import "server-only";
// The studio's audit log: who did what and when, newest first, filterable by kind of
// change, person and period. Staff and admins read it; rows are the studio's own.
import { and, count, desc, eq, gte, like, lt, or, sql, type SQL } from "drizzle-orm";
import { getDb } from "@/db/client";
import { auditLog, memberships, users } from "@/db/schema";
import { assertRole, STAFF_ROLES, type StudioContext } from "@/lib/auth/guards";
import { addDays, zonedTimeToEpochMs } from "@/lib/care/dates";
import { CARE_TASK_LABELS, FINISH_CLASS_LABELS, PIECE_KIND_LABELS, RESIN_LABELS, SUN_LABELS, USE_LABELS } from "@/lib/care/vocabulary";
import { SUGGESTION_LABELS } from "@/lib/claims/coverage-words";
import { CLAIM_CATEGORY_LABELS, CLAIM_DECISION_LABELS, CLAIM_STATE_LABELS_STAFF } from "@/lib/claims/labels";
import { formatDate, formatInstant, formatMoney } from "@/lib/format";
import { JOB_STATE_LABELS } from "@/lib/repairs/states";
import { PLAN_STATE_LABELS, type PlanState } from "@/lib/plans/states";
import { AUDIT_GROUPS, type AuditQuery } from "./audit-query";

export const AUDIT_PAGE_SIZE = 50;

const ACTION_LABELS: Record<string, string> = {
  "claim.submitted": "Claim filed",
  "claim.decided": "Claim decided",
  "claim.message": "Message on a claim",
  "claim.info_requested": "Asked the owner for more",
  "claim.photo_added": "Photo added to a claim",
  "claim.photo_removed": "Photo removed from a claim",
  "claim.withdrawn": "Claim closed: the owner deleted their account",
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
  "piece.handover_sent": "Hand-over mail sent to the buyer",
  "piece.handover_resent": "Hand-over mail sent again, with a fresh link",
  "pieces.imported": "Pieces imported",
  "photo.added": "Photo added to a piece",
  "care_log.added": "Care logged",
  "care_log.corrected": "Care log corrected",
  "care_log.deleted": "Care log entry removed",
  "job.created": "Repair job created",
  "job.quote_edited": "Quote edited",
  "job.quote_sent": "Quote sent",
  "job.handed_on": "Quote set back: the piece changed hands before it was paid",
  "job.paid": "Repair paid",
  "job.cancelled": "Repair job cancelled",
  "job.refunded": "Money given back on a repair",
  "payment.refunded": "Refund issued",
  "payment.refund_due": "Refund owed: the payment service refused it",
  "payment.close_refused": "Payment page close refused by the payment service: not asked again, the page expires on its own",
  "client.created": "Client added",
  "client.updated": "Client details changed",
  "client.exported": "Client's data exported",
  "client.erased": "Client erased on request",
  "member.invitation_withdrawn": "Invitation withdrawn",
  "technician.hours_set": "Technician's hours changed",
  "thread.message": "Message on a conversation",
  "thread.updated": "Conversation assigned or closed",
  "visit.booked": "Visit booked",
  "visit.moved": "Visit moved",
  "visit.cancelled": "Visit cancelled",
  "visit.photo_added": "Photo added to a visit report",
  "visit.reported": "Visit report filed",
  "visit.signed_off": "Visit signed off by the owner",
  "refresh_offer.accepted": "Refresh offer accepted",
  "account.email_change_asked": "Owner asked to change their e-mail address",
  "account.email_change_cancelled": "Owner cancelled a change of e-mail address",
  "account.email_changed": "Owner's e-mail address changed",
  "account.deleted": "Owner deleted their account",
  "member.invited": "Invitation sent",
  "member.joined": "Joined the team",
  "member.role_changed": "Role changed",
  "member.removed": "Removed from the team",
  "studio.created": "Studio started",
  "settings.profile_updated": "Studio profile or rates changed",
  "settings.reminder_timing_updated": "Reminder timing changed",
  "settings.visit_rules_updated": "Visit booking rules changed",
  "settings.repair_prices_updated": "Repair prices, rounding or tax changed",
  "settings.logo_changed": "Studio logo changed",
  "settings.accent_changed": "Studio colour changed",
  "settings.stripe_key_saved": "Stripe key checked and saved",
  "settings.stripe_webhook_secret_saved": "Stripe webhook signing secret saved",
  "settings.mail_sender_saved": "E-mail sender name or reply address changed",
  "policy.version_created": "New warranty policy version",
  "finish_product.created": "Finish product added",
  "finish_product.updated": "Finish product edited",
  "finish_product.archived": "Finish product archived",
  "handover_batch.created": "Hand-over mailing started",
  "plan.checkout_started": "Care plan checkout started by the owner",
  "plan.changed_hands": "Care plan moved to the piece's new owner",
  "plan.payment_held": "Care plan payment held: its amount isn't the plan's price",
  "plan.held_payment_settled": "Held care plan payment settled by staff",
  "plan.payment_refunded_automatically": "Care plan payment nobody owed paid back automatically (a renewal after the plan's end, or a second plan for a piece already covered)",
  "plan.transfer_finished": "Care plan move finished with the payment service",
  "plan.refund_claimed": "Care plan refund set aside on cancellation",
  "plan.refunded": "Care plan refund paid",
  "plan.refund_refused": "Care plan refund refused by the payment service: to be paid back another way",
  "plan_template.created": "Care plan added",
  "plan_template.changed": "Care plan changed (new version)",
};

/** Every action written with a fixed name has a label here (tests/unit/audit-labels.test.ts). */
export const AUDIT_ACTION_LABELS: Readonly<Record<string, string>> = ACTION_LABELS;

export function actionLabel(action: string): string {
  if (ACTION_LABELS[action]) return ACTION_LABELS[action];
  const claimState = action.startsWith("claim.") ? CLAIM_STATE_LABELS_STAFF[action.slice(6) as keyof typeof CLAIM_STATE_LABELS_STAFF] : undefined;
  if (claimState) return `Claim moved to “${claimState}”`;
  const planState = action.startsWith("plan.") ? PLAN_STATE_LABELS[action.slice(5) as PlanState] : undefined;
  if (planState) return `Care plan moved to “${planState}”`;
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

const KEY_WORDS: Record<string, string> = {
  name: "Name",
  title: "Title",
  email: "E-mail",
  role: "Role",
  decision: "Decision",
  coveredPct: "Covered share",
  reason: "Reason",
  amount: "Amount",
  amountMinor: "Amount",
  totalMinor: "Total",
  refundedMinor: "Refunded",
  priceMinor: "Price",
  version: "Version",
  quoteVersion: "Quote version",
  effectiveFrom: "In force from",
  via: "Via",
  suggestion: "Coverage check suggested",
  category: "Kind of damage",
  taskKind: "Care task",
  doneOn: "Done on",
  finishClass: "Finish class",
  kind: "Kind",
  use: "Use",
  sun: "Sun",
  resinKind: "Resin",
  surface: "Surface",
  coats: "Coats",
  appliedOn: "Applied on",
  deliveredOn: "Delivered on",
  signOffName: "Signed off by",
};

const ROLE_WORDS: Record<string, string> = { admin: "Admin", staff: "Staff", technician: "Technician", owner: "Owner" };
const SURFACE_WORDS: Record<string, string> = { top: "Top", base: "Base", edges: "Edges", whole_piece: "Whole piece" };

/** One label map per enumeration: a stored value as the words the screens use for it. */
const VALUE_WORDS: Record<string, Record<string, string>> = {
  role: ROLE_WORDS,
  decision: CLAIM_DECISION_LABELS,
  suggestion: SUGGESTION_LABELS,
  category: CLAIM_CATEGORY_LABELS,
  taskKind: CARE_TASK_LABELS,
  finishClass: FINISH_CLASS_LABELS,
  kind: PIECE_KIND_LABELS,
  use: USE_LABELS,
  sun: SUN_LABELS,
  resinKind: RESIN_LABELS,
  surface: SURFACE_WORDS,
};

const MONEY_KEYS = new Set(["amountMinor", "totalMinor", "refundedMinor", "priceMinor"]);
const DATE_KEYS = new Set(["effectiveFrom", "doneOn", "appliedOn", "deliveredOn"]);

/** A key as words: a known label, else its camelCase or snake_case split ("reasonCode" → "Reason code"). */
function keyWords(key: string): string {
  if (KEY_WORDS[key]) return KEY_WORDS[key];
  const s = key.replace(/([a-z])([A-Z])/g, "$1 $2").replace(/[._]/g, " ").toLowerCase();
  return s.charAt(0).toUpperCase() + s.slice(1);
}

/** A value as words: enumerations through their label maps, money in the studio's currency, dates written out. */
function valueWords(key: string, v: unknown, currency: string, action = "", country = "US"): string {
  if (v == null) return "—";
  if (typeof v === "boolean") return v ? "yes" : "no";
  if (typeof v === "number" && MONEY_KEYS.has(key)) {
    try {
      return formatMoney(v, currency, country);
    } catch {
      return String(v);
    }
  }
  if (typeof v === "number" && key === "coveredPct") return `${v} %`;
  if (typeof v !== "string") return typeof v === "number" ? String(v) : JSON.stringify(v);
  if (DATE_KEYS.has(key) && /^\d{4}-\d{2}-\d{2}$/.test(v)) return formatDate(v);
  if ((key === "from" || key === "to") && action.startsWith("claim.")) return CLAIM_STATE_LABELS_STAFF[v as keyof typeof CLAIM_STATE_LABELS_STAFF] ?? v.replace(/_/g, " ");
  if ((key === "from" || key === "to") && (action.startsWith("job.") || action.startsWith("repair_job."))) return JOB_STATE_LABELS[v as keyof typeof JOB_STATE_LABELS] ?? v.replace(/_/g, " ");
  if ((key === "from" || key === "to") && action.startsWith("plan.")) return PLAN_STATE_LABELS[v as PlanState] ?? v.replace(/_/g, " ");
  const map = VALUE_WORDS[key];
  if (map) return map[v] ?? v.replace(/_/g, " ");
  return v;
}

/** A few readable lines from an entry's data (the keys most entries carry), in words, never raw enum values. */
export function describe(data: Record<string, unknown>, currency = "USD", action = "", country = "US"): string[] {
  const out: string[] = [];
  if ("from" in data && "to" in data && typeof data.from !== "object") out.push(`${valueWords("from", data.from, currency, action, country)} → ${valueWords("to", data.to, currency, action, country)}`);
  for (const key of ["name", "title", "email", "role", "decision", "coveredPct", "suggestion", "category", "taskKind", "reason", "amount", "amountMinor", "totalMinor", "refundedMinor", "version", "quoteVersion", "effectiveFrom", "via"]) {
    if (key in data && data[key] != null && typeof data[key] !== "object") out.push(`${keyWords(key)}: ${valueWords(key, data[key], currency, action, country)}`);
  }
  if (Array.isArray(data.changes)) out.push(...(data.changes as unknown[]).slice(0, 6).map((c) => (typeof c === "string" ? c : JSON.stringify(c))));
  if (data.changed && typeof data.changed === "object") {
    for (const [k, v] of Object.entries(data.changed as Record<string, { from: unknown; to: unknown }>).slice(0, 8)) {
      out.push(`${keyWords(k)}: ${valueWords(k, v?.from, currency, action, country)} → ${valueWords(k, v?.to, currency, action, country)}`);
    }
  }
  return out;
}

export function listAudit(ctx: StudioContext, q: AuditQuery) {
  assertRole(ctx, STAFF_ROLES, "The audit log is for the studio's admins and staff.");
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
      const base = SUBJECT_PATHS[e.subjectType];
      return {
        id: e.id,
        at: e.createdAt,
        local: formatInstant(e.createdAt, tz, { time: true }),
        actor,
        action: e.action,
        label: actionLabel(e.action),
        subjectType: e.subjectType,
        subjectId: e.subjectId,
        href: base ? base + e.subjectId : null,
        details: describe(e.data ?? {}, ctx.studio.currency, e.action, ctx.studio.country),
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
