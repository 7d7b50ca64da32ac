// The studio's brand and sender name for the mail it sends (lib/mail): read when a message for a
// studio is rendered and when it is handed to SMTP. No server-only import: the scheduler sends mail too.
import { eq } from "drizzle-orm";
import { getDb, type Db } from "@/db/client";
import { studios } from "@/db/schema";
import { env } from "@/lib/env";
import type { EmailBrand } from "@/emails/components/brand";
import { brandOf } from "./brand";

export function emailBrandFor(studioId: string, db: Db = getDb()): EmailBrand | null {
  const s = db.select().from(studios).where(eq(studios.id, studioId)).get();
  return s ? brandOf(s, env.APP_URL.replace(/\/$/, "")) : null;
}

/** The display name of the From header: the studio's sender name (or its name); the address stays the install's MAIL_FROM. */
export function senderNameFor(studioId: string, db: Db = getDb()): string | null {
  const s = db.select({ sender: studios.mailSenderName, name: studios.name }).from(studios).where(eq(studios.id, studioId)).get();
  return s ? s.sender.trim() || s.name : null;
}
