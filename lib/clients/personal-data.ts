import "server-only";
import { sql, type SQL } from "drizzle-orm";
import { strToU8, zipSync } from "fflate";
import { getDb } from "@/db/client";
import type { StudioContext } from "@/lib/auth/guards";
import { recordAudit } from "@/lib/audit";
import { indexPiece } from "@/lib/pieces/search-index";
import { readStoredFile, removeStoredFiles } from "@/lib/storage";
import { loadClient } from "./access";

// A client's personal data, for an admin answering the person's request: everything the studio
// holds about them as one zip (JSON of every row, their photos beside it), and erasure. Erasure
// keeps the studio's warranty record (pieces, finish layers, care done, claim decisions, jobs and
// payments) and removes the person from it: contact details, notes, consent history, addresses,
// what they wrote, their photos and the links to their account. The audit log records that it
// happened and how many rows it touched, never the data. README "Personal data" says why.

export const ERASED_NAME = "Erased client";
export const ERASED_TEXT = "(erased at the person's request)";

type Scope = { client: string; user: string | null; studio: string };

// Each section: the rows about the person, read with every column (secrets left out).
const SECTIONS: Record<string, (s: Scope) => SQL> = {
  client: (s) => sql`SELECT * FROM clients WHERE id = ${s.client} AND studio_id = ${s.studio}`,
  consent_history: (s) => sql`SELECT * FROM client_consents WHERE client_id = ${s.client} AND studio_id = ${s.studio} ORDER BY given_at`,
  account: (s) => sql`SELECT id, email, name, email_verified_at, time_zone, unit_system, reminders_enabled, created_at FROM users WHERE id = ${s.user}`,
  pieces: (s) => sql`SELECT * FROM pieces WHERE studio_id = ${s.studio} AND (client_id = ${s.client} OR owner_id = ${s.user}
    OR id IN (SELECT piece_id FROM ownerships WHERE user_id = ${s.user} AND studio_id = ${s.studio})) ORDER BY delivered_on`,
  hand_over_mail: (s) => sql`SELECT id, piece_id, client_id, email, expires_at, first_sent_at, last_sent_at, send_count, opened_at, registered_at, used_at, created_at FROM piece_handovers WHERE client_id = ${s.client} AND studio_id = ${s.studio}`,
  ownerships: (s) => sql`SELECT * FROM ownerships WHERE user_id = ${s.user} AND studio_id = ${s.studio} ORDER BY started_at`,
  care_log: (s) => sql`SELECT * FROM care_log_entries WHERE user_id = ${s.user} AND studio_id = ${s.studio} ORDER BY done_on`,
  claims: (s) => sql`SELECT * FROM claims WHERE owner_id = ${s.user} AND studio_id = ${s.studio} ORDER BY created_at`,
  repair_jobs: (s) => sql`SELECT * FROM repair_jobs WHERE owner_id = ${s.user} AND studio_id = ${s.studio} ORDER BY created_at`,
  payments: (s) => sql`SELECT * FROM payments WHERE studio_id = ${s.studio} AND job_id IN (SELECT id FROM repair_jobs WHERE owner_id = ${s.user} AND studio_id = ${s.studio}) ORDER BY created_at`,
  visits: (s) => sql`SELECT id, job_id, piece_id, technician_id, start_at, end_at, location_kind, location, state, cancelled_at, cancel_reason, report_work, reported_at, signed_off_at, created_at
    FROM visits WHERE studio_id = ${s.studio} AND job_id IN (SELECT id FROM repair_jobs WHERE owner_id = ${s.user} AND studio_id = ${s.studio}) ORDER BY start_at`,
  care_reminders_sent: (s) => sql`SELECT * FROM reminder_sends WHERE user_id = ${s.user} AND studio_id = ${s.studio} ORDER BY created_at`,
  refresh_offers: (s) => sql`SELECT * FROM refresh_offers WHERE user_id = ${s.user} AND studio_id = ${s.studio} ORDER BY created_at`,
  conversations: (s) => sql`SELECT * FROM threads WHERE owner_id = ${s.user} AND studio_id = ${s.studio} ORDER BY created_at`,
  conversation_messages: (s) => sql`SELECT * FROM thread_messages WHERE studio_id = ${s.studio} AND thread_id IN (SELECT id FROM threads WHERE owner_id = ${s.user} AND studio_id = ${s.studio}) ORDER BY created_at`,
  unmatched_mail: (s) => sql`SELECT * FROM unmatched_mail WHERE studio_id = ${s.studio} AND from_email = (SELECT email FROM clients WHERE id = ${s.client}) ORDER BY received_at`,
  photos: (s) => photosWhere(s, sql`SELECT id, purpose, piece_id, claim_id, content_type, width, height, bytes, created_at FROM files`),
  record_changes: (s) => sql`SELECT id, actor_id, action, data, created_at FROM audit_log WHERE subject_type = 'client' AND subject_id = ${s.client} AND studio_id = ${s.studio} ORDER BY created_at`,
};

