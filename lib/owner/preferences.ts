import "server-only";
import { and, eq, isNull, ne } from "drizzle-orm";
import type { User } from "lucia";
import { getDb } from "@/db/client";
import { ownerships, studios, users } from "@/db/schema";
import { preferencesPatchSchema } from "@/lib/validation/owner";

// The owner's preferences: care reminder e-mails on or off, time zone, metric or imperial. Until the
// owner picks their units here, the studio they first register a piece from sets them
// (adoptStudioUnits): a US studio's owners read inches, a European studio's millimetres.

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
    .set({ ...patch, ...(patch.unitSystem ? { unitSystemChosenAt: new Date() } : {}) })
    .where(eq(users.id, user.id))
    .returning({ remindersEnabled: users.remindersEnabled, timeZone: users.timeZone, unitSystem: users.unitSystem })
    .get()!;
  return row;
}

type Tx = Parameters<Parameters<ReturnType<typeof getDb>["transaction"]>[0]>[0];

/** At a first registration: an owner who has not chosen units yet takes the unit system of the piece's studio. */
export function adoptStudioUnits(tx: Tx, userId: string, studioId: string, pieceId: string): void {
  const earlier = tx.select({ id: ownerships.id }).from(ownerships).where(and(eq(ownerships.userId, userId), ne(ownerships.pieceId, pieceId))).get();
  if (earlier) return;
  const studio = tx.select({ unitSystem: studios.unitSystem }).from(studios).where(eq(studios.id, studioId)).get();
  if (!studio) return;
  tx.update(users).set({ unitSystem: studio.unitSystem }).where(and(eq(users.id, userId), isNull(users.unitSystemChosenAt))).run();
}
