import "server-only";
import { getDb } from "@/db/client";

/** The health probe: answers only when the database file is open and readable. */
export function checkHealth(): { ok: true } {
  getDb().$client.prepare("SELECT 1").get();
  return { ok: true };
}
