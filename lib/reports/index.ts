import "server-only";
// Reports: claims per 100 pieces by species, by finish class and by resin type over a
// chosen period, with CSV export; and the lists behind the overview's figures that have no list page
// of their own (reminders and what followed, refresh offers, repair revenue, time to first answer).
import { and, desc, eq, gte, inArray, isNotNull, isNull, lte } from "drizzle-orm";
import Papa from "papaparse";
import { getDb } from "@/db/client";
import { careLogEntries, claims, finishLayers, payments, pieces, refreshOffers, reminderSends, repairJobs, users } from "@/db/schema";
import { assertRole, STAFF_ROLES, type StudioContext } from "@/lib/auth/guards";
import { addDays, localDate, zonedTimeToEpochMs } from "@/lib/care/dates";
import { getSpecies } from "@/lib/care/species";
import { CARE_TASK_LABELS, FINISH_CLASS_LABELS, FINISH_CLASSES, RESIN_KINDS, RESIN_LABELS, type ClaimCategory, type FinishClass, type ResinKind } from "@/lib/care/vocabulary";
import { CLAIM_CATEGORY_LABELS, CLAIM_STATE_LABELS_STAFF } from "@/lib/claims/labels";
import { notFound } from "@/lib/errors";
import { careLoggedAfter, monthStart, REMINDER_STEP_LABELS, WINDOW_MONTHS } from "@/lib/overview";
import type { ClaimRatesQuery, ReportListQuery } from "./query";

function assertStaff(ctx: StudioContext) {
  assertRole(ctx, STAFF_ROLES, "Reports are for the studio's admins and staff.");
}

export type RateRow = { key: string; label: string; pieces: number; claims: number; per100: number | null };
export type ClaimRates = {
  from: string;
  to: string;
  category: ClaimCategory | "all";
  totalPieces: number;
  totalClaims: number;
  bySpecies: RateRow[];
  byFinishClass: RateRow[];
  byResin: RateRow[];
};

/** Claims per 100 pieces, to one decimal; null when there are no pieces to divide by. */
export function per100(claimCount: number, pieceCount: number): number | null {
  return pieceCount ? Math.round((claimCount * 1000) / pieceCount) / 10 : null;
}

/**
 * Claims filed in [from, to] (filing date in the studio's time zone) against the pieces delivered on
 * or before `to`, grouped by the piece's primary species, by each finish class in its stack (a piece
 * with oil under a topcoat counts in both) and by its resin. Archived pieces are left out of both.
 */
export function claimRates(ctx: StudioContext, q: ClaimRatesQuery, now: Date = new Date()): ClaimRates {
  assertStaff(ctx);
  const tz = ctx.studio.timeZone;
  const today = localDate(now, tz);
  const to = q.to ?? today;
  const from = q.from ?? addDays(to, -364);
  const db = getDb();
  const pieceRows = db
    .select({ id: pieces.id, species: pieces.primarySpeciesId, resin: pieces.resinKind })
    .from(pieces)
    .where(and(eq(pieces.studioId, ctx.studio.id), isNull(pieces.archivedAt), lte(pieces.deliveredOn, to)))
    .all();
  const classes = new Map<string, Set<FinishClass>>();
  for (const l of db.select({ pieceId: finishLayers.pieceId, finishClass: finishLayers.finishClass }).from(finishLayers).where(eq(finishLayers.studioId, ctx.studio.id)).all()) {
    let set = classes.get(l.pieceId);
    if (!set) classes.set(l.pieceId, (set = new Set()));
    set.add(l.finishClass);
  }
  const fromMs = zonedTimeToEpochMs(from, 0, tz);
  const toMs = zonedTimeToEpochMs(addDays(to, 1), 0, tz) - 1;
  const claimRows = db
    .select({ pieceId: claims.pieceId, category: claims.category })
    .from(claims)
    .where(and(eq(claims.studioId, ctx.studio.id), gte(claims.createdAt, new Date(fromMs)), lte(claims.createdAt, new Date(toMs))))
    .all()
    .filter((c) => q.category === "all" || c.category === q.category);
  const claimsPerPiece = new Map<string, number>();
  for (const c of claimRows) claimsPerPiece.set(c.pieceId, (claimsPerPiece.get(c.pieceId) ?? 0) + 1);
  const inScope = new Set(pieceRows.map((p) => p.id));

  const tally = (keyOf: (p: (typeof pieceRows)[number]) => string[]) => {
    const m = new Map<string, { pieces: number; claims: number }>();
    for (const p of pieceRows) {
      for (const k of keyOf(p)) {
        const t = m.get(k) ?? { pieces: 0, claims: 0 };
        t.pieces++;
        t.claims += claimsPerPiece.get(p.id) ?? 0;
        m.set(k, t);
      }
    }
    return m;
  };
  const rows = (m: Map<string, { pieces: number; claims: number }>, label: (k: string) => string, order?: readonly string[]): RateRow[] =>
    [...m]
      .map(([key, t]) => ({ key, label: label(key), pieces: t.pieces, claims: t.claims, per100: per100(t.claims, t.pieces) }))
      .sort((a, b) => (order ? order.indexOf(a.key) - order.indexOf(b.key) : (b.per100 ?? 0) - (a.per100 ?? 0) || b.pieces - a.pieces || a.label.localeCompare(b.label)));

  return {
    from,
    to,
    category: q.category,
    totalPieces: pieceRows.length,
    totalClaims: claimRows.filter((c) => inScope.has(c.pieceId)).length,
    bySpecies: rows(tally((p) => [p.species]), (k) => getSpecies(k)?.commonName ?? k),
    byFinishClass: rows(
      tally((p) => [...(classes.get(p.id) ?? new Set(["none" as FinishClass]))]),
      (k) => (k === "none" ? "No finish recorded" : FINISH_CLASS_LABELS[k as FinishClass]),
      [...FINISH_CLASSES, "none"],
    ),
    byResin: rows(tally((p) => [p.resin]), (k) => RESIN_LABELS[k as ResinKind], RESIN_KINDS),
  };
}

