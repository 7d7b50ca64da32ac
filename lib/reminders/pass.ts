// The reminder pass (steps and send hour: lib/reminders/plan.ts). For every registered piece with reminders on, compute its
// care tasks (lib/care via lib/pieces/care-inputs, studio time zone), and for each task send the most
// recent reminder step whose date has come at the studio's send hour (default 09:00) in the owner's
// zone, unless the send ledger already has it. Only the steps the studio sends count (settings →
// reminder timing, read afresh by every pass): the others are dropped from the task before anything
// is decided, and a row of one waiting for a retry is cancelled. Runs from the scheduler (jobs/index.ts,
// hourly), from `npm run jobs:run-once -- --now <ISO>`, and in tests. No server-only or next/* imports:
// it runs under tsx outside Next.js.
//
// Never twice — the ledger protocol:
// 1. Claim: in an IMMEDIATE transaction a pass inserts the row (status queued) with
//    INSERT … ON CONFLICT(reminder_key) DO NOTHING, or flips a due failed row back to queued with a
//    conditional UPDATE. Only the pass whose statement changed a row owns it; it writes its own claim
//    token into messageId ("claim:<uuid>").
// 2. Hand-off: just before SMTP, `attempts + 1, sentAt = now WHERE status = 'queued' AND messageId =
//    <its token>`. If that changes nothing, another pass took the row over; this one does not send.
// 3. Result: sent + the SMTP Message-ID, or failed + error + nextAttemptAt (15 min, then 1 h; at most
//    3 tries, then nextAttemptAt = null: no more automatic tries).
// A pass killed half way leaves queued rows. One older than STALE_QUEUED_MS is recovered by the next
// pass: if its hand-off never began (sentAt null) it was certainly not sent, and it is put back as a
// failed row due for retry now. If the hand-off began (sentAt set), the SMTP server may or may not
// have accepted it; we cannot ask, so it is marked failed with no automatic retry and an error that
// says so — staff can look in the outbox (or the relay's logs) and resend it. Never sending twice
// wins over never missing one.
//
// Stopping (PassOptions.signal, aborted by the scheduler on SIGTERM/SIGINT): the pass looks at the
// signal before each chunk, after the care engine, and before each message. The message being handed
// to SMTP when the signal comes is finished (sent or failed, as usual); after that nothing new is
// claimed or sent, and the rows this pass claimed but had not yet handed off are released at once —
// put back as failed rows due for retry now, as the stale recovery above would do 15 minutes later —
// so no row is left queued. The next pass sends them. The report says `stopped`.
import { randomUUID } from "node:crypto";
import type Database from "better-sqlite3";
import { getDb, type Db } from "@/db/client";
import type { CareLogRow, FinishProduct } from "@/db/schema";
import { CareInputError } from "@/lib/care/errors";
import { quote, quoteProductFromCatalog, type Quote } from "@/lib/care/quote";
import type { CareTask, CatalogEntry } from "@/lib/care/schedule";
import { topArea } from "@/lib/care/area";
import { scheduleFromColumns, toCatalog, topShape, type CareLayerColumns, type CarePieceColumns } from "@/lib/pieces/care-inputs";
import { sendMailNow } from "@/lib/mail";
import { composeReminder, type ReminderMail } from "./compose";
import {
  currentStepIndex,
  decideTask,
  MAX_ATTEMPTS,
  OwnerClocks,
  pendingRetry,
  RETRY_BACKOFF_MS,
  STALE_QUEUED_MS,
  timingFromColumns,
  withEnabledSteps,
  type LedgerRow,
  type SendTiming,
} from "./plan";

export type ReminderPieceRow = CarePieceColumns & {
  title: string;
  studioId: string;
  ownerId: string;
  ownerEmail: string;
  ownerName: string;
  ownerTimeZone: string;
  ownerUnitSystem: "metric" | "imperial";
};

export type StudioRow = {
  id: string;
  name: string;
  timeZone: string;
  currency: string;
  /** ISO 3166-1 alpha-2: money is written in this country's way. */
  country: string;
  taxRateBp: number;
  labourRateMinor: number;
  travelFeeMinor: number;
};

/** The studio's reminder timing columns as the studios query reads them. */
type StudioTimingColumns = {
  /** studios.reminder_send_hour (0–23, owner's local time). */
  reminderSendHour: number;
  /** studios.reminder_steps as stored (JSON text). */
  reminderSteps: string;
};

