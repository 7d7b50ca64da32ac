import "server-only";
import { and, eq, isNull } from "drizzle-orm";
import { clients, pieces } from "@/db/schema";
import type { StudioContext } from "@/lib/auth/guards";
import { isAppError } from "@/lib/errors";
import type { DbOrTx } from "@/lib/pieces/search-index";
import { clientFields } from "@/lib/validation/clients";
import { pastDate } from "@/lib/validation/dates";
import { insertClient } from "./create";
import { toE164 } from "./phone";

// The buyer columns of the piece CSV import (buyer_name, buyer_email, buyer_phone, and
// buyer_service_mail_on: the day they agreed to service mail, recorded on a new client). Each row's buyer
// is checked with the rest of the row; on writing, a buyer is matched to a client of the studio by
// e-mail, then by phone, and made only when neither matches, so an import never duplicates a client
// (also when one file names the same buyer on several rows). A matched client keeps their record as
// it is: the file never overwrites what the studio holds.

export const BUYER_COLUMNS = ["buyer_name", "buyer_email", "buyer_phone", "buyer_service_mail_on"] as const;

/** serviceMailOn: the day the buyer agreed to service mail (recorded as consent from imported records on a new client). */
export type ImportBuyer = { name: string; email: string; phone: string | null; serviceMailOn: string | null };

/** A row's buyer (null when the buyer columns are empty), or the errors to show against its columns. */
export function readBuyerColumns(row: Record<string, string>, country: string): { buyer: ImportBuyer | null; errors: { field: string; message: string }[] } {
  const name = (row.buyer_name ?? "").trim();
  const rawEmail = (row.buyer_email ?? "").trim();
  const rawPhone = (row.buyer_phone ?? "").trim();
  const rawConsent = (row.buyer_service_mail_on ?? "").trim();
  if (!name && !rawEmail && !rawPhone && !rawConsent) return { buyer: null, errors: [] };
  const errors: { field: string; message: string }[] = [];
  const email = clientFields.shape.email.safeParse(rawEmail);
  if (!email.success) errors.push({ field: "buyer_email", message: `${email.error.issues[0]?.message ?? "That doesn't look like an e-mail address."} — got "${rawEmail.slice(0, 40)}"` });
  let phone: string | null = null;
  try {
    phone = toE164(rawPhone, country);
  } catch (e) {
    if (!isAppError(e)) throw e;
    errors.push({ field: "buyer_phone", message: `${e.message} — got "${rawPhone.slice(0, 40)}"` });
  }
  const consentOn = rawConsent ? pastDate("Write the day they agreed as YYYY-MM-DD, not after today.").safeParse(rawConsent) : null;
  if (consentOn && !consentOn.success) errors.push({ field: "buyer_service_mail_on", message: `${consentOn.error.issues[0]?.message ?? "That isn't a date."} — got "${rawConsent.slice(0, 40)}"` });
  if (!name && !(email.success && email.data)) errors.push({ field: "buyer_name", message: "Give the buyer's name (or at least their e-mail)." });
  if (name.length > 200) errors.push({ field: "buyer_name", message: "Keep the buyer's name under 200 characters." });
  if (errors.length) return { buyer: null, errors };
  const address = email.success ? email.data : "";
  return { buyer: { name: name || address, email: address, phone, serviceMailOn: consentOn?.success ? consentOn.data : null }, errors: [] };
}

export type BuyerTally = { matched: number; created: number; seen: Map<string, string>; pieceIds: string[] };
export const newBuyerTally = (): BuyerTally => ({ matched: 0, created: 0, seen: new Map(), pieceIds: [] });

/**
 * Inside the import's transaction: the client for `buyer` (matched by e-mail, then phone, else made)
 * becomes the piece's client. Counts each client once per file in `tally`.
 */
export function attachImportedBuyer(ctx: StudioContext, tx: DbOrTx, pieceId: string, buyer: ImportBuyer, tally: BuyerTally, now = new Date()): string {
  const keys = [buyer.email && `e:${buyer.email}`, buyer.phone && `p:${buyer.phone}`].filter(Boolean) as string[];
  let clientId = keys.map((k) => tally.seen.get(k)).find(Boolean);
  if (!clientId) {
    const byEmail = buyer.email ? tx.select({ id: clients.id }).from(clients).where(and(eq(clients.studioId, ctx.studio.id), eq(clients.email, buyer.email))).get() : undefined;
    const byPhone =
      !byEmail && buyer.phone
        ? tx
            .select({ id: clients.id })
            .from(clients)
            .where(and(eq(clients.studioId, ctx.studio.id), eq(clients.phone, buyer.phone), buyer.email ? isNull(clients.email) : undefined))
            .get()
        : undefined;
    const found = byEmail ?? byPhone;
    if (found) {
      clientId = found.id;
      tally.matched++;
    } else {
      const consent = buyer.serviceMailOn ? { service: { granted: true, givenOn: buyer.serviceMailOn, source: "imported" as const, note: "From the studio's imported delivery records." } } : undefined;
      clientId = insertClient(ctx, tx, { name: buyer.name, email: buyer.email, phone: buyer.phone ?? "", address: "", preferredContact: "email", timeZone: "", notes: "", consent }, now).id;
      tally.created++;
    }
  }
  for (const k of keys) tally.seen.set(k, clientId);
  tx.update(pieces).set({ clientId }).where(and(eq(pieces.id, pieceId), eq(pieces.studioId, ctx.studio.id))).run();
  tally.pieceIds.push(pieceId);
  return clientId;
}