/** The same figures as CSV (papaparse), one row per group, with the period on every row. */
export function claimRatesCsv(ctx: StudioContext, q: ClaimRatesQuery, now: Date = new Date()): { csv: string; rates: ClaimRates } {
  const r = claimRates(ctx, q, now);
  const category = r.category === "all" ? "all" : CLAIM_CATEGORY_LABELS[r.category];
  const data = [
    ...r.bySpecies.map((x) => ["species", x]),
    ...r.byFinishClass.map((x) => ["finish class", x]),
    ...r.byResin.map((x) => ["resin", x]),
  ].map(([dimension, x]) => {
    const row = x as RateRow;
    return { dimension: dimension as string, group: row.label, pieces: row.pieces, claims: row.claims, claims_per_100_pieces: row.per100 ?? "", from: r.from, to: r.to, claim_kind: category };
  });
  return { csv: Papa.unparse(data, { columns: ["dimension", "group", "pieces", "claims", "claims_per_100_pieces", "from", "to", "claim_kind"], newline: "\r\n" }), rates: r };
}

// ---- the lists behind the overview's figures ----

function windowStart(ctx: StudioContext, now: Date) {
  const today = localDate(now, ctx.studio.timeZone);
  const since = monthStart(today, WINDOW_MONTHS - 1);
  return { today, since, sinceMs: zonedTimeToEpochMs(since, 0, ctx.studio.timeZone) };
}

export type ReminderOutcomeRow = { id: string; pieceId: string; pieceTitle: string; ownerName: string; task: string; step: string; sentOn: string; caredOn: string | null };
export type OfferRow = { id: string; pieceId: string; pieceTitle: string; ownerName: string; dueOn: string; priceMinor: number; currency: string; status: string; sentOn: string; acceptedOn: string | null };
export type RevenueRow = { id: string; jobId: string; jobTitle: string; pieceTitle: string; paidOn: string; amountMinor: number; refundedMinor: number; netMinor: number; currency: string };
const OPEN_STATES = new Set<string>(["submitted", "in_review", "awaiting_owner"]);
export type AnswerRow = { id: string; pieceTitle: string; ownerName: string; category: string; state: string; rawState: string; filedAt: Date; answeredAt: Date | null; waitMs: number };

export type ReportListResult =
  | { list: "reminders"; since: string; rows: ReminderOutcomeRow[] }
  | { list: "offers"; since: string; rows: OfferRow[] }
  | { list: "revenue"; since: string; rows: RevenueRow[] }
  | { list: "answers"; since: string; rows: AnswerRow[] };