export type SentItem = { reminderKey: string; to: string; subject: string; messageId: string; offerId?: string };
export type FailedItem = { reminderKey: string; to: string; error: string; willRetry: boolean };

export interface PassReport {
  now: string;
  studios: number;
  pieces: number;
  tasks: number;
  /** Rows this pass claimed to send (new and retries). */
  claimed: number;
  sent: SentItem[];
  failed: FailedItem[];
  /** Earlier steps recorded as skipped (new rows) or superseded (pending retries). */
  skipped: number;
  cancelled: number;
  offers: number;
  /** Stale queued rows put back for retry (hand-off never began). */
  recovered: number;
  /** Stale queued rows whose hand-off began: marked failed, not retried automatically. */
  interrupted: number;
  /** Claims another pass took over before this one handed them off. */
  lost: number;
  /** The signal stopped this pass before it was done (the next pass finishes the work). */
  stopped: boolean;
  /** Rows this pass claimed, then put back for retry unsent because it was stopped. */
  released: number;
  /** Pieces whose records the care engine could not use (and why). */
  errors: { pieceId: string; message: string }[];
  ms: number;
  /** Where the time went: reading rows, the care engine, the claim transactions, SMTP. */
  phases: { readMs: number; computeMs: number; claimMs: number; deliverMs: number };
}

export interface PassOptions {
  now: Date;
  db?: Db;
  /** false: find due reminders and write their ledger rows (queued) but send nothing — the benchmark. */
  deliver?: boolean;
  chunkSize?: number;
  /** Called after each message is sent (tests stop the SMTP sink here). */
  onSent?: (item: SentItem) => void | Promise<void>;
  /** Aborting it stops the pass cleanly (see "Stopping" above); the report comes back with stopped: true. */
  signal?: AbortSignal;
}

type Claim = ReminderMail & { rowId: string; token: string };
type OfferRow = { pieceId: string; id: string; taskKey: string; dueOn: string; status: string; reminderSendId: string | null; sendStatus: string | null };

// Column lists shared by the bulk statements. Pieces are read in id order, in chunks; layers, the care
// Pieces of every studio are read in one id order, so each chunk is one contiguous key range.
// log and the ledger are read for the same id range with one SELECT each.
const PIECE_FILTER = `p.owner_id IS NOT NULL AND p.archived_at IS NULL AND p.reminders_paused = 0`;
const RANGE = `p.id > ? AND p.id <= ?`;
const LEDGER_COLUMNS = `r.piece_id AS pieceId, r.id, r.reminder_key AS reminderKey, r.task_key AS taskKey, r.due_on AS dueOn, r.step, r.status, r.attempts,
       r.next_attempt_at AS nextAttemptAt, r.message_id AS messageId, r.sent_at AS sentAt, r.updated_at AS updatedAt`;

