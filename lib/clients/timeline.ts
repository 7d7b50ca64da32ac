import "server-only";
import { getDb, perConnection } from "@/db/client";
import type { StudioContext } from "@/lib/auth/guards";
import { CARE_LOG_SOURCE_WORDS, CARE_TASK_LABELS, type CareTaskKind, type ClaimCategory } from "@/lib/care/vocabulary";
import { CLAIM_CATEGORY_LABELS, decisionText } from "@/lib/claims/labels";
import type { ClaimDecision } from "@/lib/claims/states";
import { loadClient } from "./access";
import { CONSENT_KIND_NAMES, type ConsentKind } from "./vocabulary";
import { formatDate, formatInstant, formatMoney } from "@/lib/format";
import type { RepairJob } from "@/db/schema";
import { jobAmountText } from "@/lib/repairs/states";

// One list of everything that happened with a client, newest first, read from the tables that
// record it: their pieces' deliveries, registrations and hand-overs, hand-over mail sent, care logged, reminders sent
// (both send ledgers), claims filed and decided, repair jobs quoted, paid, done, cancelled and
// refunded, visits booked, done and cancelled, and the changes to the client record itself. One
// UNION ALL query ordered and limited by SQLite, so a long history costs only the page asked for.

export const TIMELINE_KINDS = [
  "delivered",
  "registered",
  "took_over",
  "released",
  "handover",
  "care",
  "reminder",
  "visit_reminder",
  "claim_filed",
  "claim_decided",
  "message",
  "job_quoted",
  "job_paid",
  "job_done",
  "job_cancelled",
  "refund",
  "visit_booked",
  "visit_done",
  "visit_cancelled",
  "note",
] as const;
export type TimelineKind = (typeof TIMELINE_KINDS)[number];

export type TimelineEntry = {
  key: string;
  kind: TimelineKind;
  /** ISO instant; for a delivery (a calendar date) noon UTC of that day, with allDay set. */
  at: string;
  allDay: boolean;
  title: string;
  href: string | null;
};
export type Timeline = { entries: TimelineEntry[]; hasMore: boolean; timeZone: string };

type Row = { kind: TimelineKind; at: number; ref: string; title: string | null; a: string | null; b: string | null; n: number | null; cur: string | null };

