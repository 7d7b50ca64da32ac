import "server-only";
import { eq } from "drizzle-orm";
import { getDb } from "@/db/client";
import { clients, type Client } from "@/db/schema";
import type { StudioContext } from "@/lib/auth/guards";
import { recordAudit } from "@/lib/audit";
import type { ClientPatch } from "@/lib/validation/clients";
import { emailTaken, loadClient } from "./access";
import { applyConsentChanges } from "./consent";
import { emailTakenError } from "./create";
import { toE164 } from "./phone";

/** Changes the fields sent (absent ones keep their value) and records each consent that changes. */
export function updateClient(ctx: StudioContext, clientId: string, patch: ClientPatch, now = new Date()): Client {
  const phone = patch.phone === undefined ? undefined : toE164(patch.phone, ctx.studio.country);
  return getDb().transaction((tx) => {
    const current = loadClient(ctx, clientId, tx);
    const set: Partial<Client> = {};
    if (patch.name !== undefined) set.name = patch.name;
    if (patch.email !== undefined) set.email = patch.email || null;
    if (phone !== undefined) set.phone = phone;
    if (patch.address !== undefined) set.address = patch.address;
    if (patch.preferredContact !== undefined) set.preferredContact = patch.preferredContact;
    if (patch.timeZone !== undefined) set.timeZone = patch.timeZone || null;
    if (patch.notes !== undefined) set.notes = patch.notes;
    const changed = (Object.keys(set) as (keyof Client)[]).filter((k) => set[k] !== current[k]);
    const holder = set.email && changed.includes("email") ? emailTaken(ctx.studio.id, set.email, current.id, tx) : null;
    if (holder) throw emailTakenError(holder);
    if (changed.length) tx.update(clients).set({ ...set, updatedAt: now }).where(eq(clients.id, current.id)).run();
    const consent = applyConsentChanges(tx, current, patch.consent, { userId: ctx.user.id, timeZone: ctx.studio.timeZone, now });
    if (changed.length || consent.length) {
      // The audit log keeps which fields changed, not their values.
      recordAudit(tx, { studioId: ctx.studio.id, actorId: ctx.user.id, action: "client.updated", subjectType: "client", subjectId: current.id, data: { fields: changed, consent } });
    }
    return tx.select().from(clients).where(eq(clients.id, current.id)).get()!;
  });
}
