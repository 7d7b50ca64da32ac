import { and, eq, isNull, sql } from "drizzle-orm";
import { getDb } from "@/db/client";
import { clientConsents, clients, pieces, users } from "@/db/schema";
import type { DbOrTx } from "@/lib/pieces/search-index";

// Clients and accounts meet in two places: an owner registers a piece (the piece's client becomes
// the owner's client in that studio, made if missing), and an address is confirmed (clients with
// that e-mail are linked to the account). A studio has at most one client per account. No
// server-only import: the demo seed links its owners too.

/**
 * The client of `userId` in `studioId`: the one linked to the account, else the unlinked one with
 * the account's e-mail (now linked), else a new one from the account (its reminder setting recorded
 * as consent to service mail). Run inside the caller's transaction.
 */
export function clientForOwner(tx: DbOrTx, studioId: string, userId: string, now = new Date()): string {
  const linked = tx.select({ id: clients.id }).from(clients).where(and(eq(clients.studioId, studioId), eq(clients.userId, userId))).get();
  if (linked) return linked.id;
  const user = tx.select({ name: users.name, email: users.email, remindersEnabled: users.remindersEnabled }).from(users).where(eq(users.id, userId)).get();
  if (!user) throw new Error(`clientForOwner: no user ${userId}`);
  const byEmail = tx
    .update(clients)
    .set({ userId, updatedAt: now })
    .where(and(eq(clients.studioId, studioId), eq(clients.email, user.email), isNull(clients.userId)))
    .returning({ id: clients.id })
    .get();
  if (byEmail) return byEmail.id;
  const created = tx
    .insert(clients)
    .values({ studioId, name: user.name, email: user.email, userId, consentService: user.remindersEnabled, createdAt: now, updatedAt: now })
    .returning({ id: clients.id })
    .get();
  if (user.remindersEnabled) {
    tx.insert(clientConsents)
      .values({
        studioId,
        clientId: created.id,
        kind: "service",
        granted: true,
        givenAt: now,
        source: "account",
        note: "Care reminders switched on in their Grainward account when they registered a piece.",
        createdAt: now,
      })
      .run();
  }
  return created.id;
}

/** Sets the piece's client to its new owner's (registration, or a transfer's new owner). */
export function linkPieceToOwner(tx: DbOrTx, piece: { id: string; studioId: string }, userId: string, now = new Date()): string {
  const clientId = clientForOwner(tx, piece.studioId, userId, now);
  tx.update(pieces).set({ clientId }).where(eq(pieces.id, piece.id)).run();
  return clientId;
}

/**
 * After an account's e-mail is confirmed: every unlinked client with that e-mail, in a studio where
 * the account has no client yet, is linked to it, and the account's pieces there without a client
 * point at it. Returns how many clients were linked.
 */
export function linkAccountToClients(userId: string, db: DbOrTx = getDb()): number {
  const user = db.select({ email: users.email, verified: users.emailVerifiedAt }).from(users).where(eq(users.id, userId)).get();
  if (!user?.verified) return 0;
  const linked = db
    .update(clients)
    .set({ userId, updatedAt: new Date() })
    .where(
      and(
        eq(clients.email, user.email),
        isNull(clients.userId),
        sql`NOT EXISTS (SELECT 1 FROM clients o WHERE o.studio_id = ${clients.studioId} AND o.user_id = ${userId})`,
      ),
    )
    .returning({ id: clients.id, studioId: clients.studioId })
    .all();
  for (const c of linked) {
    db.update(pieces)
      .set({ clientId: c.id })
      .where(and(eq(pieces.studioId, c.studioId), eq(pieces.ownerId, userId), isNull(pieces.clientId)))
      .run();
  }
  return linked.length;
}

/**
 * Every owner and former owner of a piece of `studioId` gets their client (as the migration that
 * introduced clients did for the data then present), and each owned piece points at it. For data
 * written without going through registration: the demo seed.
 */
export function linkOwnersToClients(db: DbOrTx, studioId: string, now = new Date()): void {
  const people = db.all<{ userId: string }>(sql`
    SELECT user_id AS userId FROM ownerships WHERE studio_id = ${studioId}
    UNION SELECT owner_id FROM pieces WHERE studio_id = ${studioId} AND owner_id IS NOT NULL`);
  for (const p of people) clientForOwner(db, studioId, p.userId, now);
  db.run(sql`UPDATE pieces SET client_id = (SELECT c.id FROM clients c WHERE c.studio_id = pieces.studio_id AND c.user_id = pieces.owner_id)
    WHERE studio_id = ${studioId} AND owner_id IS NOT NULL`);
}