// Branches keyed by the client (:client) and, for what an account did, by its user (:user; null
// matches nothing). Every branch is scoped to the studio (:studio) and reaches its rows by an index.
const TIMELINE_SQL = `
SELECT * FROM (
  SELECT 'delivered' AS kind, CAST((julianday(p.delivered_on) - 2440587.5) * 86400000 AS INTEGER) + 43200000 AS at, p.id AS ref, p.title, NULL AS a, NULL AS b, NULL AS n, NULL AS cur
    FROM pieces p WHERE p.client_id = :client AND p.studio_id = :studio
  UNION ALL
  SELECT CASE o.via WHEN 'transfer' THEN 'took_over' ELSE 'registered' END, o.started_at, o.piece_id, p.title, NULL, NULL, NULL, NULL
    FROM ownerships o JOIN pieces p ON p.id = o.piece_id WHERE o.user_id = :user AND o.studio_id = :studio
  UNION ALL
  SELECT 'released', o.ended_at, o.piece_id, p.title, NULL, NULL, NULL, NULL
    FROM ownerships o JOIN pieces p ON p.id = o.piece_id WHERE o.user_id = :user AND o.studio_id = :studio AND o.ended_at IS NOT NULL
  UNION ALL
  SELECT 'handover', h.last_sent_at, h.piece_id, p.title, NULL, NULL, h.send_count, NULL
    FROM piece_handovers h JOIN pieces p ON p.id = h.piece_id WHERE h.client_id = :client AND h.studio_id = :studio AND h.last_sent_at IS NOT NULL  UNION ALL
  SELECT 'care', e.created_at, e.piece_id, p.title, e.task_kind, e.done_on, NULL, e.source
    FROM pieces p JOIN care_log_entries e ON e.piece_id = p.id WHERE p.client_id = :client AND p.studio_id = :studio
  UNION ALL
  SELECT 'care', e.created_at, e.piece_id, p.title, e.task_kind, e.done_on, NULL, e.source
    FROM (SELECT DISTINCT piece_id FROM ownerships WHERE user_id = :user AND studio_id = :studio) o
    JOIN pieces p ON p.id = o.piece_id JOIN care_log_entries e ON e.piece_id = o.piece_id
    WHERE e.user_id = :user AND p.client_id IS NOT :client
  UNION ALL
  SELECT 'reminder', r.sent_at, r.piece_id, p.title, r.task_kind, r.due_on, NULL, NULL
    FROM (SELECT DISTINCT piece_id FROM ownerships WHERE user_id = :user AND studio_id = :studio) o
    JOIN pieces p ON p.id = o.piece_id JOIN reminder_sends r ON r.piece_id = o.piece_id
    WHERE r.user_id = :user AND r.status = 'sent' AND r.sent_at IS NOT NULL
  UNION ALL
  SELECT 'visit_reminder', s.sent_at, j.id, j.title, NULL, NULL, v.start_at, NULL
    FROM repair_jobs j JOIN visits v ON v.job_id = j.id JOIN visit_mail_sends s ON s.visit_id = v.id
    WHERE j.owner_id = :user AND j.studio_id = :studio AND s.status = 'sent' AND s.sent_at IS NOT NULL
  UNION ALL
  SELECT 'claim_filed', k.created_at, k.id, p.title, k.category, NULL, NULL, NULL
    FROM claims k JOIN pieces p ON p.id = k.piece_id WHERE k.owner_id = :user AND k.studio_id = :studio
  UNION ALL
  SELECT 'claim_decided', k.decided_at, k.id, p.title, k.decision, NULL, k.covered_pct, NULL
    FROM claims k JOIN pieces p ON p.id = k.piece_id WHERE k.owner_id = :user AND k.studio_id = :studio AND k.decided_at IS NOT NULL AND k.decision IS NOT NULL
  UNION ALL
  SELECT 'message', m.created_at, t.id, p.title, m.author, m.source, NULL, t.subject
    FROM threads t JOIN thread_messages m ON m.thread_id = t.id JOIN pieces p ON p.id = t.piece_id WHERE t.owner_id = :user AND t.studio_id = :studio
  UNION ALL
  SELECT 'job_quoted', j.quoted_at, j.id, j.title, j.covered_pct, j.origin, j.total_minor, j.currency FROM repair_jobs j WHERE j.owner_id = :user AND j.studio_id = :studio AND j.quoted_at IS NOT NULL
  UNION ALL
  SELECT 'job_paid', j.paid_at, j.id, j.title, NULL, NULL, j.total_minor, j.currency FROM repair_jobs j WHERE j.owner_id = :user AND j.studio_id = :studio AND j.paid_at IS NOT NULL
  UNION ALL
  SELECT 'job_done', j.done_at, j.id, j.title, NULL, NULL, NULL, NULL FROM repair_jobs j WHERE j.owner_id = :user AND j.studio_id = :studio AND j.done_at IS NOT NULL
  UNION ALL
  SELECT 'job_cancelled', j.cancelled_at, j.id, j.title, NULL, NULL, NULL, NULL FROM repair_jobs j WHERE j.owner_id = :user AND j.studio_id = :studio AND j.cancelled_at IS NOT NULL
  UNION ALL
  SELECT 'refund', coalesce(y.refund_requested_at, y.updated_at), j.id, j.title, y.id, NULL, CASE WHEN y.refunded_minor > 0 THEN y.refunded_minor ELSE y.amount_minor END, y.currency
    FROM repair_jobs j JOIN payments y ON y.job_id = j.id
    WHERE j.owner_id = :user AND j.studio_id = :studio AND (y.refunded_minor > 0 OR y.refund_requested_at IS NOT NULL)
  UNION ALL
  SELECT 'visit_booked', v.created_at, j.id, j.title, v.id, NULL, v.start_at, NULL FROM repair_jobs j JOIN visits v ON v.job_id = j.id WHERE j.owner_id = :user AND j.studio_id = :studio
  UNION ALL
  SELECT 'visit_done', v.reported_at, j.id, j.title, v.id, NULL, v.start_at, NULL FROM repair_jobs j JOIN visits v ON v.job_id = j.id WHERE j.owner_id = :user AND j.studio_id = :studio AND v.reported_at IS NOT NULL
  UNION ALL
  SELECT 'visit_cancelled', v.cancelled_at, j.id, j.title, v.id, NULL, v.start_at, NULL FROM repair_jobs j JOIN visits v ON v.job_id = j.id WHERE j.owner_id = :user AND j.studio_id = :studio AND v.cancelled_at IS NOT NULL
  UNION ALL
  SELECT 'note', a.created_at, a.id, u.name, a.action, a.data, NULL, NULL
    FROM audit_log a LEFT JOIN users u ON u.id = a.actor_id WHERE a.subject_type = 'client' AND a.subject_id = :client AND a.studio_id = :studio
) ORDER BY at DESC, kind, ref LIMIT :limit`;

const statement = perConnection((db) => db.$client.prepare<[{ client: string; user: string | null; studio: string; limit: number }], Row>(TIMELINE_SQL));

/** The newest `limit` entries of the client's timeline (404 for another studio's client), and whether there are more. */
export function clientTimeline(ctx: StudioContext, clientId: string, limit: number): Timeline {
  const client = loadClient(ctx, clientId);
  const rows = statement(getDb()).all({ client: client.id, user: client.userId, studio: ctx.studio.id, limit: limit + 1 });
  const tz = ctx.studio.timeZone;
  const entries = rows.slice(0, limit).map((r, i) => ({
    key: `${r.kind}:${r.ref}:${r.at}:${i}`,
    kind: r.kind,
    at: new Date(r.at).toISOString(),
    allDay: r.kind === "delivered",
    title: titleOf(r, tz, ctx.studio.country),
    href: hrefOf(r),
  }));
  return { entries, hasMore: rows.length > limit, timeZone: tz };
}