function statements(sqlite: Database.Database) {
  return {
    studios: sqlite.prepare(
      `SELECT id, name, time_zone AS timeZone, currency, country, tax_rate_bp AS taxRateBp, labour_rate_minor AS labourRateMinor, travel_fee_minor AS travelFeeMinor,
              reminder_send_hour AS reminderSendHour, reminder_steps AS reminderSteps FROM studios ORDER BY id`,
    ),
    pieces: sqlite.prepare(
      `SELECT p.id, p.studio_id AS studioId, p.title, p.kind, p.use, p.sun, p.delivered_on AS deliveredOn, p.resin_kind AS resinKind,
              p.primary_species_id AS primarySpeciesId, p.shape_kind AS shapeKind, p.length_mm AS lengthMm, p.width_mm AS widthMm,
              p.diameter_mm AS diameterMm, p.measured_area_m2 AS measuredAreaM2,
              u.id AS ownerId, u.email AS ownerEmail, u.name AS ownerName, u.time_zone AS ownerTimeZone, u.unit_system AS ownerUnitSystem
         FROM pieces p JOIN users u ON u.id = p.owner_id
        WHERE ${PIECE_FILTER} AND p.id > ? AND u.reminders_enabled = 1 AND u.email_verified_at IS NOT NULL
        ORDER BY p.id LIMIT ?`,
    ),
    layers: sqlite.prepare(
      `SELECT l.piece_id AS pieceId, l.id, l.surface, l.finish_class AS finishClass, l.product_id AS productId, l.coats, l.applied_on AS appliedOn
         FROM pieces p JOIN finish_layers l ON l.piece_id = p.id WHERE ${PIECE_FILTER} AND ${RANGE}`,
    ),
    careLog: sqlite.prepare(
      `SELECT c.piece_id AS pieceId, c.task_kind AS taskKind, c.done_on AS doneOn, c.surface
         FROM pieces p JOIN care_log_entries c ON c.piece_id = p.id WHERE ${PIECE_FILTER} AND ${RANGE}`,
    ),
    // What a chunk needs of the ledger: which reminder keys exist (an index-only range scan: keys
    // start with the piece id, like task keys below), and the full rows of pending ones. Settled rows
    // (sent, skipped, cancelled) of earlier steps and past cycles are never read in full.
    ledgerKeys: sqlite.prepare(`SELECT reminder_key FROM reminder_sends WHERE reminder_key >= ? AND reminder_key < ?`).pluck(),
    ledgerPending: sqlite.prepare(
      `SELECT ${LEDGER_COLUMNS} FROM reminder_sends r
        WHERE r.studio_id IN (SELECT id FROM studios) AND r.status IN ('queued', 'failed') AND r.piece_id > ? AND r.piece_id <= ?`,
    ),
    insertRow: sqlite.prepare(
      `INSERT INTO reminder_sends (id, studio_id, piece_id, user_id, reminder_key, task_key, task_kind, step, due_on, status, attempts, message_id, last_error, created_at, updated_at)
       VALUES (@id, @studioId, @pieceId, @userId, @reminderKey, @taskKey, @taskKind, @step, @dueOn, @status, 0, @messageId, @lastError, @now, @now)
       ON CONFLICT(reminder_key) DO NOTHING`,
    ),
    claimRetry: sqlite.prepare(
      `UPDATE reminder_sends SET status = 'queued', message_id = ?, sent_at = NULL, updated_at = ?
        WHERE id = ? AND status = 'failed' AND next_attempt_at IS NOT NULL AND next_attempt_at <= ? AND attempts < ${MAX_ATTEMPTS}`,
    ),
    supersede: sqlite.prepare(
      `UPDATE reminder_sends SET status = 'skipped', next_attempt_at = NULL, last_error = COALESCE(last_error || ' — ', '') || ?, updated_at = ?
        WHERE id = ? AND status = 'failed' AND next_attempt_at IS NOT NULL`,
    ),
    cancel: sqlite.prepare(
      `UPDATE reminder_sends SET status = 'cancelled', next_attempt_at = NULL, updated_at = ? WHERE id = ? AND status = 'failed' AND next_attempt_at IS NOT NULL`,
    ),
    cancelStepOff: sqlite.prepare(
      `UPDATE reminder_sends SET status = 'cancelled', next_attempt_at = NULL, last_error = COALESCE(last_error || ' — ', '') || ?, updated_at = ?
        WHERE id = ? AND status = 'failed' AND next_attempt_at IS NOT NULL`,
    ),
    recover: sqlite.prepare(
      `UPDATE reminder_sends SET status = 'failed', message_id = NULL, next_attempt_at = ?, last_error = ?, updated_at = ?
        WHERE id = ? AND status = 'queued' AND sent_at IS NULL AND message_id IS ? AND updated_at <= ?`,
    ),
    release: sqlite.prepare(
      `UPDATE reminder_sends SET status = 'failed', message_id = NULL, next_attempt_at = ?, last_error = COALESCE(last_error || ' — ', '') || ?, updated_at = ?
        WHERE id = ? AND status = 'queued' AND message_id = ? AND sent_at IS NULL`,
    ),
    interrupt: sqlite.prepare(
      `UPDATE reminder_sends SET status = 'failed', message_id = NULL, next_attempt_at = NULL, last_error = ?, updated_at = ?
        WHERE id = ? AND status = 'queued' AND sent_at IS NOT NULL AND updated_at <= ?`,
    ),
    // Task keys start with the piece id, so the pieces (lo, hi] own exactly the task keys in [lo;, hi;)
    // (":" sorts just before ";") — a range on the unique (task_key, due_on) index.
    offers: sqlite.prepare(
      `SELECT o.piece_id AS pieceId, o.id, o.task_key AS taskKey, o.due_on AS dueOn, o.status, o.reminder_send_id AS reminderSendId, r.status AS sendStatus
         FROM refresh_offers o LEFT JOIN reminder_sends r ON r.id = o.reminder_send_id WHERE o.task_key >= ? AND o.task_key < ?`,
    ),
    insertOffer: sqlite.prepare(
      `INSERT INTO refresh_offers (id, studio_id, piece_id, user_id, task_key, due_on, price_minor, currency, quote, status, reminder_send_id, created_at)
       VALUES (?, ?, ?, ?, ?, ?, ?, ?, ?, 'offered', ?, ?) ON CONFLICT(task_key, due_on) DO NOTHING`,
    ),
    relinkOffer: sqlite.prepare(`UPDATE refresh_offers SET reminder_send_id = ? WHERE id = ? AND status = 'offered' RETURNING quote`),
    expireOffer: sqlite.prepare(`UPDATE refresh_offers SET status = 'expired' WHERE id = ? AND status = 'offered'`),
    handoff: sqlite.prepare(
      `UPDATE reminder_sends SET attempts = attempts + 1, sent_at = ?, updated_at = ? WHERE id = ? AND status = 'queued' AND message_id = ?`,
    ),
    markSent: sqlite.prepare(
      `UPDATE reminder_sends SET status = 'sent', message_id = ?, sent_at = ?, last_error = NULL, next_attempt_at = NULL, updated_at = ? WHERE id = ?`,
    ),
    attemptsOf: sqlite.prepare(`SELECT attempts FROM reminder_sends WHERE id = ?`),
    markFailed: sqlite.prepare(
      `UPDATE reminder_sends SET status = 'failed', message_id = NULL, sent_at = NULL, last_error = ?, next_attempt_at = ?, updated_at = ?
        WHERE id = ? AND status = 'queued' AND message_id = ?`,
    ),
  };
}

