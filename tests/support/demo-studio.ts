// The demo studio (db/seed/demo.ts, all invented) in the run's shared test database: seeded by whichever
// test file asks first, found by the others.
import { and, eq } from "drizzle-orm";
import { getDb } from "@/db/client";
import { memberships, studios, users, type Studio } from "@/db/schema";
import { AlreadySeededError, DEMO_STUDIO_SLUG, seedDemo } from "@/db/seed/demo";
import type { StudioContext } from "@/lib/auth/guards";

export async function seededDemoStudio(): Promise<Studio> {
  const db = getDb();
  try {
    await seedDemo(db);
  } catch (e) {
    if (!(e instanceof AlreadySeededError)) throw e;
  }
  return db.select().from(studios).where(eq(studios.slug, DEMO_STUDIO_SLUG)).get()!;
}

/** A member's studio context, as the request boundary resolves it for them. */
export function memberContextOf(studio: Studio, userId: string): StudioContext {
  const db = getDb();
  const u = db.select().from(users).where(eq(users.id, userId)).get()!;
  const role = db.select().from(memberships).where(and(eq(memberships.userId, u.id), eq(memberships.studioId, studio.id))).get()!.role;
  return { user: { id: u.id, email: u.email, name: u.name, emailVerifiedAt: u.emailVerifiedAt, timeZone: u.timeZone, unitSystem: u.unitSystem, remindersEnabled: u.remindersEnabled }, studio, role } satisfies StudioContext;
}
