// The reminder pass (steps and send hour: lib/reminders/plan.ts). For every registered piece with reminders on, compute its
// care tasks (lib/care via lib/pieces/care-inputs, studio time zone), and for each task send the most
// recent reminder step whose date has come at the studio's send hour (default 09:00) in the owner's
// zone, unless the send ledger already has it. Only the steps the studio sends count (settings →
// reminder timing, read afresh by every pass): the others are dropped from the task before anything
// is decided, and a row of one waiting for a retry is cancelled. Runs from the scheduler (jobs/index.ts,
// hourly), from `npm run jobs:run-once -- --now <ISO>`, and in tests. Its SQL is in pass-sql.ts; the
// hand-off to SMTP in deliver.ts. No server-only or next/* imports:
// it runs under tsx outside Next.js.
//
// Never twice — the ledger protocol:
// 1. Lease: in an IMMEDIATE transaction a pass inserts the row (status queued) with
//    INSERT … ON CONFLICT(reminder_key) DO NOTHING, or flips a due failed row back to queued with a
//    conditional UPDATE. Only the pass whose statement changed a row holds it; it writes its own lease
//    token into messageId ("lease:<uuid>"; rows leased before the word changed carry "claim:<uuid>",
//    which every statement treats alike: only equality with the holder's token counts).
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
// leased or sent, and the rows this pass leased but had not yet handed off are released at once —
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
import type { PlanIncluded } from "@/lib/plans/terms";
import { scheduleFromColumns, toCatalog, topShape, type CareLayerColumns, type CarePieceColumns } from "@/lib/pieces/care-inputs";
import { deliverLease, LEASE_PREFIX, type FailedItem, type Lease, type SentItem } from "./deliver";
import { passStatements, type PassStatements } from "./pass-sql";
import {
  currentStepIndex,
  decideTask,
  OwnerClocks,
  pendingRetry,
  STALE_QUEUED_MS,
  timingFromColumns,
  withEnabledSteps,
  type LedgerRow,
  type SendTiming,
  type TaskDecision,
} from "./plan";

export type { FailedItem, SentItem } from "./deliver";

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

export interface PassReport {
  now: string;
  studios: number;
  pieces: number;
  tasks: number;
  /** Ledger rows this pass leased to send (new and retries). */
  leased: number;
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
  /** Leases another pass took over before this one handed them off. */
  lost: number;
  /** The signal stopped this pass before it was done (the next pass finishes the work). */
  stopped: boolean;
  /** Rows this pass leased, then put back for retry unsent because it was stopped. */
  released: number;
  /** Pieces whose records the care engine could not use (and why). */
  errors: { pieceId: string; message: string }[];
  ms: number;
  /** Where the time went: reading rows, the care engine, the lease transactions, SMTP. */
  phases: { readMs: number; computeMs: number; leaseMs: number; deliverMs: number };
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

type OfferRow = { pieceId: string; id: string; taskKey: string; dueOn: string; status: string; reminderSendId: string | null; sendStatus: string | null };
type Studio = StudioRow & { catalog: CatalogEntry[]; byId: Map<string, CatalogEntry>; timing: SendTiming };
type Chunk = {
  lo: string;
  hi: string;
  pieces: ReminderPieceRow[];
  layers: Map<string, CareLayerColumns[]>;
  logs: Map<string, Pick<CareLogRow, "taskKind" | "doneOn" | "surface">[]>;
  /** The care tasks a running plan includes, by piece: the studio's work, so no reminder (lib/plans). */
  planTasks: Map<string, Set<string>>;
};
type Scheduled = { piece: ReminderPieceRow; tasks: CareTask[]; current: number[] };

const RECOVER_NOTE = "recovered: leased by a pass that stopped before handing it to SMTP (certainly not sent); retrying";
const STEP_OFF_NOTE = "not sent: the studio turned this reminder step off";
const RELEASE_NOTE = "released: the pass was stopped before handing it to SMTP (certainly not sent); the next pass sends it";
const interruptNote = (at: number | null) =>
  `interrupted while handing to SMTP${at ? ` at ${new Date(at).toISOString()}` : ""}: delivery unknown, so it is not retried automatically — check the outbox, then resend it if it did not arrive`;

/** What one pass carries from step to step. */
class Pass {
  readonly db: Db;
  readonly sqlite: Database.Database;
  readonly s: PassStatements;
  readonly nowMs: number;
  readonly staleBefore: number;
  readonly chunkSize: number;
  readonly deliver: boolean;
  readonly clocks: OwnerClocks;
  readonly report: PassReport;
  private mark = performance.now();

