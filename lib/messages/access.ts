import "server-only";
import { eq, type SQL } from "drizzle-orm";
import { bound } from "@/db/bound";
import { threads } from "@/db/schema";

/**
 * The conversations a studio member sees, written once as a WHERE over threads: their studio's.
 * Owners reach a thread through the claim, job or visit it is about (lib/messages/service.ts checks
 * that they still hold the piece), never by listing threads.
 * The studio is bound as `+?` (db/bound.ts), so the header's unread count that every studio page shows
 * is planned once, not on every page. Thread reads take threads_studio_state_idx whichever studio it is:
 * with the value of a studio holding every thread (3,000 added to the bench seed, in its one studio),
 * SQLite still chose that index, and a smaller studio only makes the index the better choice.
 */
export function threadVisibleTo(actor: { studio: { id: string } }): SQL {
  return eq(threads.studioId, bound(actor.studio.id));
}
