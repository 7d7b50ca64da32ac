import "server-only";
import { randomUUID } from "node:crypto";
import { and, desc, eq, inArray, isNotNull, isNull, type SQL } from "drizzle-orm";
import { getDb } from "@/db/client";
import { careLogEntries, finishLayers, finishProducts, pieces, refreshOffers, reminderSends, studios, users } from "@/db/schema";
import type { StudioContext } from "@/lib/auth/guards";
import { addDays, localDate } from "@/lib/care/dates";
import { CARE_TASK_LABELS, type ReminderStep } from "@/lib/care/vocabulary";
import { conflict, notFound } from "@/lib/errors";
import { containsText } from "@/lib/text-match";
import { scheduleFromColumns, toCatalog, topShape } from "@/lib/pieces/care-inputs";
import type { PauseValues, RemindersQuery } from "@/lib/validation/reminders";
import { currentStepIndex, OwnerClocks, timingFromColumns, withEnabledSteps, type SendTiming } from "./plan";
import { deliverLease, LEASE_PREFIX } from "./deliver";

// The studio's view of care reminders (/studio/reminders): what goes out in the next days (computed
// with the same care engine as the pass, and only the steps the studio sends) and what went out (the
// send ledger); resend a failed one; pause a piece's reminders. Every query is scoped by the caller's
// studio.

export type UpcomingRow = {
  pieceId: string;
  pieceTitle: string;
  ownerName: string;
  taskKey: string;
  taskKind: string;
  taskLabel: string;
  step: ReminderStep;
  on: string;
  dueOn: string;
  /** scheduled: will go out; otherwise why it will not. */
  state: "scheduled" | "piece_paused" | "owner_unsubscribed" | "address_unconfirmed";
  remindersPaused: boolean;
};

function studioCatalog(studioId: string) {
  const rows = getDb().select().from(finishProducts).where(eq(finishProducts.studioId, studioId)).all();
  const catalog = toCatalog(rows);
  return { catalog, byId: new Map(catalog.map((c) => [c.id, c])) };
}

/** The studio's reminder timing as stored now (not as it was when the request's context was read). */
function studioTiming(studioId: string): SendTiming {
  const row = getDb().select({ hour: studios.reminderSendHour, steps: studios.reminderSteps }).from(studios).where(eq(studios.id, studioId)).get();
  return timingFromColumns(row?.hour, row?.steps);
}

function groupByPiece<T extends { pieceId: string }>(rows: T[]) {
  const m = new Map<string, T[]>();
  for (const r of rows) m.set(r.pieceId, [...(m.get(r.pieceId) ?? []), r]);
  return m;
}

