import "server-only";
import { eq, type SQL } from "drizzle-orm";
import { threads } from "@/db/schema";

/**
 * The conversations a studio member sees, written once as a WHERE over threads: their studio's.
 * Owners reach a thread through the claim, job or visit it is about (lib/messages/service.ts checks
 * that they still hold the piece), never by listing threads.
 */
export function threadVisibleTo(actor: { studio: { id: string } }): SQL {
  return eq(threads.studioId, actor.studio.id);
}
