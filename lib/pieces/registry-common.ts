// What every registry operation shares: the piece as the API hands it out, the studio-scoped piece
// read (someone else's piece is a 404), the studio's catalog and members, and the studio's "today".
import { asc, eq } from "drizzle-orm";
import { getDb, type Db } from "@/db/client";
import { finishProducts, memberships, pieces, users, type FinishProduct, type Piece } from "@/db/schema";
import type { StudioContext } from "@/lib/auth/guards";
import { localDate } from "@/lib/care/dates";
import { notFound } from "@/lib/errors";
import { registryStatements } from "./registry-sql";
import type { DbOrTx } from "./search-index";
import { pieceWhere } from "./access";

/** A piece as the API hands it out: never the registration code's hash or sealed copy. */
export type PublicPiece = Omit<Piece, "registrationCodeHash" | "registrationCodeEnc">;

export function publicPiece(p: Piece): PublicPiece {
  const { registrationCodeHash, registrationCodeEnc, ...rest } = p;
  return rest;
}

/**
 * The studio's calendar date at `now`. Every registry page asks, and the time-zone conversion costs more
 * than the page's own arithmetic, so the last answer is kept per zone for the rest of its UTC minute (a
 * zone's date changes only on whole minutes of UTC: every zone's offset, and each change of it, has been
 * a whole number of minutes since 1972; earlier instants are converted every time).
 */
export function today(ctx: StudioContext, now = new Date()): string {
  const ms = now.getTime();
  const minute = Math.floor(ms / 60_000);
  const tz = ctx.studio.timeZone;
  if (ms < WHOLE_MINUTE_OFFSETS_SINCE) return localDate(ms, tz);
  const kept = todayKept.get(tz);
  if (kept && kept.minute === minute) return kept.date;
  const date = localDate(ms, tz);
  if (todayKept.size >= 100) todayKept.clear();
  todayKept.set(tz, { minute, date });
  return date;
}

const WHOLE_MINUTE_OFFSETS_SINCE = Date.UTC(1973, 0, 1);
const todayKept = new Map<string, { minute: number; date: string }>();

/** The piece row of the caller's studio, or 404 (also for another studio's piece). */
export function loadPiece(ctx: StudioContext, pieceId: string, db: DbOrTx = getDb()): Piece {
  const row = db.select().from(pieces).where(pieceWhere(ctx, pieceId)).get();
  if (!row) throw notFound("No piece with that id in this studio.");
  return row;
}

export function studioProducts(studioId: string, db: DbOrTx = getDb()): FinishProduct[] {
  if (db === getDb()) return registryStatements(db as Db).products.all({ studioId });
  return db.select().from(finishProducts).where(eq(finishProducts.studioId, studioId)).all();
}

/** The studio's members who can apply a finish (for "applied by"). */
export function studioMembers(ctx: StudioContext) {
  return getDb()
    .select({ id: users.id, name: users.name, role: memberships.role })
    .from(memberships)
    .innerJoin(users, eq(users.id, memberships.userId))
    .where(eq(memberships.studioId, ctx.studio.id))
    .orderBy(asc(users.name))
    .all();
}
