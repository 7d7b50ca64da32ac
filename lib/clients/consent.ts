import "server-only";
import { eq } from "drizzle-orm";
import { clientConsents, clients, type Client } from "@/db/schema";
import { localDate, zonedTimeToEpochMs } from "@/lib/care/dates";
import type { DbOrTx } from "@/lib/pieces/search-index";
import type { ConsentChange } from "@/lib/validation/clients";
import type { ConsentKind } from "./vocabulary";

export type ConsentChanges = Partial<Record<ConsentKind, ConsentChange>>;

/**
 * The instant a consent was given: now when it was today (in the studio's zone) or no day was named,
 * else noon of the named day in the studio's zone.
 */
export function consentInstant(givenOn: string | undefined, timeZone: string, now: Date): Date {
  if (!givenOn || givenOn >= localDate(now.getTime(), timeZone)) return now;
  return new Date(zonedTimeToEpochMs(givenOn, 12 * 60, timeZone));
}

/**
 * Records each consent that changes (given where it was not, withdrawn where it was) in the history
 * and on the client row. A change to the value already held is not recorded. Returns the kinds changed.
 */
export function applyConsentChanges(
  tx: DbOrTx,
  client: Pick<Client, "id" | "studioId" | "consentService" | "consentOffers">,
  changes: ConsentChanges | undefined,
  by: { userId: string | null; timeZone: string; now: Date },
): ConsentKind[] {
  const changed: ConsentKind[] = [];
  for (const kind of ["service", "offers"] as const) {
    const change = changes?.[kind];
    if (!change) continue;
    const current = kind === "service" ? client.consentService : client.consentOffers;
    if (change.granted === current) continue;
    tx.insert(clientConsents)
      .values({
        studioId: client.studioId,
        clientId: client.id,
        kind,
        granted: change.granted,
        givenAt: consentInstant(change.givenOn, by.timeZone, by.now),
        source: change.source,
        note: change.note,
        recordedById: by.userId,
        createdAt: by.now,
      })
      .run();
    changed.push(kind);
  }
  if (changed.length) {
    const set: Partial<Client> = { updatedAt: by.now };
    if (changed.includes("service")) set.consentService = changes!.service!.granted;
    if (changed.includes("offers")) set.consentOffers = changes!.offers!.granted;
    tx.update(clients).set(set).where(eq(clients.id, client.id)).run();
  }
  return changed;
}
