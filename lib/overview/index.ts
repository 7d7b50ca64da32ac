import "server-only";
// The studio's overview: every figure computed from the studio's own rows, scoped by the
// caller's studio, in the studio's time zone. One query per table; care tasks come from the care
// engine (careSchedule through lib/pieces/care-inputs), computed in bulk for all pieces at once.
import { and, eq, gte, inArray, isNotNull, isNull, lt, ne } from "drizzle-orm";
import { getDb } from "@/db/client";
import { careLogEntries, claims, finishLayers, finishProducts, payments, pieces, refreshOffers, reminderSends, visits, warrantyPolicies } from "@/db/schema";
import { CLAIM_STATES, OFFER_STATUSES } from "@/lib/care/vocabulary";
import { assertRole, STAFF_ROLES, type StudioContext } from "@/lib/auth/guards";
import { CareInputError } from "@/lib/care/errors";
import { addDays, addMonths, isoWeekday, localDate, zonedTimeToEpochMs } from "@/lib/care/dates";
import { CARE_TASK_KINDS, CARE_TASK_LABELS, CLAIM_CATEGORIES, REMINDER_STEPS, type CareTaskKind, type ClaimCategory, type ReminderStep } from "@/lib/care/vocabulary";
import { CLAIM_CATEGORY_LABELS, CLAIM_STATE_LABELS_STAFF } from "@/lib/claims/labels";
import type { ClaimState } from "@/lib/claims/states";
import { scheduleFromColumns, toCatalog, type CareLayerColumns, type CarePieceColumns } from "@/lib/pieces/care-inputs";

/** Care logged by the owner within this many days after a reminder counts as acting on it. */
export const ACTED_WITHIN_DAYS = 30;
/** "Care tasks due soon" looks this many days ahead. */
export const CARE_DUE_DAYS = 30;
/** Flows (reminders, answers, offers, revenue) cover the current month and the 11 before it. */
export const WINDOW_MONTHS = 12;

export const REMINDER_STEP_LABELS: Record<ReminderStep, string> = {
  before_14d: "14 days before",
  due_day: "On the due date",
  after_30d: "30 days after",
};

export type Overview = {
  today: string;
  timeZone: string;
  currency: string;
  /** First day of the window the flows cover (YYYY-MM-DD, studio time zone). */
  since: string;
  pieces: { delivered: number; underWarranty: number; registered: number };
  care: { days: number; until: string; due: number; piecesDue: number; overdue: number; piecesOverdue: number; byKind: { kind: CareTaskKind; label: string; count: number; overdue: number }[]; skipped: number };
  reminders: { withinDays: number; sent: number; acted: number; owners: number; ownersActed: number; byStep: { step: ReminderStep; label: string; sent: number; acted: number }[] };
  claims: { total: number; open: number; byState: { state: ClaimState; label: string; count: number }[]; byCategory: { category: ClaimCategory; label: string; count: number }[] };
  firstAnswer: { answered: number; medianMs: number | null; waiting: number };
  offers: { sent: number; accepted: number; byStatus: { status: (typeof OFFER_STATUSES)[number]; count: number }[] };
  revenue: { currency: string; months: { month: string; paidMinor: number; refundedMinor: number; netMinor: number }[]; totalNetMinor: number; otherCurrencies: string[] };
  /** Monday to Sunday of the current week in the studio's time zone; cancelled visits left out. */
  visits: { weekFrom: string; weekTo: string; total: number; booked: number; done: number; byDay: { date: string; booked: number; done: number }[] };
};

const OPEN_CLAIM_STATES: readonly ClaimState[] = ["submitted", "in_review", "awaiting_owner"];

function assertStaff(ctx: StudioContext) {
  assertRole(ctx, STAFF_ROLES, "The overview is for the studio's admins and staff.");
}

/** YYYY-MM-01 of the month `monthsBack` months before the month of `today`. */
export function monthStart(today: string, monthsBack = 0): string {
  return addMonths(`${today.slice(0, 7)}-01`, -monthsBack);
}

export function median(values: readonly number[]): number | null {
  if (!values.length) return null;
  const s = [...values].sort((a, b) => a - b);
  const mid = Math.floor(s.length / 2);
  return s.length % 2 ? s[mid]! : (s[mid - 1]! + s[mid]!) / 2;
}

/** The surface part of a task key (pieceId:kind:surface). */
function taskSurface(taskKey: string): string {
  return taskKey.split(":").at(-1) ?? "whole_piece";
}