type Stmts = ReturnType<typeof statements>;
const stmtCache = new WeakMap<Database.Database, Stmts>();
function stmtsFor(sqlite: Database.Database): Stmts {
  let s = stmtCache.get(sqlite);
  if (!s) stmtCache.set(sqlite, (s = statements(sqlite)));
  return s;
}

function groupBy<T extends { pieceId: string }>(rows: T[]): Map<string, T[]> {
  const m = new Map<string, T[]>();
  for (const r of rows) {
    const list = m.get(r.pieceId);
    if (list) list.push(r);
    else m.set(r.pieceId, [r]);
  }
  return m;
}

function catalogFor(db: Db, studioId: string): { catalog: CatalogEntry[]; byId: Map<string, CatalogEntry> } {
  const rows = db.$client
    .prepare(
      `SELECT id, studio_id AS studioId, name, finish_class AS finishClass, coverage_m2_per_l AS coverageM2PerL, containers,
              interval_heavy_months AS intervalHeavyMonths, interval_moderate_months AS intervalModerateMonths, interval_light_months AS intervalLightMonths,
              safety_notes AS safetyNotes, archived_at AS archivedAt, created_at AS createdAt
         FROM finish_products WHERE studio_id = ?`,
    )
    .all(studioId) as (Omit<FinishProduct, "containers"> & { containers: string })[];
  const catalog = toCatalog(rows.map((r) => ({ ...r, containers: JSON.parse(r.containers) as FinishProduct["containers"] })) as FinishProduct[]);
  return { catalog, byId: new Map(catalog.map((c) => [c.id, c])) };
}

/** The price of a refresh visit for this task, or undefined when the record lacks what a price needs. */
export function refreshQuote(task: CareTask, piece: CarePieceColumns, studio: StudioRow, product: CatalogEntry | undefined): Quote | undefined {
  const shape = topShape(piece);
  if (!task.isRefresh || task.surface !== "top" || !shape || !product || studio.labourRateMinor <= 0) return undefined;
  if (!product.containerPricesMinor || product.containerSizesMl.length === 0) return undefined;
  try {
    return quote({
      tasks: [task],
      areaM2: topArea(shape).m2,
      rates: { labourPerHourMinor: studio.labourRateMinor },
      products: [quoteProductFromCatalog(product, task.kind)],
      travel: { flatMinor: studio.travelFeeMinor },
      taxRatePct: studio.taxRateBp / 100,
      coveredPct: 0,
      currency: studio.currency,
    });
  } catch (e) {
    if (e instanceof CareInputError) return undefined;
    throw e;
  }
}