export function listUpcoming(ctx: StudioContext, q: RemindersQuery, now = new Date()): UpcomingRow[] {
  const db = getDb();
  const studioId = ctx.studio.id;
  const scope = and(eq(pieces.studioId, studioId), isNotNull(pieces.ownerId), isNull(pieces.archivedAt));
  const rows = db
    .select({ piece: pieces, ownerName: users.name, remindersEnabled: users.remindersEnabled, verified: users.emailVerifiedAt })
    .from(pieces)
    .innerJoin(users, eq(users.id, pieces.ownerId))
    .where(scope)
    .all();
  const ids = rows.map((r) => r.piece.id);
  if (ids.length === 0) return [];
  const layers = groupByPiece(db.select().from(finishLayers).where(and(eq(finishLayers.studioId, studioId), inArray(finishLayers.pieceId, ids))).all());
  const logs = groupByPiece(db.select().from(careLogEntries).where(and(eq(careLogEntries.studioId, studioId), inArray(careLogEntries.pieceId, ids))).all());
  const sentKeys = new Set(
    db.select({ k: reminderSends.reminderKey }).from(reminderSends).where(and(eq(reminderSends.studioId, studioId), inArray(reminderSends.pieceId, ids))).all().map((r) => r.k),
  );
  const { catalog } = studioCatalog(studioId);
  // Only the steps the studio sends (settings → reminder timing), as the pass sees them.
  const { steps } = studioTiming(studioId);
  const today = localDate(now, ctx.studio.timeZone);
  const until = addDays(today, q.days);
  const out: UpcomingRow[] = [];
  const needle = q.q?.toLowerCase();
  for (const r of rows) {
    if (needle && !r.piece.title.toLowerCase().includes(needle) && !r.ownerName.toLowerCase().includes(needle)) continue;
    const schedule = scheduleFromColumns({ piece: r.piece, layers: layers.get(r.piece.id) ?? [], careLog: logs.get(r.piece.id) ?? [], catalog, timeZone: ctx.studio.timeZone, now });
    for (const task of schedule.tasks.map((t) => withEnabledSteps(t, steps))) {
      if (q.kind && task.kind !== q.kind) continue;
      for (const rem of task.reminders) {
        if (q.step && rem.step !== q.step) continue;
        if (rem.on < today || rem.on > until) continue;
        if (sentKeys.has(`${task.key}:${task.dueOn}:${rem.step}`)) continue;
        out.push({
          pieceId: r.piece.id,
          pieceTitle: r.piece.title,
          ownerName: r.ownerName,
          taskKey: task.key,
          taskKind: task.kind,
          taskLabel: task.label,
          step: rem.step,
          on: rem.on,
          dueOn: task.dueOn,
          state: r.piece.remindersPaused ? "piece_paused" : !r.remindersEnabled ? "owner_unsubscribed" : !r.verified ? "address_unconfirmed" : "scheduled",
          remindersPaused: r.piece.remindersPaused,
        });
      }
    }
  }
  out.sort((a, b) => (a.on < b.on ? -1 : a.on > b.on ? 1 : a.pieceTitle.localeCompare(b.pieceTitle)));
  return out.slice(0, q.limit);
}

export function listLedger(ctx: StudioContext, q: RemindersQuery) {
  const where: SQL[] = [eq(reminderSends.studioId, ctx.studio.id)];
  if (q.status) where.push(eq(reminderSends.status, q.status));
  if (q.kind) where.push(eq(reminderSends.taskKind, q.kind));
  if (q.step) where.push(eq(reminderSends.step, q.step));
  if (q.q) {
    where.push(containsText(q.q, pieces.title, users.name, users.email));
  }
  return getDb()
    .select({
      id: reminderSends.id,
      pieceId: reminderSends.pieceId,
      pieceTitle: pieces.title,
      remindersPaused: pieces.remindersPaused,
      ownerName: users.name,
      ownerEmail: users.email,
      taskKind: reminderSends.taskKind,
      step: reminderSends.step,
      dueOn: reminderSends.dueOn,
      status: reminderSends.status,
      attempts: reminderSends.attempts,
      lastError: reminderSends.lastError,
      nextAttemptAt: reminderSends.nextAttemptAt,
      messageId: reminderSends.messageId,
      sentAt: reminderSends.sentAt,
      updatedAt: reminderSends.updatedAt,
    })
    .from(reminderSends)
    .innerJoin(pieces, eq(pieces.id, reminderSends.pieceId))
    .innerJoin(users, eq(users.id, reminderSends.userId))
    .where(and(...where))
    .orderBy(desc(reminderSends.updatedAt))
    .limit(q.limit)
    .all()
    .map((r) => ({ ...r, taskLabel: CARE_TASK_LABELS[r.taskKind], messageId: r.status === "sent" ? r.messageId : null }));
}
export type LedgerListRow = ReturnType<typeof listLedger>[number];

/** Pauses or resumes a piece's care reminders. */
export function setPiecePaused(ctx: StudioContext, { pieceId, paused }: PauseValues): { pieceId: string; remindersPaused: boolean } {
  const changed = getDb()
    .update(pieces)
    .set({ remindersPaused: paused, updatedAt: new Date() })
    .where(and(eq(pieces.id, pieceId), eq(pieces.studioId, ctx.studio.id)))
    .run().changes;
  if (changed === 0) throw notFound("No piece with that id in this studio.");
  return { pieceId, remindersPaused: paused };
}

