import "server-only";
import { eq } from "drizzle-orm";
import type { User } from "lucia";
import { getDb } from "@/db/client";
import { users } from "@/db/schema";
import { preferencesPatchSchema } from "@/lib/validation/owner";

// The owner's preferences: care reminder e-mails on or off, time zone, metric or imperial.

export function getPreferences(user: Pick<User, "id">) {
  const row = getDb()
    .select({ name: users.name, email: users.email, remindersEnabled: users.remindersEnabled, timeZone: users.timeZone, unitSystem: users.unitSystem, createdAt: users.createdAt })
    .from(users)
    .where(eq(users.id, user.id))
    .get()!;
  return { ...row, createdAt: row.createdAt.getTime() };
}

export function updatePreferences(user: Pick<User, "id">, raw: unknown) {
  const patch = preferencesPatchSchema.parse(raw);
  const row = getDb()
    .update(users)
    .set(patch)
    .where(eq(users.id, user.id))
    .returning({ remindersEnabled: users.remindersEnabled, timeZone: users.timeZone, unitSystem: users.unitSystem })
    .get()!;
  return row;
}
