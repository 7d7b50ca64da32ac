import "server-only";
import { and, eq, isNotNull, isNull } from "drizzle-orm";
import { getDb } from "@/db/client";
import { clients, pieces, users, type Client } from "@/db/schema";
import type { StudioContext } from "@/lib/auth/guards";
import { recordAudit } from "@/lib/audit";
import { conflict } from "@/lib/errors";
import type { CreateClientValues } from "@/lib/validation/clients";
import type { DbOrTx } from "@/lib/pieces/search-index";
import { emailTaken } from "./access";
import { applyConsentChanges } from "./consent";
import { toE164 } from "./phone";

const EMAIL_TAKEN = "Another client of this studio has that e-mail address.";
/** The form names the client who has the address and links to them (`extra.client`), so the desk opens that record. */
export const emailTakenError = (other: { id: string; name: string }) => conflict(EMAIL_TAKEN, { fieldErrors: { email: [EMAIL_TAKEN] }, extra: { client: other } });

/**
 * A new client of the caller's studio. When a confirmed account has the same e-mail and no client
 * here yet, the two are linked, and the account's pieces of this studio point at the new client.
 */
export function createClient(ctx: StudioContext, values: CreateClientValues, now = new Date()): Client {
  return getDb().transaction((tx) => insertClient(ctx, tx, values, now));
}

/** createClient inside the caller's transaction (a piece recorded with a new buyer). */
export function insertClient(ctx: StudioContext, tx: DbOrTx, values: CreateClientValues, now = new Date()): Client {
  const phone = toE164(values.phone, ctx.studio.country);
  const email = values.email || null;
  const holder = email ? emailTaken(ctx.studio.id, email, null, tx) : null;
  if (holder) throw emailTakenError(holder);
  const account = email
    ? tx
        .select({ id: users.id })
        .from(users)
        .where(and(eq(users.email, email), isNotNull(users.emailVerifiedAt)))
        .get()
    : undefined;
  const accountFree = account && !tx.select({ id: clients.id }).from(clients).where(and(eq(clients.studioId, ctx.studio.id), eq(clients.userId, account.id))).get();
  const created = tx
    .insert(clients)
    .values({
      studioId: ctx.studio.id,
      name: values.name,
      email,
      phone,
      address: values.address,
      preferredContact: values.preferredContact,
      timeZone: values.timeZone || null,
      notes: values.notes,
      userId: accountFree ? account.id : null,
      createdAt: now,
      updatedAt: now,
    })
    .returning()
    .get();
  if (created.userId) {
    tx.update(pieces)
      .set({ clientId: created.id })
      .where(and(eq(pieces.studioId, ctx.studio.id), eq(pieces.ownerId, created.userId), isNull(pieces.clientId)))
      .run();
  }
  const consent = applyConsentChanges(tx, created, values.consent, { userId: ctx.user.id, timeZone: ctx.studio.timeZone, now });
  recordAudit(tx, {
    studioId: ctx.studio.id,
    actorId: ctx.user.id,
    action: "client.created",
    subjectType: "client",
    subjectId: created.id,
    data: { linkedAccount: !!created.userId, consent },
  });
  return tx.select().from(clients).where(eq(clients.id, created.id)).get()!;
}