/**
 * Sends a failed reminder again now, through the same lease and hand-off as the pass. Only a failed
 * row of the task's current cycle and step (as the pass finds it: the studio's steps, at its send hour);
 * an older one would be stale news for the owner, and a step the studio turned off is not sent.
 */
export async function resendReminder(ctx: StudioContext, id: string, now = new Date()) {
  const db = getDb();
  const row = db.select().from(reminderSends).where(and(eq(reminderSends.id, id), eq(reminderSends.studioId, ctx.studio.id))).get();
  if (!row) throw notFound("No reminder with that id in this studio.");
  if (row.status !== "failed") throw conflict(`This reminder is ${row.status}; only a failed one can be sent again.`);
  const found = db
    .select({ piece: pieces, owner: users })
    .from(pieces)
    .innerJoin(users, eq(users.id, pieces.ownerId))
    .where(and(eq(pieces.id, row.pieceId), eq(pieces.studioId, ctx.studio.id)))
    .get();
  if (!found || found.owner.id !== row.userId) throw conflict("The piece has changed hands since; this reminder is not sent to a new owner.");
  if (!found.owner.remindersEnabled) throw conflict("The owner has unsubscribed from care reminders.");
  const { piece, owner } = found;
  const { catalog, byId } = studioCatalog(ctx.studio.id);
  const schedule = scheduleFromColumns({
    piece,
    layers: db.select().from(finishLayers).where(eq(finishLayers.pieceId, piece.id)).all(),
    careLog: db.select().from(careLogEntries).where(eq(careLogEntries.pieceId, piece.id)).all(),
    catalog,
    timeZone: ctx.studio.timeZone,
    now,
  });
  // The current step as the pass finds it: only the steps the studio sends, at its send hour.
  const timing = studioTiming(ctx.studio.id);
  if (!timing.steps.includes(row.step)) throw conflict("The studio has turned this reminder step off (settings → reminder timing); it is not sent again.");
  const cycle = schedule.tasks.find((t) => t.key === row.taskKey && t.dueOn === row.dueOn);
  const task = cycle && withEnabledSteps(cycle, timing.steps);
  const clocks = new OwnerClocks(now.getTime());
  const current = task ? task.reminders[currentStepIndex(task, clocks, owner.timeZone, timing.sendAfterMinutes)]?.step : undefined;
  if (!task || current !== row.step) throw conflict("This reminder's care task has moved on since; the next reminder will go out on its own.");
  const token = `${LEASE_PREFIX}${randomUUID()}`;
  const leased = db
    .update(reminderSends)
    .set({ status: "queued", messageId: token, sentAt: null, nextAttemptAt: null, updatedAt: now })
    .where(and(eq(reminderSends.id, row.id), eq(reminderSends.status, "failed")))
    .run().changes;
  if (leased === 0) throw conflict("Someone else is already sending this reminder.");
  const offerRow = db.select().from(refreshOffers).where(and(eq(refreshOffers.reminderSendId, row.id), eq(refreshOffers.status, "offered"))).get();
  const result = await deliverLease(
    db,
    {
      rowId: row.id,
      token,
      reminderKey: row.reminderKey,
      step: row.step,
      task,
      owner: { id: owner.id, email: owner.email, name: owner.name, unitSystem: owner.unitSystem },
      piece: { id: piece.id, title: piece.title, use: piece.use, sun: piece.sun, shape: topShape(piece), hasResin: piece.resinKind !== "none" },
      studio: { id: ctx.studio.id, name: ctx.studio.name, country: ctx.studio.country },
      product: task.productId ? byId.get(task.productId) : undefined,
      offer: offerRow ? { id: offerRow.id, quote: offerRow.quote } : undefined,
      ownerToday: clocks.at(owner.timeZone).date,
    },
    now.getTime(),
  );
  if (result.kind === "lost") throw conflict("Someone else is already sending this reminder.");
  return result.kind === "sent" ? { status: "sent" as const, messageId: result.item.messageId } : { status: "failed" as const, error: result.item.error };
}