export const CLAIM_PREFIX = "claim:";

/**
 * Hands one claimed reminder to SMTP and records the outcome. Exported for the staff "resend" action,
 * which claims a row the same way.
 */
export async function deliverClaim(
  db: Db,
  claim: Claim,
  nowMs: number,
): Promise<{ kind: "sent"; item: SentItem } | { kind: "failed"; item: FailedItem } | { kind: "lost" }> {
  const s = stmtsFor(db.$client);
  if (s.handoff.run(nowMs, nowMs, claim.rowId, claim.token).changes === 0) return { kind: "lost" };
  let mail;
  try {
    mail = composeReminder(claim);
    const { messageId } = await sendMailNow(mail);
    s.markSent.run(messageId, nowMs, nowMs, claim.rowId);
    return { kind: "sent", item: { reminderKey: claim.reminderKey, to: claim.owner.email, subject: mail.subject, messageId, offerId: claim.offer?.id } };
  } catch (e) {
    const attempts = (s.attemptsOf.get(claim.rowId) as { attempts: number } | undefined)?.attempts ?? MAX_ATTEMPTS;
    const willRetry = attempts < MAX_ATTEMPTS;
    const next = willRetry ? nowMs + RETRY_BACKOFF_MS[Math.min(attempts, RETRY_BACKOFF_MS.length) - 1]! : null;
    const error = `try ${attempts} of ${MAX_ATTEMPTS}: ${e instanceof Error ? e.message : String(e)}`.slice(0, 500);
    s.markFailed.run(error, next, nowMs, claim.rowId, claim.token);
    return { kind: "failed", item: { reminderKey: claim.reminderKey, to: claim.owner.email, error, willRetry } };
  }
}