  constructor(readonly options: PassOptions) {
    this.db = options.db ?? getDb();
    this.sqlite = this.db.$client;
    this.s = passStatements(this.sqlite);
    this.nowMs = options.now.getTime();
    if (!Number.isFinite(this.nowMs)) throw new Error("runReminderPass: now is not a valid date");
    this.staleBefore = this.nowMs - STALE_QUEUED_MS;
    this.chunkSize = options.chunkSize ?? Number(process.env.GW_PASS_CHUNK ?? 1000);
    this.deliver = options.deliver ?? true;
    this.clocks = new OwnerClocks(this.nowMs);
    this.report = {
      now: options.now.toISOString(),
      studios: 0,
      pieces: 0,
      tasks: 0,
      leased: 0,
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
      phases: { readMs: 0, computeMs: 0, leaseMs: 0, deliverMs: 0 },
    };
  }

  /** Adds the time since the last lap to one phase. */
  lap(phase: keyof PassReport["phases"]): void {
    const t = performance.now();
    this.report.phases[phase] += t - this.mark;
    this.mark = t;
  }

  /** Lets a signal's abort event run (the pass is otherwise synchronous between messages), then reads it. */
  async stopRequested(): Promise<boolean> {
    if (!this.options.signal) return false;
    await new Promise<void>((resolve) => setImmediate(resolve));
    if (this.options.signal.aborted) this.report.stopped = true;
    return this.options.signal.aborted;
  }
}

export async function runReminderPass(options: PassOptions): Promise<PassReport> {
  const started = performance.now();
  const pass = new Pass(options);
  const studios = loadStudios(pass);
  for (let after = ""; ; ) {
    if (await pass.stopRequested()) break;
    const chunk = readChunk(pass, after);
    if (!chunk) break;
    after = chunk.hi;
    const scheduled = computeSchedules(pass, studios, chunk);
    if (await pass.stopRequested()) break;
    const leases = leaseChunk(pass, studios, chunk, scheduled);
    await deliverLeases(pass, leases);
    if (pass.report.stopped) break;
  }
  pass.report.ms = performance.now() - started;
  return pass.report;
}

/** Step 1: every studio with its catalog and its reminder timing (read afresh by every pass). */
function loadStudios(pass: Pass): Map<string, Studio> {
  const studios = new Map<string, Studio>();
  for (const { reminderSendHour, reminderSteps, ...st } of pass.s.studios.all() as (StudioRow & StudioTimingColumns)[]) {
    studios.set(st.id, { ...st, ...catalogFor(pass.s, st.id), timing: timingFromColumns(reminderSendHour, reminderSteps) });
  }
  pass.report.studios = studios.size;
  return studios;
}

function catalogFor(s: PassStatements, studioId: string): { catalog: CatalogEntry[]; byId: Map<string, CatalogEntry> } {
  const rows = s.products.all(studioId) as (Omit<FinishProduct, "containers"> & { containers: string })[];
  const catalog = toCatalog(rows.map((r) => ({ ...r, containers: JSON.parse(r.containers) as FinishProduct["containers"] })) as FinishProduct[]);
  return { catalog, byId: new Map(catalog.map((c) => [c.id, c])) };
}

/** Step 2: the next chunk of pieces after `after` (id order), with their layers and care log; null at the end. */
function readChunk(pass: Pass, after: string): Chunk | null {
  const pieces = pass.s.pieces.all(after, pass.chunkSize) as ReminderPieceRow[];
  if (pieces.length === 0) return null;
  const lo = after;
  const hi = pieces[pieces.length - 1]!.id;
  pass.report.pieces += pieces.length;
  const layers = groupBy(pass.s.layers.all(lo, hi) as (CareLayerColumns & { pieceId: string })[]);
  const logs = groupBy(pass.s.careLog.all(lo, hi) as (Pick<CareLogRow, "taskKind" | "doneOn" | "surface"> & { pieceId: string })[]);
  const planTasks = new Map<string, Set<string>>();
  for (const r of pass.s.planTasks.all(lo, hi) as { pieceId: string; included: string }[]) {
    const tasks = (JSON.parse(r.included) as PlanIncluded).tasks;
    planTasks.set(r.pieceId, new Set([...(planTasks.get(r.pieceId) ?? []), ...tasks]));
  }
  pass.lap("readMs");
  return { lo, hi, pieces, layers, logs, planTasks };
}

/**
 * Step 3: the care engine, outside the write transaction. Each task keeps only the steps its studio
 * sends, before its current step is found.
 */
function computeSchedules(pass: Pass, studios: Map<string, Studio>, chunk: Chunk): Scheduled[] {
  const out: Scheduled[] = [];
  for (const piece of chunk.pieces) {
    const studio = studios.get(piece.studioId)!;
    const { steps, sendAfterMinutes } = studio.timing;
    try {
      pass.clocks.at(piece.ownerTimeZone);
      const schedule = scheduleFromColumns({
        piece,
        layers: chunk.layers.get(piece.id) ?? [],
        careLog: chunk.logs.get(piece.id) ?? [],
        catalog: studio.catalog,
        timeZone: studio.timeZone,
        now: pass.nowMs,
      });
      const tasks = schedule.tasks.filter((t) => !chunk.planTasks.get(piece.id)?.has(t.kind)).map((t) => withEnabledSteps(t, steps));
      const current = tasks.map((t) => currentStepIndex(t, pass.clocks, piece.ownerTimeZone, sendAfterMinutes));
      out.push({ piece, tasks, current });
      pass.report.tasks += schedule.tasks.length;
    } catch (e) {
      if (!(e instanceof CareInputError)) throw e;
      pass.report.errors.push({ pieceId: piece.id, message: e.message });
    }
  }
  pass.lap("computeMs");
  return out;
}

/**
 * Step 4: in one IMMEDIATE transaction per chunk, against the ledger rows read inside it: recover
 * stale rows, cancel retries whose cycle or step is gone, then lease what is due (with its refresh
 * offer). Returns the leases to hand to SMTP (none when the pass does not deliver).
 */
function leaseChunk(pass: Pass, studios: Map<string, Studio>, chunk: Chunk, scheduled: Scheduled[]): Lease[] {
  const leases: Lease[] = [];
  pass.sqlite
    .transaction(() => {
      const s = pass.s;
      const existing = new Set(s.ledgerKeys.all(chunk.lo === "" ? "" : `${chunk.lo};`, `${chunk.hi};`) as string[]);
      const ledger = groupBy(s.ledgerPending.all(chunk.lo, chunk.hi) as (LedgerRow & { pieceId: string })[]);
      const offers = new OffersOf(s);
      for (const { piece, tasks, current } of scheduled) {
        const studio = studios.get(piece.studioId)!;
        const rows = ledger.get(piece.id) ?? [];
        const byKey = recoverStale(pass, rows);
        cancelGoneRetries(pass, studio, tasks, rows, byKey);
        const view = { pending: (k: string) => byKey.get(k), exists: (k: string) => existing.has(k) };
        for (let ti = 0; ti < tasks.length; ti++) {
          const task = tasks[ti]!;
          const lease = leaseTask(pass, studio, piece, task, decideTask(task, view, pass.clocks, piece.ownerTimeZone, current[ti]), offers);
          if (lease && pass.deliver) leases.push(lease);
        }
      }
    })
    .immediate();
  pass.lap("leaseMs");
  return leases;
}

/** Queued rows older than STALE_QUEUED_MS: put back for retry (never handed off) or marked interrupted. Returns the rows by key. */
function recoverStale(pass: Pass, rows: LedgerRow[]): Map<string, LedgerRow> {
  const { s, nowMs, staleBefore, report } = pass;
  const byKey = new Map<string, LedgerRow>();
  for (const r of rows) {
    if (r.status === "queued" && r.updatedAt <= staleBefore) {
      if (r.sentAt === null) {
        if (s.recover.run(nowMs, RECOVER_NOTE, nowMs, r.id, r.messageId, staleBefore).changes > 0) {
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
  return byKey;
}

/** Rows waiting for a retry whose care cycle moved on, or whose step the studio turned off, are cancelled. */
function cancelGoneRetries(pass: Pass, studio: Studio, tasks: CareTask[], rows: LedgerRow[], byKey: Map<string, LedgerRow>): void {
  const { s, nowMs, report } = pass;
  const cycles = new Set(tasks.map((t) => `${t.key}|${t.dueOn}`));
  for (const r of rows) {
    if (!pendingRetry(r)) continue;
    const cancelled = !cycles.has(`${r.taskKey}|${r.dueOn}`)
      ? s.cancel.run(nowMs, r.id).changes > 0
      : !studio.timing.steps.includes(r.step) && s.cancelStepOff.run(STEP_OFF_NOTE, nowMs, r.id).changes > 0;
    if (cancelled) {
      r.status = "cancelled";
      byKey.delete(r.reminderKey);
      report.cancelled++;
    }
  }
}

/** Records the skipped and superseded steps of one task and leases its step to send, if any. */
function leaseTask(pass: Pass, studio: Studio, piece: ReminderPieceRow, task: CareTask, d: TaskDecision, offers: OffersOf): Lease | null {
  const { s, nowMs, report } = pass;
  const row = (reminderKey: string, step: string, status: "queued" | "skipped", id: string, messageId: string | null) => ({
    id, studioId: studio.id, pieceId: piece.id, userId: piece.ownerId, reminderKey, taskKey: task.key,
    taskKind: task.kind, step, dueOn: task.dueOn, status, messageId, lastError: null, now: nowMs,
  });
  for (const k of d.skipNew) report.skipped += s.insertRow.run(row(k.reminderKey, k.step, "skipped", randomUUID(), null)).changes;
  if (!d.send) return null;
  for (const r of d.supersede) report.skipped += s.supersede.run(`superseded by ${d.send.step}`, nowMs, r.id).changes;
  const token = `${LEASE_PREFIX}${randomUUID()}`;
  let rowId: string;
  if (d.send.lease === "insert") {
    rowId = randomUUID();
    if (s.insertRow.run(row(d.send.reminderKey, d.send.step, "queued", rowId, token)).changes === 0) return null;
  } else {
    rowId = d.send.row!.id;
    if (s.leaseRetry.run(token, nowMs, rowId, nowMs).changes === 0) return null;
  }
  report.leased++;
  const product = task.productId ? studio.byId.get(task.productId) : undefined;
  const offer = task.isRefresh ? refreshOfferFor(pass, studio, piece, task, product, rowId, offers) : undefined;
  return {
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
    ownerToday: pass.clocks.at(piece.ownerTimeZone).date,
  };
}

/**
 * A piece's refresh offers, read on first need: they matter only for a refresh task being leased now
 * (a few pieces a pass), rather than for the whole chunk (~1 offer per piece on record).
 */
class OffersOf {
  private readonly byPiece = new Map<string, OfferRow[]>();
  constructor(private readonly s: PassStatements) {}
  get(pieceId: string): OfferRow[] {
    let rows = this.byPiece.get(pieceId);
    // Task keys start with "<piece id>:" (taskKey in lib/care); ";" is the character after ":".
    if (!rows) this.byPiece.set(pieceId, (rows = this.s.offers.all(`${pieceId}:`, `${pieceId};`) as OfferRow[]));
    return rows;
  }
}

/** The refresh offer that rides on a refresh task's reminder: a new one, or the cycle's own one relinked to this row. */
function refreshOfferFor(pass: Pass, studio: Studio, piece: ReminderPieceRow, task: CareTask, product: CatalogEntry | undefined, rowId: string, offers: OffersOf): Lease["offer"] {
  const { s, nowMs, report } = pass;
  const ofTask = offers.get(piece.id).filter((o) => o.taskKey === task.key);
  for (const o of ofTask) if (o.dueOn !== task.dueOn && o.status === "offered") s.expireOffer.run(o.id);
  const existing = ofTask.find((o) => o.dueOn === task.dueOn);
  if (!existing) {
    const q = refreshQuote(task, piece, studio, product);
    if (!q) return undefined;
    const offerId = randomUUID();
    if (s.insertOffer.run(offerId, studio.id, piece.id, piece.ownerId, task.key, task.dueOn, q.totalMinor, q.currency, JSON.stringify(q), rowId, nowMs).changes === 0) return undefined;
    report.offers++;
    return { id: offerId, quote: q };
  }
  if (existing.status === "offered" && (existing.reminderSendId === rowId || existing.sendStatus !== "sent")) {
    const relinked = s.relinkOffer.get(rowId, piece.ownerId, existing.id) as { quote: string } | undefined;
    if (relinked) return { id: existing.id, quote: JSON.parse(relinked.quote) as Quote };
  }
  return undefined;
}

/**
 * Step 5: hands the chunk's leases to SMTP one by one. When the signal comes, the ones not yet handed
 * off are put back, due now, in one transaction.
 */
async function deliverLeases(pass: Pass, leases: Lease[]): Promise<void> {
  const { s, nowMs, report } = pass;
  for (let i = 0; i < leases.length; i++) {
    if (pass.options.signal?.aborted) {
      pass.sqlite.transaction(() => {
        for (const l of leases.slice(i)) report.released += s.release.run(nowMs, RELEASE_NOTE, nowMs, l.rowId, l.token).changes;
      })();
      report.stopped = true;
      break;
    }
    const r = await deliverLease(pass.db, leases[i]!, nowMs);
    if (r.kind === "sent") {
      report.sent.push(r.item);
      await pass.options.onSent?.(r.item);
    } else if (r.kind === "failed") report.failed.push(r.item);
    else report.lost++;
  }
  pass.lap("deliverMs");
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

function groupBy<T extends { pieceId: string }>(rows: T[]): Map<string, T[]> {
  const m = new Map<string, T[]>();
  for (const r of rows) {
    const list = m.get(r.pieceId);
    if (list) list.push(r);
    else m.set(r.pieceId, [r]);
  }
  return m;
}
