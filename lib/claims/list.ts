import "server-only";
import { and, asc, count, desc, eq, gte, inArray, isNull, lt, type SQL } from "drizzle-orm";
import type { User } from "lucia";
import { bound } from "@/db/bound";
import { getDb } from "@/db/client";
import { claims, pieces, studios, users } from "@/db/schema";
import type { StudioContext } from "@/lib/auth/guards";
import { containsText } from "@/lib/text-match";
import type { ClaimListQuery } from "@/lib/validation/claims";
import { photoCountSql } from "./claims-sql";
import { OPEN_STATES } from "./states";
import { claimVisibleTo } from "./visible";

// Lists of claims: the owner's own, and the studio's triage queue.

const DAY = 86_400_000;

export function listOwnerClaims(user: Pick<User, "id">) {
  return getDb()
    .select({
      id: claims.id,
      state: claims.state,
      category: claims.category,
      decision: claims.decision,
      coveredPct: claims.coveredPct,
      createdAt: claims.createdAt,
      updatedAt: claims.updatedAt,
      pieceId: claims.pieceId,
      pieceTitle: pieces.title,
      studioName: studios.name,
      photos: photoCountSql,
    })
    .from(claims)
    .innerJoin(pieces, eq(pieces.id, claims.pieceId))
    .innerJoin(studios, eq(studios.id, claims.studioId))
    .where(claimVisibleTo({ role: "owner", user, studio: null }))
    .orderBy(desc(claims.createdAt))
    .all()
    .map((r) => ({ ...r, createdAt: r.createdAt.toISOString(), updatedAt: r.updatedAt.toISOString() }));
}

/** The owner's claims, and their pieces to report damage on (the owner bound as `+?`, as in claimVisibleTo). */
export function ownerClaimsOverview(user: Pick<User, "id">) {
  const myPieces = getDb()
    .select({ id: pieces.id, title: pieces.title, studioName: studios.name })
    .from(pieces)
    .innerJoin(studios, eq(studios.id, pieces.studioId))
    .where(and(eq(pieces.ownerId, bound(user.id)), isNull(pieces.archivedAt)))
    .orderBy(asc(pieces.title))
    .all();
  return { claims: listOwnerClaims(user), pieces: myPieces };
}

export const CLAIM_PAGE_SIZE = 50;

/** The studio's triage queue, filtered, searched and sorted by age, a page at a time; `now` is the server's clock for wait times. */
export function listStudioClaims(ctx: StudioContext, q: ClaimListQuery, now = Date.now()) {
  const where: SQL[] = [claimVisibleTo(ctx)];
  if (q.state === "open") where.push(inArray(claims.state, [...OPEN_STATES]));
  else if (q.state !== "all") where.push(eq(claims.state, q.state));
  if (q.category !== "all") where.push(eq(claims.category, q.category));
  if (q.pieceId) where.push(eq(claims.pieceId, q.pieceId));
  const at = (days: number) => new Date(now - days * DAY);
  if (q.age === "under_2d") where.push(gte(claims.createdAt, at(2)));
  if (q.age === "2_to_7d") where.push(and(lt(claims.createdAt, at(2)), gte(claims.createdAt, at(7)))!);
  if (q.age === "over_7d") where.push(lt(claims.createdAt, at(7)));
  if (q.q) where.push(containsText(q.q, pieces.title, users.name, users.email));
  const total =
    getDb()
      .select({ n: count() })
      .from(claims)
      .innerJoin(pieces, eq(pieces.id, claims.pieceId))
      .innerJoin(users, eq(users.id, claims.ownerId))
      .where(and(...where))
      .get()?.n ?? 0;
  const rows = getDb()
    .select({
      id: claims.id,
      state: claims.state,
      category: claims.category,
      decision: claims.decision,
      coveredPct: claims.coveredPct,
      createdAt: claims.createdAt,
      firstAnsweredAt: claims.firstAnsweredAt,
      pieceId: claims.pieceId,
      pieceTitle: pieces.title,
      ownerName: users.name,
      photos: photoCountSql,
    })
    .from(claims)
    .innerJoin(pieces, eq(pieces.id, claims.pieceId))
    .innerJoin(users, eq(users.id, claims.ownerId))
    .where(and(...where))
    .orderBy(q.sort === "oldest" ? asc(claims.createdAt) : desc(claims.createdAt), asc(claims.id))
    .limit(CLAIM_PAGE_SIZE)
    .offset((q.page - 1) * CLAIM_PAGE_SIZE)
    .all()
    .map((r) => ({
      ...r,
      createdAt: r.createdAt.toISOString(),
      firstAnsweredAt: r.firstAnsweredAt?.toISOString() ?? null,
      /** Time to the studio's first answer, or the wait so far when there is none yet. */
      waitMs: (r.firstAnsweredAt?.getTime() ?? now) - r.createdAt.getTime(),
      answered: r.firstAnsweredAt !== null,
    }));
  const piecesWithClaims = getDb()
    .selectDistinct({ id: pieces.id, title: pieces.title })
    .from(claims)
    .innerJoin(pieces, eq(pieces.id, claims.pieceId))
    .where(claimVisibleTo(ctx))
    .orderBy(asc(pieces.title))
    .all();
  return { claims: rows, total, page: q.page, pageSize: CLAIM_PAGE_SIZE, pieces: piecesWithClaims, query: q, now: new Date(now).toISOString() };
}