export function reportList(ctx: StudioContext, list: string, q: ReportListQuery, now: Date = new Date()): ReportListResult {
  assertStaff(ctx);
  const { since, sinceMs } = windowStart(ctx, now);
  const tz = ctx.studio.timeZone;
  const db = getDb();
  const sid = ctx.studio.id;
  switch (list) {
    case "reminders": {
      const sent = db
        .select({ id: reminderSends.id, pieceId: reminderSends.pieceId, pieceTitle: pieces.title, ownerName: users.name, taskKey: reminderSends.taskKey, taskKind: reminderSends.taskKind, step: reminderSends.step, sentAt: reminderSends.sentAt })
        .from(reminderSends)
        .innerJoin(pieces, eq(pieces.id, reminderSends.pieceId))
        .innerJoin(users, eq(users.id, reminderSends.userId))
        .where(and(eq(reminderSends.studioId, sid), eq(reminderSends.status, "sent"), isNotNull(reminderSends.sentAt), gte(reminderSends.sentAt, new Date(sinceMs)), q.step ? eq(reminderSends.step, q.step) : undefined))
        .orderBy(desc(reminderSends.sentAt))
        .all();
      const ids = [...new Set(sent.map((r) => r.pieceId))];
      const logs = ids.length
        ? db
            .select({ pieceId: careLogEntries.pieceId, taskKind: careLogEntries.taskKind, doneOn: careLogEntries.doneOn, surface: careLogEntries.surface })
            .from(careLogEntries)
            .where(and(eq(careLogEntries.studioId, sid), eq(careLogEntries.source, "owner"), inArray(careLogEntries.pieceId, ids)))
            .all()
        : [];
      const rows = sent
        .map((r) => ({
          id: r.id,
          pieceId: r.pieceId,
          pieceTitle: r.pieceTitle,
          ownerName: r.ownerName,
          task: CARE_TASK_LABELS[r.taskKind],
          step: REMINDER_STEP_LABELS[r.step],
          sentOn: localDate(r.sentAt!, tz),
          caredOn: careLoggedAfter(r, logs.filter((l) => l.pieceId === r.pieceId), tz),
        }))
        .filter((r) => (q.acted === "yes" ? r.caredOn !== null : q.acted === "no" ? r.caredOn === null : true));
      return { list: "reminders", since, rows };
    }
    case "offers": {
      const rows = db
        .select({ o: refreshOffers, pieceTitle: pieces.title, ownerName: users.name })
        .from(refreshOffers)
        .innerJoin(pieces, eq(pieces.id, refreshOffers.pieceId))
        .innerJoin(users, eq(users.id, refreshOffers.userId))
        .where(and(eq(refreshOffers.studioId, sid), gte(refreshOffers.createdAt, new Date(sinceMs)), q.status ? eq(refreshOffers.status, q.status) : undefined))
        .orderBy(desc(refreshOffers.createdAt))
        .all()
        .map(({ o, pieceTitle, ownerName }) => ({
          id: o.id,
          pieceId: o.pieceId,
          pieceTitle,
          ownerName,
          dueOn: o.dueOn,
          priceMinor: o.priceMinor,
          currency: o.currency,
          status: o.status,
          sentOn: localDate(o.createdAt, tz),
          acceptedOn: o.acceptedAt ? localDate(o.acceptedAt, tz) : null,
        }));
      return { list: "offers", since, rows };
    }
    case "revenue": {
      const rows = db
        .select({ p: payments, jobTitle: repairJobs.title, pieceTitle: pieces.title })
        .from(payments)
        .innerJoin(repairJobs, eq(repairJobs.id, payments.jobId))
        .innerJoin(pieces, eq(pieces.id, repairJobs.pieceId))
        .where(and(eq(payments.studioId, sid), isNotNull(payments.paidAt), gte(payments.paidAt, new Date(sinceMs)), inArray(payments.status, ["paid", "partially_refunded", "refunded"])))
        .orderBy(desc(payments.paidAt))
        .all()
        .map(({ p, jobTitle, pieceTitle }) => ({
          id: p.id,
          jobId: p.jobId,
          jobTitle,
          pieceTitle,
          paidOn: localDate(p.paidAt!, tz),
          amountMinor: p.amountMinor,
          refundedMinor: p.refundedMinor,
          netMinor: p.amountMinor - p.refundedMinor,
          currency: p.currency,
        }))
        .filter((r) => !q.month || r.paidOn.startsWith(q.month));
      return { list: "revenue", since, rows };
    }
    case "answers": {
      const nowMs = now.getTime();
      const rows = db
        .select({ id: claims.id, pieceTitle: pieces.title, ownerName: users.name, category: claims.category, state: claims.state, filedAt: claims.createdAt, answeredAt: claims.firstAnsweredAt })
        .from(claims)
        .innerJoin(pieces, eq(pieces.id, claims.pieceId))
        .innerJoin(users, eq(users.id, claims.ownerId))
        .where(and(eq(claims.studioId, sid), gte(claims.createdAt, new Date(sinceMs))))
        .orderBy(desc(claims.createdAt))
        .all()
        .map((c) => ({
          ...c,
          category: CLAIM_CATEGORY_LABELS[c.category],
          state: CLAIM_STATE_LABELS_STAFF[c.state],
          rawState: c.state,
          waitMs: (c.answeredAt?.getTime() ?? nowMs) - c.filedAt.getTime(),
        }))
        .filter((r) => (q.answered === "yes" ? r.answeredAt !== null : q.answered === "no" ? r.answeredAt === null && OPEN_STATES.has(r.rawState) : true));
      return { list: "answers", since, rows };
    }
    default:
      throw notFound("No such report.");
  }
}
