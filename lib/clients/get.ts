import "server-only";
import { and, asc, desc, eq } from "drizzle-orm";
import { getDb } from "@/db/client";
import { clientConsents, clients, pieces, users, type Client } from "@/db/schema";
import type { StudioContext } from "@/lib/auth/guards";
import { localDate } from "@/lib/care/dates";
import type { PieceKind } from "@/lib/care/vocabulary";
import { loadClient } from "./access";
import { displayPhone } from "./phone";
import type { ConsentKind, ConsentSource, ContactMethod } from "./vocabulary";

export type ClientView = {
  id: string;
  name: string;
  email: string;
  /** E.164, "" when none. */
  phone: string;
  /** The studio's national format (international for another country's number). */
  phoneDisplay: string;
  address: string;
  preferredContact: ContactMethod;
  /** "" when the studio's zone applies. */
  timeZone: string;
  notes: string;
  consentService: boolean;
  consentOffers: boolean;
  account: { name: string; email: string } | null;
  createdAt: string;
  updatedAt: string;
};

export type ConsentEntry = { id: string; kind: ConsentKind; granted: boolean; givenAt: string; source: ConsentSource; note: string; recordedBy: string | null };

export type ClientPiece = { id: string; title: string; kind: PieceKind; deliveredOn: string; registered: boolean; archived: boolean };

export type ClientDetail = { client: ClientView; consentHistory: ConsentEntry[]; pieces: ClientPiece[]; /** Today in the studio's zone (the consent form's latest date). */ studioToday: string };

export function clientView(ctx: StudioContext, c: Client, account: { name: string; email: string } | null): ClientView {
  return {
    id: c.id,
    name: c.name,
    email: c.email ?? "",
    phone: c.phone ?? "",
    phoneDisplay: displayPhone(c.phone, ctx.studio.country),
    address: c.address,
    preferredContact: c.preferredContact,
    timeZone: c.timeZone ?? "",
    notes: c.notes,
    consentService: c.consentService,
    consentOffers: c.consentOffers,
    account,
    createdAt: c.createdAt.toISOString(),
    updatedAt: c.updatedAt.toISOString(),
  };
}

/** One client of the caller's studio with its consent history (newest first) and pieces; 404 for anyone else's. */
export function getClient(ctx: StudioContext, clientId: string, now = new Date()): ClientDetail {
  const db = getDb();
  const c = loadClient(ctx, clientId);
  const account = c.userId ? (db.select({ name: users.name, email: users.email }).from(users).where(eq(users.id, c.userId)).get() ?? null) : null;
  const consentHistory = db
    .select({
      id: clientConsents.id,
      kind: clientConsents.kind,
      granted: clientConsents.granted,
      givenAt: clientConsents.givenAt,
      source: clientConsents.source,
      note: clientConsents.note,
      recordedBy: users.name,
    })
    .from(clientConsents)
    .leftJoin(users, eq(users.id, clientConsents.recordedById))
    .where(and(eq(clientConsents.studioId, ctx.studio.id), eq(clientConsents.clientId, c.id)))
    .orderBy(desc(clientConsents.givenAt), desc(clientConsents.createdAt))
    .all()
    .map((r) => ({ ...r, givenAt: r.givenAt.toISOString() }));
  const owned = db
    .select({ id: pieces.id, title: pieces.title, kind: pieces.kind, deliveredOn: pieces.deliveredOn, ownerId: pieces.ownerId, archivedAt: pieces.archivedAt })
    .from(pieces)
    .where(and(eq(pieces.studioId, ctx.studio.id), eq(pieces.clientId, c.id)))
    .orderBy(desc(pieces.deliveredOn), asc(pieces.title))
    .all()
    .map((p) => ({ id: p.id, title: p.title, kind: p.kind, deliveredOn: p.deliveredOn, registered: !!p.ownerId, archived: !!p.archivedAt }));
  return { client: clientView(ctx, c, account), consentHistory, pieces: owned, studioToday: localDate(now.getTime(), ctx.studio.timeZone) };
}

/** The client linked to an account in this studio (for linking an owner's name to the client page), or null. */
export function clientIdForOwner(ctx: StudioContext, ownerId: string | null): string | null {
  if (!ownerId) return null;
  const row = getDb().select({ id: clients.id }).from(clients).where(and(eq(clients.studioId, ctx.studio.id), eq(clients.userId, ownerId))).get();
  return row?.id ?? null;
}
