// The reminder pass's SQL, all of it: plain better-sqlite3 statements prepared once per connection
// (one query style; the pass reads and writes hundreds of thousands of rows, where building drizzle
// queries would cost more than running them). Every bulk read takes one contiguous range of piece ids:
// pieces of every studio are read in one id order, in chunks, and layers, the care log and the ledger
// are read for the same id range with one SELECT each. Reminder keys and task keys start with the
// piece id, so a piece range is a key range too. The ledger protocol these statements carry out is
// described in pass.ts.
import type Database from "better-sqlite3";
import { PLAN_COVERS } from "@/lib/plans/states";
import { MAX_ATTEMPTS } from "./plan";

const PIECE_FILTER = `p.owner_id IS NOT NULL AND p.archived_at IS NULL AND p.reminders_paused = 0`;
const RANGE = `p.id > ? AND p.id <= ?`;
const LEDGER_COLUMNS = `r.piece_id AS pieceId, r.id, r.reminder_key AS reminderKey, r.task_key AS taskKey, r.due_on AS dueOn, r.step, r.status, r.attempts,
       r.next_attempt_at AS nextAttemptAt, r.message_id AS messageId, r.sent_at AS sentAt, r.updated_at AS updatedAt`;

function statements(sqlite: Database.Database) {
  return {
    products: sqlite.prepare(
      `SELECT id, studio_id AS studioId, name, finish_class AS finishClass, coverage_m2_per_l AS coverageM2PerL, containers,
              interval_heavy_months AS intervalHeavyMonths, interval_moderate_months AS intervalModerateMonths, interval_light_months AS intervalLightMonths,
              safety_notes AS safetyNotes, archived_at AS archivedAt, created_at AS createdAt
         FROM finish_products WHERE studio_id = ?`,
    ),
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
    // The tasks a care plan that covers now includes, for the chunk's pieces (lib/plans: the studio's work, not the owner's).
    planTasks: sqlite.prepare(
      `SELECT s.piece_id AS pieceId, t.included FROM plan_subscriptions s JOIN plan_templates t ON t.id = s.template_id
        WHERE s.piece_id > ? AND s.piece_id <= ? AND s.state IN (${PLAN_COVERS.map((x) => `'${x}'`).join(", ")})`,
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
    leaseRetry: sqlite.prepare(
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
    // A relinked offer goes out to the piece's owner of today, who may not be the one it was first made for.
    relinkOffer: sqlite.prepare(`UPDATE refresh_offers SET reminder_send_id = ?, user_id = ? WHERE id = ? AND status = 'offered' RETURNING quote`),
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

export type PassStatements = ReturnType<typeof statements>;
const stmtCache = new WeakMap<Database.Database, PassStatements>();

/** The pass's statements on this connection, prepared on first use. */
export function passStatements(sqlite: Database.Database): PassStatements {
  let s = stmtCache.get(sqlite);
  if (!s) stmtCache.set(sqlite, (s = statements(sqlite)));
  return s;
}
