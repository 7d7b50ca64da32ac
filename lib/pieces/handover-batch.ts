import { and, asc, count, desc, eq, inArray, isNull, ne, notExists, sql } from "drizzle-orm";
import { getDb } from "@/db/client";
import { clients, handoverBatches, handoverBatchItems, memberships, ownerships, pieceHandovers, pieces, studios, users } from "@/db/schema";
import { recordAudit } from "@/lib/audit";
import type { StudioContext } from "@/lib/auth/guards";
import type { HandoverItemOutcome } from "@/lib/clients/vocabulary";
import { notFound, unprocessable } from "@/lib/errors";
import { mailAfterCommit } from "@/lib/mail/after-commit";
import { HANDOVER_BLOCK_MESSAGES, handoverBlockOf, mailHandover, type HandoverBlock } from "./handover-mail";
import { formatCount } from "@/lib/format";

// Bulk hand-over mail: staff pick pieces whose buyer never had the hand-over mail (or all of them),
// or a CSV import asks to mail its buyers now. The request only writes the mailing (one item per
// piece) and answers; the mail goes out after the answer (the route's after(), lib/mail/after-commit),
// one piece at a time, each item taken by one runner. A mailing nobody has touched for a while (the
// server stopped mid-way) is taken up again when its progress is next read. Each piece is mailed at
// most once across every mailing (mailHandover firstOnly); a resend stays a single action on the
// piece's page. Skipped: no e-mail, no consent to service mail, already registered, already sent.
// No server-only import: the scheduler's pass (jobs/handover-mailings.ts) finishes stalled mailings
// through runHandoverBatch under plain Node.

/** A running mailing not touched for this long is taken up again (a runner touches it every piece). */
export const STALE_BATCH_MS = 60_000;
/** The most pieces one mailing takes. */
export const MAX_BATCH_PIECES = 5_000;

export type SkipReason = HandoverBlock | "already_sent";

export const SKIP_REASON_LABELS: Record<SkipReason, string> = {
  no_buyer: "No buyer recorded",
  no_email: "No e-mail address",
  no_consent: "No consent to service mail",
  registered: "Already registered",
  archived: "Piece archived",
  already_sent: "Hand-over mail already sent",
};

export type HandoverCandidate = { pieceId: string; title: string; deliveredOn: string; clientId: string; clientName: string; email: string | null; block: HandoverBlock | null };

/** Never mailed: no hand-over row that went out. */
const neverSent = () =>
  notExists(
    getDb()
      .select({ one: sql`1` })
      .from(pieceHandovers)
      .where(and(eq(pieceHandovers.pieceId, pieces.id), sql`${pieceHandovers.sendCount} > 0`)),
  );
const neverRegistered = () => notExists(getDb().select({ one: sql`1` }).from(ownerships).where(eq(ownerships.pieceId, pieces.id)));

/** The studio's pieces with a buyer who never had the hand-over mail (not registered, not archived), newest delivery first. */
export function handoverCandidates(ctx: StudioContext): HandoverCandidate[] {
  return getDb()
    .select({ pieceId: pieces.id, title: pieces.title, deliveredOn: pieces.deliveredOn, clientId: clients.id, clientName: clients.name, email: clients.email, consent: clients.consentService })
    .from(pieces)
    .innerJoin(clients, and(eq(clients.id, pieces.clientId), eq(clients.studioId, pieces.studioId)))
    .where(and(eq(pieces.studioId, ctx.studio.id), isNull(pieces.archivedAt), isNull(pieces.ownerId), neverSent(), neverRegistered()))
    .orderBy(desc(pieces.deliveredOn), asc(pieces.title))
    .limit(MAX_BATCH_PIECES)
    .all()
    .map(({ consent, ...c }) => ({ ...c, block: !c.email ? "no_email" : !consent ? "no_consent" : null }));
}

/**
 * Writes a mailing of the given pieces (or every candidate) and returns its id; the caller starts it
 * after answering (runHandoverBatch). Another studio's piece is a 404; nothing to send is a 422.
 */
