import "server-only";
import { and, eq, isNull, ne } from "drizzle-orm";
import type { User } from "lucia";
import { getDb, type Tx } from "@/db/client";
import { ownerships, studios, users } from "@/db/schema";
import { type UnitSystem } from "@/lib/format";
import type { PreferencesPatch } from "@/lib/validation/owner";

// The owner's preferences: care reminder e-mails on or off, time zone, metric or imperial. Until the
// owner picks their units here, their first registration sets them (adoptStudioUnits, deciding with
// defaultUnitSystem): the region of their browser's language when it names one (en-US reads inches,
// en-GB millimetres), else the studio's unit system. The choice is stored, not worked out per request,
// because e-mails and the drawer card have no browser to ask.

export function getPreferences(user: Pick<User, "id">) {
  const row = getDb()
    .select({ name: users.name, email: users.email, remindersEnabled: users.remindersEnabled, timeZone: users.timeZone, unitSystem: users.unitSystem, createdAt: users.createdAt })
    .from(users)
    .where(eq(users.id, user.id))
    .get()!;
  return { ...row, createdAt: row.createdAt.getTime() };
}

export function updatePreferences(user: Pick<User, "id">, patch: PreferencesPatch) {
  const row = getDb()
    .update(users)
    .set({ ...patch, ...(patch.unitSystem ? { unitSystemChosenAt: new Date() } : {}) })
    .where(eq(users.id, user.id))
    .returning({ remindersEnabled: users.remindersEnabled, timeZone: users.timeZone, unitSystem: users.unitSystem })
    .get()!;
  return row;
}

/** The signed-in person's own name, as mails and pages greet them (they read users.name when they send or render). */
export function updateName(user: Pick<User, "id">, name: string) {
  return getDb().update(users).set({ name }).where(eq(users.id, user.id)).returning({ name: users.name }).get()!;
}

/**
 * Regions whose everyday lengths and volumes are US customary: the United States, Liberia and Myanmar
 * (common practice, no published source: the usual list of countries not metricated in daily life).
 */
const IMPERIAL_REGIONS: ReadonlySet<string> = new Set(["US", "LR", "MM"]);

/**
 * The region named by the browser's most preferred language in an Accept-Language header (RFC 9110
 * §12.5.4): "en-US,en;q=0.9" → "US", "zh-Hant-TW" → "TW", "es-419" → "419"; null when that language
 * names no region ("en", "de;q=0.8") or the header is missing or unreadable. Only the most preferred
 * language counts: "de,en-US;q=0.5" is a German reader, not an American one.
 */
export function acceptLanguageRegion(header: string | null | undefined): string | null {
  const tags = (header ?? "")
    .split(",")
    .map((part, i) => {
      const [tag = "", ...params] = part.trim().split(";");
      const q = params.map((p) => /^\s*q\s*=\s*([01](?:\.\d{0,3})?)\s*$/i.exec(p)).find(Boolean);
      return { tag: tag.trim(), q: q ? Number(q[1]) : 1, i };
    })
    .filter((t) => t.tag && t.tag !== "*" && t.q > 0)
    .sort((a, b) => b.q - a.q || a.i - b.i);
  for (const { tag } of tags) {
    try {
      return new Intl.Locale(tag).region ?? null;
    } catch {
      // not a language tag; try the next one
    }
  }
  return null;
}

/** Units for an owner who has not chosen: their browser's region when its language names one, else the studio's. */
export function defaultUnitSystem({ acceptLanguage, studioUnits }: { acceptLanguage?: string | null; studioUnits: UnitSystem }): UnitSystem {
  const region = acceptLanguageRegion(acceptLanguage);
  if (!region) return studioUnits;
  return IMPERIAL_REGIONS.has(region.toUpperCase()) ? "imperial" : "metric";
}


/**
 * At a first registration: an owner who has not chosen units yet takes the default (defaultUnitSystem)
 * from the Accept-Language of the registering request and the piece's studio.
 */
export function adoptStudioUnits(tx: Tx, userId: string, studioId: string, pieceId: string, acceptLanguage?: string | null): void {
  const earlier = tx.select({ id: ownerships.id }).from(ownerships).where(and(eq(ownerships.userId, userId), ne(ownerships.pieceId, pieceId))).get();
  if (earlier) return;
  const studio = tx.select({ unitSystem: studios.unitSystem }).from(studios).where(eq(studios.id, studioId)).get();
  if (!studio) return;
  const unitSystem = defaultUnitSystem({ acceptLanguage, studioUnits: studio.unitSystem });
  tx.update(users).set({ unitSystem }).where(and(eq(users.id, userId), isNull(users.unitSystemChosenAt))).run();
}