/** Photos the person gave the studio: uploaded by them, on their claims, or on care they logged. */
function photosWhere(s: Scope, select: SQL): SQL {
  return sql`${select} WHERE studio_id = ${s.studio} AND (uploaded_by_id = ${s.user}
    OR claim_id IN (SELECT id FROM claims WHERE owner_id = ${s.user} AND studio_id = ${s.studio})
    OR id IN (SELECT photo_file_id FROM care_log_entries WHERE user_id = ${s.user} AND studio_id = ${s.studio}))`;
}

// Keys and hashes that open things (a drawer card's code, a link) are not the person's data.
const SECRET_COLUMNS = ["registration_code_hash", "registration_code_enc", "token_hash", "sign_off_token_hash", "password_hash"];
function withoutSecrets(row: Record<string, unknown>): Record<string, unknown> {
  for (const c of SECRET_COLUMNS) delete row[c];
  return row;
}

function scopeOf(ctx: StudioContext, clientId: string): Scope {
  const c = loadClient(ctx, clientId);
  return { client: c.id, user: c.userId, studio: ctx.studio.id };
}

/** Everything held about one client of the caller's studio, section by section (404 for anyone else's). */
export function clientDataSections(ctx: StudioContext, clientId: string): Record<string, Record<string, unknown>[]> {
  const s = scopeOf(ctx, clientId);
  const db = getDb();
  return Object.fromEntries(Object.entries(SECTIONS).map(([name, q]) => [name, db.all<Record<string, unknown>>(q(s)).map(withoutSecrets)]));
}

const EXT: Record<string, string> = { "image/jpeg": "jpg", "image/png": "png", "image/webp": "webp", "image/avif": "avif" };

/** GET /api/clients/[id]/personal-data: the zip (data.json, photos/<id>.<ext>, README.txt). */
export async function exportClientData(ctx: StudioContext, clientId: string, now = new Date()): Promise<{ zip: Uint8Array; filename: string }> {
  const sections = clientDataSections(ctx, clientId);
  const entries: Record<string, Uint8Array> = {};
  for (const p of getDb().all<{ id: string; storage_key: string; content_type: string }>(photosWhere(scopeOf(ctx, clientId), sql`SELECT id, storage_key, content_type FROM files`))) {
    try {
      entries[`photos/${p.id}.${EXT[p.content_type] ?? "bin"}`] = new Uint8Array(await readStoredFile(p.storage_key));
    } catch {
      // A photo whose file is gone is still listed in data.json.
    }
  }
  const data = { studio: { name: ctx.studio.name, email: ctx.studio.email }, exportedAt: now.toISOString(), timesAre: "milliseconds since 1970-01-01 UTC", ...sections };
  entries["data.json"] = strToU8(JSON.stringify(data, null, 2));
  entries["README.txt"] = strToU8(
    `Everything ${ctx.studio.name} holds about this person in Grainward, exported on ${now.toISOString().slice(0, 10)}.\n` +
      "data.json has one section per kind of record; photos/ holds the photos they gave the studio, named by their id in data.json.\n",
  );
  getDb().transaction((tx) => recordAudit(tx, { studioId: ctx.studio.id, actorId: ctx.user.id, action: "client.exported", subjectType: "client", subjectId: clientId, data: { photos: Object.keys(entries).length - 2 } }));
  return { zip: zipSync(entries, { level: 6, mtime: now }), filename: `client-${clientId.slice(0, 8)}-personal-data.zip` };
}

export type ErasureReport = { pieces: number; photos: number; claims: number; messages: number };

/**
 * Erases a client of the caller's studio on their request (admins): the record keeps no personal
 * field, their photos are deleted, their pieces stay (without them) for the warranty record.
 */