export function createHandoverBatch(ctx: StudioContext, pick: { pieceIds: readonly string[] } | { all: true }, source: "staff" | "import" = "staff"): { id: string; total: number } {
  const db = getDb();
  let ids: string[];
  if ("all" in pick) ids = handoverCandidates(ctx).map((c) => c.pieceId);
  else {
    ids = [...new Set(pick.pieceIds)];
    const found = ids.length ? db.select({ id: pieces.id }).from(pieces).where(and(eq(pieces.studioId, ctx.studio.id), inArray(pieces.id, ids))).all() : [];
    if (found.length !== ids.length) throw notFound("No piece with that id in this studio.");
  }
  if (ids.length === 0) throw unprocessable("nothing_to_send", "No pieces are waiting for their hand-over mail.");
  if (ids.length > MAX_BATCH_PIECES) throw unprocessable("too_many", `Send at most ${formatCount(MAX_BATCH_PIECES)} pieces at a time.`);
  const now = new Date();
  return db.transaction((tx) => {
    const batch = tx.insert(handoverBatches).values({ studioId: ctx.studio.id, createdById: ctx.user.id, source, state: "queued", createdAt: now, updatedAt: now }).returning({ id: handoverBatches.id }).get();
    for (let i = 0; i < ids.length; i += 500) {
      tx.insert(handoverBatchItems)
        .values(ids.slice(i, i + 500).map((pieceId) => ({ batchId: batch.id, studioId: ctx.studio.id, pieceId, updatedAt: now })))
        .run();
    }
    recordAudit(tx, { studioId: ctx.studio.id, actorId: ctx.user.id, action: "handover_batch.created", subjectType: "handover_batch", subjectId: batch.id, data: { pieces: ids.length, source } });
    return { id: batch.id, total: ids.length };
  });
}

/** The studio context a mailing runs as: its studio, and the staff member who started it. */
function batchContext(batch: typeof handoverBatches.$inferSelect): StudioContext | null {
  const db = getDb();
  const studio = db.select().from(studios).where(eq(studios.id, batch.studioId)).get();
  const user = batch.createdById ? db.select().from(users).where(eq(users.id, batch.createdById)).get() : undefined;
  if (!studio || !user) return null;
  const role = db.select({ role: memberships.role }).from(memberships).where(and(eq(memberships.studioId, studio.id), eq(memberships.userId, user.id))).get()?.role ?? "staff";
  const { id, email, name, emailVerifiedAt, timeZone, unitSystem, remindersEnabled } = user;
  return { role, studio, user: { id, email, name, emailVerifiedAt, timeZone, unitSystem, remindersEnabled } };
}

const settle = (itemId: string, outcome: HandoverItemOutcome, reason: string | null) =>
  getDb().update(handoverBatchItems).set({ outcome, reason, updatedAt: new Date() }).where(eq(handoverBatchItems.id, itemId)).run();

/**
 * Sends a mailing's pieces one by one. Only one runner works a mailing: it takes the mailing (queued,
 * or running but untouched for STALE_BATCH_MS) with a conditional update, and each item with another.
 * Never throws for one piece: a failure is recorded on its item with the reason. "finished" when this
 * call took the mailing and worked it to the end, "stopped" when `signal` stopped it after the mail in
 * hand, null when it was done or another runner had it.
 */
export async function runHandoverBatch(batchId: string, opts: { signal?: AbortSignal; now?: () => Date } = {}): Promise<"finished" | "stopped" | null> {
  const now = opts.now ?? (() => new Date());
  const db = getDb();
  const start = now();
  const taken = db
    .update(handoverBatches)
    .set({ state: "running", startedAt: sql`coalesce(${handoverBatches.startedAt}, ${start.getTime()})`, updatedAt: start })
    .where(and(eq(handoverBatches.id, batchId), sql`(${handoverBatches.state} = 'queued' OR (${handoverBatches.state} = 'running' AND ${handoverBatches.updatedAt} < ${start.getTime() - STALE_BATCH_MS}))`))
    .returning()
    .get();
  if (!taken) return null;
  const ctx = batchContext(taken);
  // An item left "sending" by a runner that stopped: its mail went out if the piece's hand-over row says so.
  for (const item of db.select().from(handoverBatchItems).where(and(eq(handoverBatchItems.batchId, batchId), eq(handoverBatchItems.outcome, "sending"))).all()) {
    const went = db.select({ n: pieceHandovers.sendCount }).from(pieceHandovers).where(eq(pieceHandovers.pieceId, item.pieceId)).get();
    settle(item.id, went?.n ? "sent" : "pending", null);
  }
  for (;;) {
    // Stopping (the scheduler's SIGTERM): the mail in hand has gone; the rest stay pending and the
    // mailing stays "running" until its lease runs out, when the next pass takes it up again.
    if (opts.signal?.aborted) return "stopped";
    const item = db.select().from(handoverBatchItems).where(and(eq(handoverBatchItems.batchId, batchId), eq(handoverBatchItems.outcome, "pending"))).orderBy(asc(handoverBatchItems.id)).limit(1).get();
    if (!item) break;
    const mine = db
      .update(handoverBatchItems)
      .set({ outcome: "sending", updatedAt: now() })
      .where(and(eq(handoverBatchItems.id, item.id), eq(handoverBatchItems.outcome, "pending")))
      .run().changes;
    if (mine === 0) continue;
    if (!ctx) {
      settle(item.id, "failed", "The person who started this mailing is no longer on the studio's team.");
      continue;
    }
    try {
      const piece = db.select().from(pieces).where(and(eq(pieces.id, item.pieceId), eq(pieces.studioId, taken.studioId))).get();
      const block = piece ? handoverBlockOf(ctx, piece) : "archived";
      if (block) settle(item.id, "skipped", block);
      else {
        const out = await mailHandover(ctx, item.pieceId, now(), { firstOnly: true });
        settle(item.id, out === "sent" ? "sent" : "skipped", out === "sent" ? null : "already_sent");
      }
    } catch (e) {
      settle(item.id, "failed", (e instanceof Error ? e.message : String(e)).slice(0, 300));
    }
    db.update(handoverBatches).set({ updatedAt: now() }).where(eq(handoverBatches.id, batchId)).run();
  }
  const end = now();
  db.update(handoverBatches).set({ state: "done", finishedAt: end, updatedAt: end }).where(and(eq(handoverBatches.id, batchId), ne(handoverBatches.state, "done"))).run();
  return "finished";
}

