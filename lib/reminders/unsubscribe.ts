import "server-only";
import { eq } from "drizzle-orm";
import { getDb } from "@/db/client";
import { users } from "@/db/schema";
import { recordAudit } from "@/lib/audit";
import { notFound } from "@/lib/errors";
import { linkTokenField } from "@/lib/validation/reminders";
import { readUnsubscribeToken } from "./tokens";

// Unsubscribing from care reminders by the signed token in every care e-mail (RFC 8058 one-click, or
// the confirmation page). It turns off care reminders and refresh offers only: mail about the owner's
// own claims, payments and visits is not sent through this switch.

function ownerFor(token: unknown) {
  const parsed = linkTokenField.safeParse(token);
  const userId = parsed.success ? readUnsubscribeToken(parsed.data) : null;
  if (!userId) throw notFound("This unsubscribe link is not valid. Use the link in your latest care e-mail.");
  const user = getDb().select({ id: users.id, email: users.email, remindersEnabled: users.remindersEnabled }).from(users).where(eq(users.id, userId)).get();
  if (!user) throw notFound("This unsubscribe link is not valid. Use the link in your latest care e-mail.");
  return user;
}

/** "j•••@owners.example": enough for owners to recognise their address on a page anyone with the link can open. */
export function maskEmail(email: string): string {
  const [local = "", domain = ""] = email.split("@");
  return `${local.slice(0, 1)}•••@${domain}`;
}

export function reminderPreferencesByToken(token: unknown): { email: string; remindersEnabled: boolean } {
  const u = ownerFor(token);
  return { email: maskEmail(u.email), remindersEnabled: u.remindersEnabled };
}

/** Turns care reminders off (enabled = false) or back on. Idempotent. */
export function setRemindersByToken(token: unknown, enabled: boolean, via: "one_click" | "page"): { email: string; remindersEnabled: boolean } {
  const u = ownerFor(token);
  const db = getDb();
  db.transaction((tx) => {
    tx.update(users).set({ remindersEnabled: enabled }).where(eq(users.id, u.id)).run();
    if (u.remindersEnabled !== enabled) {
      recordAudit(tx, { studioId: null, actorId: u.id, action: enabled ? "reminders.resubscribed" : "reminders.unsubscribed", subjectType: "user", subjectId: u.id, data: { via } });
    }
  });
  return { email: maskEmail(u.email), remindersEnabled: enabled };
}