export async function eraseClient(ctx: StudioContext, clientId: string, now = new Date()): Promise<ErasureReport> {
  const s = scopeOf(ctx, clientId);
  const db = getDb();
  const { report, keys } = db.transaction((tx) => {
    const photos = tx.all<{ id: string; storage_key: string; thumb_key: string }>(photosWhere(s, sql`SELECT id, storage_key, thumb_key FROM files`));
    tx.run(sql`DELETE FROM files WHERE id IN (SELECT value FROM json_each(${JSON.stringify(photos.map((p) => p.id))}))`);
    const pieceIds = tx.all<{ id: string }>(sql`SELECT id FROM pieces WHERE studio_id = ${s.studio} AND (client_id = ${s.client} OR owner_id = ${s.user})`).map((p) => p.id);
    const theirPieces = sql`(SELECT value FROM json_each(${JSON.stringify(pieceIds)}))`;
    // The pieces stay; the person's address and their hold on them go. Ownerships keep the order of owners
    // (a later owner's warranty depends on it) and end today.
    tx.run(sql`UPDATE pieces SET delivery_address = '', updated_at = ${now.getTime()} WHERE studio_id = ${s.studio} AND client_id = ${s.client}`);
    tx.run(sql`UPDATE pieces SET owner_id = NULL, updated_at = ${now.getTime()} WHERE studio_id = ${s.studio} AND owner_id = ${s.user}`);
    // A changed delivery address is in its piece's audit entries: the entries stay, the address goes.
    tx.run(sql`UPDATE audit_log SET data = json_remove(data, '$.before.deliveryAddress', '$.after.deliveryAddress')
      WHERE studio_id = ${s.studio} AND subject_type = 'piece' AND subject_id IN ${theirPieces}`);
    tx.run(sql`UPDATE ownerships SET ended_at = ${now.getTime()} WHERE studio_id = ${s.studio} AND user_id = ${s.user} AND ended_at IS NULL`);
    // What they wrote; the claim's category, dates and decision stay for the warranty record.
    const claims = tx.all<{ id: string }>(sql`UPDATE claims SET description = ${ERASED_TEXT}, answers = '{}' WHERE studio_id = ${s.studio} AND owner_id = ${s.user} RETURNING id`).length;
    const messages = tx.all<{ id: string }>(sql`UPDATE thread_messages SET body = ${ERASED_TEXT}, from_email = NULL WHERE studio_id = ${s.studio} AND author = 'owner'
      AND thread_id IN (SELECT id FROM threads WHERE owner_id = ${s.user} AND studio_id = ${s.studio}) RETURNING id`).length;
    tx.run(sql`DELETE FROM unmatched_mail WHERE studio_id = ${s.studio} AND from_email = (SELECT email FROM clients WHERE id = ${s.client})`);
    tx.run(sql`UPDATE care_log_entries SET notes = '', user_id = NULL WHERE studio_id = ${s.studio} AND user_id = ${s.user}`);
    tx.run(sql`UPDATE visits SET location = '' WHERE studio_id = ${s.studio} AND job_id IN (SELECT id FROM repair_jobs WHERE owner_id = ${s.user} AND studio_id = ${s.studio})`);
    tx.run(sql`UPDATE repair_jobs SET owner_id = NULL WHERE studio_id = ${s.studio} AND owner_id = ${s.user}`);
    tx.run(sql`UPDATE threads SET owner_id = NULL WHERE studio_id = ${s.studio} AND owner_id = ${s.user}`);
    tx.run(sql`UPDATE piece_handovers SET email = NULL, token_hash = NULL, expires_at = NULL, updated_at = ${now.getTime()} WHERE studio_id = ${s.studio} AND client_id = ${s.client}`);
    tx.run(sql`DELETE FROM client_consents WHERE studio_id = ${s.studio} AND client_id = ${s.client}`);
    tx.run(sql`UPDATE clients SET name = ${ERASED_NAME}, email = NULL, phone = NULL, address = '', notes = '', time_zone = NULL, preferred_contact = 'email',
      consent_service = 0, consent_offers = 0, user_id = NULL, updated_at = ${now.getTime()} WHERE id = ${s.client} AND studio_id = ${s.studio}`);
    // The registry searches by owner name and e-mail.
    for (const id of pieceIds) indexPiece(tx, id);
    const report: ErasureReport = { pieces: pieceIds.length, photos: photos.length, claims, messages };
    // That it happened and how much it touched; nothing of what was erased.
    recordAudit(tx, { studioId: ctx.studio.id, actorId: ctx.user.id, action: "client.erased", subjectType: "client", subjectId: s.client, data: report });
    return { report, keys: photos.flatMap((p) => [p.storage_key, p.thumb_key]) };
  });
  await removeStoredFiles(...keys);
  return report;
}