const q = (title: string | null) => `“${title ?? "a piece"}”`;

const money = (minor: number | null, currency: string | null, country: string) => (minor == null || !currency ? "" : formatMoney(minor, currency, country));
const when = (ms: number | null, timeZone: string) => (ms == null ? "" : formatInstant(ms, timeZone, { time: true }));
const day = (iso: string | null) => (iso ? formatDate(iso) : "");


const NOTE_WORDS: Record<string, string> = {
  "client.created": "Client record created",
  "client.updated": "Client record changed",
  "client.exported": "Everything held about them downloaded",
  "client.erased": "Erased at their request",
};

function noteTitle(r: Row): string {
  const who = r.title ? ` by ${r.title}` : "";
  let data: { fields?: string[]; consent?: ConsentKind[] } = {};
  try {
    data = JSON.parse(r.b ?? "{}");
  } catch {
    // an unreadable row still shows that something happened
  }
  const parts: string[] = [];
  if (data.fields?.length) parts.push(data.fields.map((f) => FIELD_WORDS[f] ?? f).join(", "));
  if (data.consent?.length) parts.push(`consent: ${data.consent.map((k) => CONSENT_KIND_NAMES[k].toLowerCase()).join(", ")}`);
  return `${NOTE_WORDS[r.a ?? ""] ?? "Client record noted"}${who}${parts.length ? ` — ${parts.join("; ")}` : ""}`;
}

const FIELD_WORDS: Record<string, string> = {
  name: "name",
  email: "e-mail",
  phone: "phone",
  address: "address",
  preferredContact: "preferred contact",
  timeZone: "time zone",
  notes: "notes",
};

function titleOf(r: Row, tz: string, country: string): string {
  switch (r.kind) {
    case "delivered":
      return `Delivered ${q(r.title)}`;
    case "registered":
      return `Registered ${q(r.title)} in Grainward`;
    case "took_over":
      return `Took over ${q(r.title)} from its previous owner`;
    case "released":
      return `Handed ${q(r.title)} on to a new owner`;
    case "handover":
      return `Hand-over mail sent for ${q(r.title)}${r.n && r.n > 1 ? ` (${r.n} times)` : ""}`;
    case "care":
      return `${CARE_TASK_LABELS[r.a as CareTaskKind] ?? "Care"} on ${q(r.title)}, done ${day(r.b)}, logged ${CARE_LOG_SOURCE_WORDS[r.cur as keyof typeof CARE_LOG_SOURCE_WORDS] ?? ""}`.trim();
    case "reminder":
      return `Care reminder sent: ${(CARE_TASK_LABELS[r.a as CareTaskKind] ?? "care").toLowerCase()} on ${q(r.title)}, due ${day(r.b)}`;
    case "visit_reminder":
      return `Visit reminder sent for ${when(r.n, tz)} (${r.title})`;
    case "claim_filed":
      return `Claim filed: ${(CLAIM_CATEGORY_LABELS[r.a as ClaimCategory] ?? "damage").toLowerCase()} on ${q(r.title)}`;
    case "claim_decided":
      return `Claim on ${q(r.title)} decided: ${decisionText(r.a as ClaimDecision, r.n).toLowerCase()}`;
    case "message":
      return `${r.a === "staff" ? "The studio wrote to them" : "They wrote to the studio"}${r.b === "email" ? " by e-mail" : ""} about ${r.cur === "claim" ? "the claim on" : r.cur === "visit" ? "a visit for" : "a repair job on"} ${q(r.title)}`;
    case "job_quoted":
      return `Quote sent for “${r.title}”: ${r.n == null || !r.cur ? "" : jobAmountText({ totalMinor: r.n, coveredPct: Number(r.a ?? 0), currency: r.cur, origin: r.b as RepairJob["origin"] }, country)}`;
    case "job_paid":
      return `Paid ${money(r.n, r.cur, country)} for “${r.title}”`;
    case "job_done":
      return `Repair job “${r.title}” done`;
    case "job_cancelled":
      return `Repair job “${r.title}” cancelled`;
    case "refund":
      return `Refund of ${money(r.n, r.cur, country)} for “${r.title}”`;
    case "visit_booked":
      return `Visit booked for ${when(r.n, tz)} (${r.title})`;
    case "visit_done":
      return `Visit of ${when(r.n, tz)} done (${r.title})`;
    case "visit_cancelled":
      return `Visit of ${when(r.n, tz)} cancelled (${r.title})`;
    case "note":
      return noteTitle(r);
  }
}

function hrefOf(r: Row): string | null {
  switch (r.kind) {
    case "delivered":
    case "registered":
    case "took_over":
    case "released":
    case "handover":
    case "care":
    case "reminder":
      return `/studio/pieces/${r.ref}`;
    case "claim_filed":
    case "claim_decided":
      return `/studio/claims/${r.ref}`;
    case "note":
      return null;
    case "message":
      return `/studio/inbox/${r.ref}`;
    default:
      return `/studio/jobs/${r.ref}`;
  }
}