export async function runReminderPass(options: PassOptions): Promise<PassReport> {
  const started = performance.now();
  const db = options.db ?? getDb();
  const sqlite = db.$client;
  const s = stmtsFor(sqlite);
  const nowMs = options.now.getTime();
  if (!Number.isFinite(nowMs)) throw new Error("runReminderPass: now is not a valid date");
  const chunkSize = options.chunkSize ?? Number(process.env.GW_PASS_CHUNK ?? 1000);
  const deliver = options.deliver ?? true;
  const clocks = new OwnerClocks(nowMs);
  const report: PassReport = {
    now: options.now.toISOString(),
    studios: 0,
    pieces: 0,
    tasks: 0,
    claimed: 0,
    sent: [],
    failed: [],
    skipped: 0,
    cancelled: 0,
    offers: 0,
    recovered: 0,
    interrupted: 0,
    lost: 0,
    stopped: false,
    released: 0,
    errors: [],
    ms: 0,
    phases: { readMs: 0, computeMs: 0, claimMs: 0, deliverMs: 0 },
  };
  const ph = report.phases;
  let mark = performance.now();
  const lap = (k: keyof PassReport["phases"]) => {
    const t = performance.now();
    ph[k] += t - mark;
    mark = t;
  };
  const staleBefore = nowMs - STALE_QUEUED_MS;
  const recoverNote = `recovered: claimed by a pass that stopped before handing it to SMTP (certainly not sent); retrying`;
  const interruptNote = (at: number | null) =>
    `interrupted while handing to SMTP${at ? ` at ${new Date(at).toISOString()}` : ""}: delivery unknown, so it is not retried automatically — check the outbox, then resend it if it did not arrive`;

  const stepOffNote = "not sent: the studio turned this reminder step off";
  const releaseNote = "released: the pass was stopped before handing it to SMTP (certainly not sent); the next pass sends it";
  const signal = options.signal;
  /** Lets a signal's abort event run (the pass is otherwise synchronous between messages), then reads it. */
  const stopRequested = async (): Promise<boolean> => {
    if (!signal) return false;
    await new Promise<void>((resolve) => setImmediate(resolve));
    return signal.aborted;
  };
  const studioById = new Map<string, StudioRow & ReturnType<typeof catalogFor> & { timing: SendTiming }>();
  for (const { reminderSendHour, reminderSteps, ...st } of s.studios.all() as (StudioRow & StudioTimingColumns)[]) {
    studioById.set(st.id, { ...st, ...catalogFor(db, st.id), timing: timingFromColumns(reminderSendHour, reminderSteps) });
  }
  report.studios = studioById.size;
  {
    let after = "";
    for (;;) {
      if (await stopRequested()) {
        report.stopped = true;
        break;
      }
      const pieces = s.pieces.all(after, chunkSize) as ReminderPieceRow[];
      if (pieces.length === 0) break;
      const lo = after;
      const hi = pieces[pieces.length - 1]!.id;
      after = hi;
      report.pieces += pieces.length;
      const layers = groupBy(s.layers.all(lo, hi) as (CareLayerColumns & { pieceId: string })[]);
      const logs = groupBy(s.careLog.all(lo, hi) as (Pick<CareLogRow, "taskKind" | "doneOn" | "surface"> & { pieceId: string })[]);
      lap("readMs");

      // The care engine, outside the write transaction.
      // Each task keeps only the steps its studio sends, before the current step is found.
      const schedules: { piece: ReminderPieceRow; tasks: CareTask[]; current: number[] }[] = [];
      for (const piece of pieces) {
        const studio = studioById.get(piece.studioId)!;
        const catalog = studio.catalog;
        const { steps, sendAfterMinutes } = studio.timing;
        try {
          clocks.at(piece.ownerTimeZone);
          const schedule = scheduleFromColumns({ piece, layers: layers.get(piece.id) ?? [], careLog: logs.get(piece.id) ?? [], catalog, timeZone: studio.timeZone, now: nowMs });
          const tasks = schedule.tasks.map((t) => withEnabledSteps(t, steps));
          const current = tasks.map((t) => currentStepIndex(t, clocks, piece.ownerTimeZone, sendAfterMinutes));
          schedules.push({ piece, tasks, current });
          report.tasks += schedule.tasks.length;
        } catch (e) {
          if (!(e instanceof CareInputError)) throw e;
          report.errors.push({ pieceId: piece.id, message: e.message });
        }
      }

      lap("computeMs");
      if (await stopRequested()) {
        report.stopped = true;
        break;
      }

      // Claims, in one IMMEDIATE transaction per chunk, against ledger rows read inside it.
      const claims: Claim[] = [];
      sqlite
        .transaction(() => {
          const existing = new Set(s.ledgerKeys.all(lo === "" ? "" : `${lo};`, `${hi};`) as string[]);
          const ledger = groupBy(s.ledgerPending.all(lo, hi) as (LedgerRow & { pieceId: string })[]);
          // Offers matter only for a refresh task being claimed now (a few pieces a pass), so they are
          // read per piece on first need rather than for the whole chunk (~1 offer per piece on record).
          const offersByPiece = new Map<string, OfferRow[]>();
          const offersOf = (pieceId: string) => {
            let rows = offersByPiece.get(pieceId);
            // Task keys start with "<piece id>:" (taskKey in lib/care); ";" is the character after ":".
            if (!rows) offersByPiece.set(pieceId, (rows = s.offers.all(`${pieceId}:`, `${pieceId};`) as OfferRow[]));
            return rows;
          };
          for (const { piece, tasks, current } of schedules) {
            const studio = studioById.get(piece.studioId)!;
            const byId = studio.byId;
            const rows = ledger.get(piece.id) ?? [];
            const byKey = new Map<string, LedgerRow>();
            const view = { pending: (k: string) => byKey.get(k), exists: (k: string) => existing.has(k) };
            for (const r of rows) {
              if (r.status === "queued" && r.updatedAt <= staleBefore) {
                if (r.sentAt === null) {
                  if (s.recover.run(nowMs, recoverNote, nowMs, r.id, r.messageId, staleBefore).changes > 0) {
                    Object.assign(r, { status: "failed", messageId: null, nextAttemptAt: nowMs });
                    report.recovered++;
                  }
                } else if (s.interrupt.run(interruptNote(r.sentAt), nowMs, r.id, staleBefore).changes > 0) {
                  Object.assign(r, { status: "failed", messageId: null, nextAttemptAt: null });
                  report.interrupted++;
                }
              }
              byKey.set(r.reminderKey, r);
            }
            const cycles = new Set(tasks.map((t) => `${t.key}|${t.dueOn}`));
            for (const r of rows) {
              if (!pendingRetry(r)) continue;
              const cancelled = !cycles.has(`${r.taskKey}|${r.dueOn}`)
                ? s.cancel.run(nowMs, r.id).changes > 0
                : !studio.timing.steps.includes(r.step) && s.cancelStepOff.run(stepOffNote, nowMs, r.id).changes > 0;
              if (cancelled) {
                r.status = "cancelled";
                byKey.delete(r.reminderKey);
                report.cancelled++;
              }
            }
            for (let ti = 0; ti < tasks.length; ti++) {
              const task = tasks[ti]!;
              const d = decideTask(task, view, clocks, piece.ownerTimeZone, current[ti]);
              for (const k of d.skipNew) {
                report.skipped += s.insertRow.run({
                  id: randomUUID(), studioId: studio.id, pieceId: piece.id, userId: piece.ownerId, reminderKey: k.reminderKey, taskKey: task.key,
                  taskKind: task.kind, step: k.step, dueOn: task.dueOn, status: "skipped", messageId: null, lastError: null, now: nowMs,
                }).changes;
              }
              if (!d.send) continue;
              for (const r of d.supersede) report.skipped += s.supersede.run(`superseded by ${d.send.step}`, nowMs, r.id).changes;
              const token = `${CLAIM_PREFIX}${randomUUID()}`;
              let rowId: string;
              if (d.send.claim === "insert") {
                rowId = randomUUID();
                const changed = s.insertRow.run({
                  id: rowId, studioId: studio.id, pieceId: piece.id, userId: piece.ownerId, reminderKey: d.send.reminderKey, taskKey: task.key,
                  taskKind: task.kind, step: d.send.step, dueOn: task.dueOn, status: "queued", messageId: token, lastError: null, now: nowMs,
                }).changes;
                if (changed === 0) continue;
              } else {
                rowId = d.send.row!.id;
                if (s.claimRetry.run(token, nowMs, rowId, nowMs).changes === 0) continue;
              }
              report.claimed++;
              const product = task.productId ? byId.get(task.productId) : undefined;
              let offer: Claim["offer"];
              if (task.isRefresh) {
                const ofTask = offersOf(piece.id).filter((o) => o.taskKey === task.key);
                for (const o of ofTask) if (o.dueOn !== task.dueOn && o.status === "offered") s.expireOffer.run(o.id);
                const existing = ofTask.find((o) => o.dueOn === task.dueOn);
                if (!existing) {
                  const q = refreshQuote(task, piece, studio, product);
                  if (q) {
                    const offerId = randomUUID();
                    if (s.insertOffer.run(offerId, studio.id, piece.id, piece.ownerId, task.key, task.dueOn, q.totalMinor, q.currency, JSON.stringify(q), rowId, nowMs).changes > 0) {
                      offer = { id: offerId, quote: q };
                      report.offers++;
                    }
                  }
                } else if (existing.status === "offered" && (existing.reminderSendId === rowId || existing.sendStatus !== "sent")) {
                  const relinked = s.relinkOffer.get(rowId, existing.id) as { quote: string } | undefined;
                  if (relinked) offer = { id: existing.id, quote: JSON.parse(relinked.quote) as Quote };
                }
              }
              if (!deliver) continue;
              claims.push({
                rowId,
                token,
                reminderKey: d.send.reminderKey,
                step: d.send.step,
                task,
                owner: { id: piece.ownerId, email: piece.ownerEmail, name: piece.ownerName, unitSystem: piece.ownerUnitSystem },
                piece: { id: piece.id, title: piece.title, use: piece.use, sun: piece.sun, shape: topShape(piece), hasResin: piece.resinKind !== "none" },
                studio: { id: studio.id, name: studio.name, country: studio.country },
                product,
                offer,
                ownerToday: clocks.at(piece.ownerTimeZone).date,
              });
            }
          }
        })
        .immediate();
      lap("claimMs");

      for (let i = 0; i < claims.length; i++) {
        if (signal?.aborted) {
          // Nothing of these has reached SMTP: put them back, due now, in one transaction.
          sqlite.transaction(() => {
            for (const c of claims.slice(i)) report.released += s.release.run(nowMs, releaseNote, nowMs, c.rowId, c.token).changes;
          })();
          report.stopped = true;
          break;
        }
        const claim = claims[i]!;
        const r = await deliverClaim(db, claim, nowMs);
        if (r.kind === "sent") {
          report.sent.push(r.item);
          await options.onSent?.(r.item);
        } else if (r.kind === "failed") report.failed.push(r.item);
        else report.lost++;
      }
      lap("deliverMs");
      if (report.stopped) break;
    }
  }
  report.ms = performance.now() - started;
  return report;
}
