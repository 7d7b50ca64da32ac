// Adds the studio's clients to a seeded registry (tests/bench/seed-registry.ts): 20,000 synthetic clients
// — one for each of the registry's owners (linked to their account) and the rest buyers without one —
// every piece linked to its buyer, each owned piece's registration, a consent each, and a little
// history (care logged, client record changes) so a timeline has several kinds to merge. Synthetic,
// invented data only. Used by tests/bench/clients.bench.ts.
// Fast: one transaction, and the clients' two search indexes (migration 0025's clients_fts and
// client_titles_fts) are filled once at the end instead of by their triggers row by row (linking
// 100,000 pieces rebuilt a client's title row, a delete and an insert in the index, for each one);
// the triggers are set aside for the inserts and put back, unchanged, in the same transaction.
import { randomUUID } from "node:crypto";
import Database from "better-sqlite3";
import { mergeSearchIndexesAtOnce } from "../../db/search-indexes";

export type SeededClients = { clients: number; historyClientId: string };

export function seedClients(dbFile: string, studioId: string, staffUserId: string, count = 20_000): SeededClients {
  const db = new Database(dbFile);
  const now = Date.now();
  const owners = db.prepare("SELECT id, name, email FROM users WHERE id <> ? ORDER BY rowid").all(staffUserId) as { id: string; name: string; email: string }[];
  const insClient = db.prepare(`INSERT INTO clients (id, studio_id, name, email, phone, address, preferred_contact, notes, consent_service, consent_offers, user_id, created_at, updated_at)
    VALUES (?, ?, ?, ?, ?, ?, 'email', '', 1, ?, ?, ?, ?)`);
  const insConsent = db.prepare("INSERT INTO client_consents (id, studio_id, client_id, kind, granted, given_at, source, note, created_at) VALUES (?, ?, ?, 'service', 1, ?, 'in_person', '', ?)");
  const insOwnership = db.prepare("INSERT INTO ownerships (id, studio_id, piece_id, user_id, via, started_at) VALUES (?, ?, ?, ?, 'registration', ?)");
  const insCare = db.prepare("INSERT INTO care_log_entries (id, studio_id, piece_id, user_id, source, task_kind, done_on, product_used, notes, created_at, updated_at) VALUES (?, ?, ?, ?, 'owner', 'annual_check', ?, '', '', ?, ?)");
  const insAudit = db.prepare("INSERT INTO audit_log (id, studio_id, actor_id, action, subject_type, subject_id, data, created_at) VALUES (?, ?, ?, 'client.updated', 'client', ?, ?, ?)");
  const linkOwned = db.prepare("UPDATE pieces SET client_id = ? WHERE owner_id = ? AND studio_id = ?");
  const ownedOf = db.prepare("SELECT id FROM pieces WHERE owner_id = ? AND studio_id = ?").pluck();
  const clientIds: string[] = [];
  let historyClientId = "";
  db.transaction(() => {
    const triggers = db
      .prepare("SELECT name, sql FROM sqlite_master WHERE type = 'trigger' AND (sql LIKE '%clients_fts%' OR sql LIKE '%client_titles_fts%')")
      .all() as { name: string; sql: string }[];
    for (const t of triggers) db.exec(`DROP TRIGGER "${t.name}"`);
    for (let i = 0; i < count; i++) {
      const id = randomUUID();
      const owner = owners[i];
      const name = owner?.name ?? `Buyer ${i} ${["Alder", "Beech", "Cedar", "Dogwood", "Elder"][i % 5]}croft`;
      const email = owner?.email ?? `buyer.${i}@buyers.example`;
      const phone = `+1503555${String(i % 10_000).padStart(4, "0")}`;
      const created = now - (count - i) * 60_000;
      insClient.run(id, studioId, name, email, phone, `${1 + (i % 300)} Synthetic Lane, Testville`, i % 3 === 0 ? 1 : 0, owner?.id ?? null, created, created);
      insConsent.run(randomUUID(), studioId, id, created, created);
      clientIds.push(id);
      if (owner) {
        linkOwned.run(id, owner.id, studioId);
        for (const pieceId of ownedOf.all(owner.id, studioId) as string[]) {
          insOwnership.run(randomUUID(), studioId, pieceId, owner.id, created);
          if (i % 4 === 0) insCare.run(randomUUID(), studioId, pieceId, owner.id, "2025-06-01", created + 1000, created + 1000);
        }
        if (i % 10 === 0) insAudit.run(randomUUID(), studioId, staffUserId, id, JSON.stringify({ fields: ["phone"] }), created + 2000);
        if (!historyClientId && i % 40 === 0 && i > 0) historyClientId = id;
      }
    }
    // Buyers who never registered: the unowned pieces, spread over the clients without an account.
    const buyers = clientIds.slice(owners.length);
    const unowned = db.prepare("SELECT id FROM pieces WHERE owner_id IS NULL AND studio_id = ? ORDER BY rowid").pluck().all(studioId) as string[];
    const link = db.prepare("UPDATE pieces SET client_id = ? WHERE id = ?");
    if (buyers.length) unowned.forEach((pieceId, j) => link.run(buyers[j % buyers.length], pieceId));
    // Both indexes filled as migration 0025 fills them, then their triggers back.
    db.exec(`DELETE FROM clients_fts; DELETE FROM client_titles_fts;
      INSERT INTO clients_fts (rowid, name, email, phone) SELECT rowid, name, coalesce(email, ''), coalesce(phone, '') FROM clients;
      INSERT INTO client_titles_fts (rowid, titles)
        SELECT c.rowid, group_concat(p.title, char(10)) FROM clients c JOIN pieces p ON p.client_id = c.id AND p.studio_id = c.studio_id GROUP BY c.rowid;`);
    for (const t of triggers) db.exec(t.sql);
  })();
  db.exec("ANALYZE; PRAGMA optimize;");
  mergeSearchIndexesAtOnce(db); // as the scheduler's nightly merge leaves them
  db.close();
  return { clients: count, historyClientId };
}