function logCountsForSurface(entrySurface: string | null, surface: string): boolean {
  if (!entrySurface || surface === "whole_piece") return true;
  const group = entrySurface === "base" ? "base" : "top";
  return group === surface;
}

type SentReminder = { taskKey: string; taskKind: CareTaskKind; sentAt: Date | null };
type OwnerLog = { taskKind: CareTaskKind; doneOn: string; surface: string | null };

/**
 * The date the owner logged the reminded task within ACTED_WITHIN_DAYS days after the reminder was
 * sent (the send day counts, dates in the studio's time zone), or null. Same kind, and a surface
 * that counts for the task (an entry without a surface counts for every surface).
 */
export function careLoggedAfter(r: SentReminder, ownerLog: readonly OwnerLog[], timeZone: string): string | null {
  if (!r.sentAt) return null;
  const sentOn = localDate(r.sentAt, timeZone);
  const last = addDays(sentOn, ACTED_WITHIN_DAYS);
  const surface = taskSurface(r.taskKey);
  const hits = ownerLog.filter((l) => l.taskKind === r.taskKind && l.doneOn >= sentOn && l.doneOn <= last && logCountsForSurface(l.surface, surface)).map((l) => l.doneOn);
  return hits.length ? hits.sort()[0]! : null;
}

export function getOverview(ctx: StudioContext, now: Date = new Date()): Overview {
  assertStaff(ctx);
  const db = getDb();
  const studioId = ctx.studio.id;
  const tz = ctx.studio.timeZone;
  const today = localDate(now, tz);
  const since = monthStart(today, WINDOW_MONTHS - 1);
  const sinceMs = zonedTimeToEpochMs(since, 0, tz);

  // ---- pieces: delivered (on or before today, not archived), under warranty, registered ----
  const pieceRows = db
    .select({
      id: pieces.id, kind: pieces.kind, use: pieces.use, sun: pieces.sun, deliveredOn: pieces.deliveredOn, resinKind: pieces.resinKind,
      primarySpeciesId: pieces.primarySpeciesId, shapeKind: pieces.shapeKind, lengthMm: pieces.lengthMm, widthMm: pieces.widthMm,
      diameterMm: pieces.diameterMm, measuredAreaM2: pieces.measuredAreaM2, ownerId: pieces.ownerId, warrantyPolicyId: pieces.warrantyPolicyId,
    })
    .from(pieces)
    .where(and(eq(pieces.studioId, studioId), isNull(pieces.archivedAt)))
    .all();
  const delivered = pieceRows.filter((p) => p.deliveredOn <= today);
  // A piece is under warranty while its policy version's longest line runs (as the registry filters it).
  const terms = new Map(
    db
      .select({ id: warrantyPolicies.id, policy: warrantyPolicies.policy })
      .from(warrantyPolicies)
      .where(eq(warrantyPolicies.studioId, studioId))
      .all()
      .map((r) => [r.id, Math.max(0, ...Object.values(r.policy.lines ?? {}).map((l) => l?.termMonths ?? 0))]),
  );
  const underWarranty = delivered.filter((p) => {
    const m = p.warrantyPolicyId ? terms.get(p.warrantyPolicyId) : undefined;
    return m ? addMonths(p.deliveredOn, m) >= today : false;
  }).length;
  const registered = delivered.filter((p) => p.ownerId).length;

  // ---- care tasks due in the next CARE_DUE_DAYS days: the care engine over every piece ----
  const layerRows = db
    .select({ pieceId: finishLayers.pieceId, id: finishLayers.id, surface: finishLayers.surface, finishClass: finishLayers.finishClass, productId: finishLayers.productId, coats: finishLayers.coats, appliedOn: finishLayers.appliedOn })
    .from(finishLayers)
    .where(eq(finishLayers.studioId, studioId))
    .all();
  const logRows = db
    .select({ pieceId: careLogEntries.pieceId, taskKind: careLogEntries.taskKind, doneOn: careLogEntries.doneOn, surface: careLogEntries.surface, source: careLogEntries.source })
    .from(careLogEntries)
    .where(eq(careLogEntries.studioId, studioId))
    .all();
  const catalog = toCatalog(db.select().from(finishProducts).where(eq(finishProducts.studioId, studioId)).all());
  const layersBy = groupBy(layerRows, (l) => l.pieceId);
  const logBy = groupBy(logRows, (l) => l.pieceId);
  const until = addDays(today, CARE_DUE_DAYS);
  const byKind = new Map<CareTaskKind, number>();
  const overdueByKind = new Map<CareTaskKind, number>();
  let due = 0;
  let overdue = 0;
  let skipped = 0;
  const piecesDue = new Set<string>();
  const piecesOverdue = new Set<string>();
  for (const p of delivered) {
    let tasks;
    try {
      tasks = scheduleFromColumns({
        piece: p as CarePieceColumns,
        layers: (layersBy.get(p.id) ?? []) as CareLayerColumns[],
        careLog: logBy.get(p.id) ?? [],
        catalog,
        timeZone: tz,
        now,
      }).tasks;
    } catch (e) {
      if (e instanceof CareInputError) {
        skipped++;
        continue;
      }
      throw e;
    }
    // By due date alone: a cycle started by care shows status "done" until its window opens, but
    // it still falls due on its date.
    for (const t of tasks) {
      if (t.dueOn < today) {
        overdue++;
        piecesOverdue.add(p.id);
        overdueByKind.set(t.kind, (overdueByKind.get(t.kind) ?? 0) + 1);
      } else if (t.dueOn <= until) {
        due++;
        piecesDue.add(p.id);
        byKind.set(t.kind, (byKind.get(t.kind) ?? 0) + 1);
      }
    }
  }

  // ---- reminders sent in the window, and the owner's care log within ACTED_WITHIN_DAYS after ----
  const sent = db
    .select({ pieceId: reminderSends.pieceId, userId: reminderSends.userId, taskKey: reminderSends.taskKey, taskKind: reminderSends.taskKind, step: reminderSends.step, sentAt: reminderSends.sentAt })
    .from(reminderSends)
    .where(and(eq(reminderSends.studioId, studioId), eq(reminderSends.status, "sent"), isNotNull(reminderSends.sentAt), gte(reminderSends.sentAt, new Date(sinceMs))))
    .all();
  const ownerLogBy = groupBy(
    logRows.filter((l) => l.source === "owner"),
    (l) => l.pieceId,
  );
  const steps = new Map(REMINDER_STEPS.map((s) => [s, { sent: 0, acted: 0 }]));
  const owners = new Set<string>();
  const ownersActed = new Set<string>();
  let acted = 0;
  for (const r of sent) {
    const didAct = careLoggedAfter(r, ownerLogBy.get(r.pieceId) ?? [], tz) !== null;
    const s = steps.get(r.step)!;
    s.sent++;
    owners.add(r.userId);
    if (didAct) {
      s.acted++;
      acted++;
      ownersActed.add(r.userId);
    }
  }

  // ---- claims: every claim by state and category; time to first answer for those filed in the window ----
  const claimRows = db
    .select({ state: claims.state, category: claims.category, createdAt: claims.createdAt, firstAnsweredAt: claims.firstAnsweredAt })
    .from(claims)
    .where(eq(claims.studioId, studioId))
    .all();
  const stateCount = new Map<ClaimState, number>();
  const categoryCount = new Map<ClaimCategory, number>();
  for (const c of claimRows) {
    stateCount.set(c.state, (stateCount.get(c.state) ?? 0) + 1);
    categoryCount.set(c.category, (categoryCount.get(c.category) ?? 0) + 1);
  }
  const inWindow = claimRows.filter((c) => c.createdAt.getTime() >= sinceMs);
  const answerMs = inWindow.filter((c) => c.firstAnsweredAt).map((c) => c.firstAnsweredAt!.getTime() - c.createdAt.getTime());
  const waiting = inWindow.filter((c) => !c.firstAnsweredAt && OPEN_CLAIM_STATES.includes(c.state)).length;

  // ---- refresh offers sent in the window and what became of them ----
  const offerRows = db
    .select({ status: refreshOffers.status })
    .from(refreshOffers)
    .where(and(eq(refreshOffers.studioId, studioId), gte(refreshOffers.createdAt, new Date(sinceMs))))
    .all();
  const offerCount = new Map<string, number>();
  for (const o of offerRows) offerCount.set(o.status, (offerCount.get(o.status) ?? 0) + 1);

  // ---- repair revenue: paid minus refunded, by the month it was paid in (studio time zone) ----
  const payRows = db
    .select({ amountMinor: payments.amountMinor, refundedMinor: payments.refundedMinor, currency: payments.currency, paidAt: payments.paidAt })
    .from(payments)
    .where(and(eq(payments.studioId, studioId), isNotNull(payments.paidAt), gte(payments.paidAt, new Date(sinceMs)), inArray(payments.status, ["paid", "partially_refunded", "refunded"])))
    .all();
  const months = Array.from({ length: WINDOW_MONTHS }, (_, i) => monthStart(today, WINDOW_MONTHS - 1 - i).slice(0, 7)).map((month) => ({ month, paidMinor: 0, refundedMinor: 0, netMinor: 0 }));
  const monthIndex = new Map(months.map((m, i) => [m.month, i]));
  const otherCurrencies = new Set<string>();
  for (const p of payRows) {
    if (p.currency !== ctx.studio.currency) {
      otherCurrencies.add(p.currency);
      continue;
    }
    const i = monthIndex.get(localDate(p.paidAt!, tz).slice(0, 7));
    if (i === undefined) continue;
    const m = months[i]!;
    m.paidMinor += p.amountMinor;
    m.refundedMinor += p.refundedMinor;
    m.netMinor += p.amountMinor - p.refundedMinor;
  }

  // ---- visits this week (Monday–Sunday, studio time zone), not cancelled ----
  const weekFrom = addDays(today, 1 - isoWeekday(today));
  const weekTo = addDays(weekFrom, 6);
  const visitRows = db
    .select({ startAt: visits.startAt, state: visits.state })
    .from(visits)
    .where(and(eq(visits.studioId, studioId), ne(visits.state, "cancelled"), gte(visits.startAt, new Date(zonedTimeToEpochMs(weekFrom, 0, tz))), lt(visits.startAt, new Date(zonedTimeToEpochMs(addDays(weekTo, 1), 0, tz)))))
    .all();
  const byDay = Array.from({ length: 7 }, (_, i) => ({ date: addDays(weekFrom, i), booked: 0, done: 0 }));
  for (const v of visitRows) {
    const d = byDay.find((x) => x.date === localDate(v.startAt, tz));
    if (d) d[v.state === "done" ? "done" : "booked"]++;
  }

  return {
    today,
    timeZone: tz,
    currency: ctx.studio.currency,
    since,
    pieces: { delivered: delivered.length, underWarranty, registered },
    care: {
      days: CARE_DUE_DAYS,
      until,
      due,
      piecesDue: piecesDue.size,
      overdue,
      piecesOverdue: piecesOverdue.size,
      byKind: CARE_TASK_KINDS.filter((k) => byKind.has(k) || overdueByKind.has(k)).map((k) => ({ kind: k, label: CARE_TASK_LABELS[k], count: byKind.get(k) ?? 0, overdue: overdueByKind.get(k) ?? 0 })),
      skipped,
    },
    reminders: {
      withinDays: ACTED_WITHIN_DAYS,
      sent: sent.length,
      acted,
      owners: owners.size,
      ownersActed: ownersActed.size,
      byStep: REMINDER_STEPS.map((s) => ({ step: s, label: REMINDER_STEP_LABELS[s], ...steps.get(s)! })),
    },
    claims: {
      total: claimRows.length,
      open: claimRows.filter((c) => OPEN_CLAIM_STATES.includes(c.state)).length,
      byState: CLAIM_STATES.map((s) => ({ state: s, label: CLAIM_STATE_LABELS_STAFF[s], count: stateCount.get(s) ?? 0 })),
      byCategory: CLAIM_CATEGORIES.map((c) => ({ category: c, label: CLAIM_CATEGORY_LABELS[c], count: categoryCount.get(c) ?? 0 })),
    },
    firstAnswer: { answered: answerMs.length, medianMs: median(answerMs), waiting },
    offers: {
      sent: offerRows.length,
      accepted: offerCount.get("accepted") ?? 0,
      byStatus: OFFER_STATUSES.map((s) => ({ status: s, count: offerCount.get(s) ?? 0 })),
    },
    revenue: { currency: ctx.studio.currency, months, totalNetMinor: months.reduce((a, m) => a + m.netMinor, 0), otherCurrencies: [...otherCurrencies] },
    visits: {
      weekFrom,
      weekTo,
      total: visitRows.length,
      booked: byDay.reduce((a, d) => a + d.booked, 0),
      done: byDay.reduce((a, d) => a + d.done, 0),
      byDay,
    },
  };
}

function groupBy<T>(rows: readonly T[], key: (r: T) => string): Map<string, T[]> {
  const m = new Map<string, T[]>();
  for (const r of rows) {
    const k = key(r);
    const list = m.get(k);
    if (list) list.push(r);
    else m.set(k, [r]);
  }
  return m;
}