/** Starts a mailing after the caller has answered; its failures are logged, never thrown. */
export function startHandoverBatch(batchId: string): Promise<void> {
  return mailAfterCommit(`hand-over mailing ${batchId}`, () => runHandoverBatch(batchId));
}

export type HandoverBatchProgress = {
  id: string;
  state: "queued" | "running" | "done";
  total: number;
  /** Pieces finished (sent, skipped or failed). */
  finished: number;
  sent: number;
  skipped: { reason: SkipReason; label: string; count: number }[];
  failed: { pieceId: string; title: string; reason: string }[];
  createdAt: string;
  finishedAt: string | null;
  /** Nobody has worked it for STALE_BATCH_MS: the caller starts it again. */
  stalled: boolean;
};

/** A mailing's progress and summary, for its studio's staff (another studio's is a 404). */
export function handoverBatchProgress(ctx: StudioContext, batchId: string, nowMs = Date.now()): HandoverBatchProgress {
  const db = getDb();
  const batch = db.select().from(handoverBatches).where(and(eq(handoverBatches.id, batchId), eq(handoverBatches.studioId, ctx.studio.id))).get();
  if (!batch) throw notFound("No hand-over mailing with that id in this studio.");
  const groups = db
    .select({ outcome: handoverBatchItems.outcome, reason: handoverBatchItems.reason, n: count() })
    .from(handoverBatchItems)
    .where(eq(handoverBatchItems.batchId, batch.id))
    .groupBy(handoverBatchItems.outcome, handoverBatchItems.reason)
    .all();
  const sum = (o: HandoverItemOutcome) => groups.filter((g) => g.outcome === o).reduce((a, g) => a + g.n, 0);
  const failed = db
    .select({ pieceId: pieces.id, title: pieces.title, reason: handoverBatchItems.reason })
    .from(handoverBatchItems)
    .innerJoin(pieces, eq(pieces.id, handoverBatchItems.pieceId))
    .where(and(eq(handoverBatchItems.batchId, batch.id), eq(handoverBatchItems.outcome, "failed")))
    .orderBy(asc(pieces.title))
    .limit(100)
    .all()
    .map((f) => ({ ...f, reason: f.reason ?? "Unknown" }));
  const total = groups.reduce((a, g) => a + g.n, 0);
  const sent = sum("sent");
  const skipped = groups
    .filter((g) => g.outcome === "skipped")
    .map((g) => ({ reason: g.reason as SkipReason, label: SKIP_REASON_LABELS[g.reason as SkipReason] ?? HANDOVER_BLOCK_MESSAGES[g.reason as HandoverBlock] ?? g.reason ?? "", count: g.n }))
    .sort((a, b) => b.count - a.count);
  return {
    id: batch.id,
    state: batch.state,
    total,
    finished: sent + sum("skipped") + sum("failed"),
    sent,
    skipped,
    failed,
    createdAt: batch.createdAt.toISOString(),
    finishedAt: batch.finishedAt?.toISOString() ?? null,
    stalled: batch.state !== "done" && batch.updatedAt.getTime() < nowMs - STALE_BATCH_MS,
  };
}

/** The studio's latest mailings, newest first (the hand-over page lists them). */
export function recentHandoverBatches(ctx: StudioContext, limit = 5): HandoverBatchProgress[] {
  return getDb()
    .select({ id: handoverBatches.id })
    .from(handoverBatches)
    .where(eq(handoverBatches.studioId, ctx.studio.id))
    .orderBy(desc(handoverBatches.createdAt))
    .limit(limit)
    .all()
    .map((b) => handoverBatchProgress(ctx, b.id));
}
