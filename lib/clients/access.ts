import "server-only";
import { and, eq, type SQL } from "drizzle-orm";
import { getDb } from "@/db/client";
import { clients, type Client } from "@/db/schema";
import type { StudioContext } from "@/lib/auth/guards";
import { notFound } from "@/lib/errors";
import type { DbOrTx } from "@/lib/pieces/search-index";

// Who reads and writes clients: the studio's staff and admins (routes name roles ["admin", "staff"]).
// Technicians see an owner's name and address on the job they visit, not this record.

/** The clients an actor sees, written once as a WHERE over clients: their studio's. */
export function clientVisibleTo(actor: { studio: { id: string } }): SQL {
  return eq(clients.studioId, actor.studio.id);
}

/** The client row of the caller's studio, or 404 (also for another studio's client). */
export function loadClient(ctx: StudioContext, clientId: string, db: DbOrTx = getDb()): Client {
  const row = db.select().from(clients).where(and(eq(clients.id, clientId), clientVisibleTo(ctx))).get();
  if (!row) throw notFound("No client with that id in this studio.");
  return row;
}

/** A stored e-mail is unique per studio: the other client of the studio who has this one, or null. */
export function emailTaken(studioId: string, email: string, exceptId: string | null, db: DbOrTx = getDb()): { id: string; name: string } | null {
  const row = db.select({ id: clients.id, name: clients.name }).from(clients).where(and(eq(clients.studioId, studioId), eq(clients.email, email))).get();
  return row && row.id !== exceptId ? row : null;
}
