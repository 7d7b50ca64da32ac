import { asc, eq, sql } from "drizzle-orm";
import { cookies } from "next/headers";
import { cache } from "react";
import type { User } from "lucia";
import { bound } from "@/db/bound";
import { getDb, perConnection } from "@/db/client";
import { memberships, studios, type Studio } from "@/db/schema";
import type { StudioRole } from "@/lib/care/vocabulary";
import { forbidden, unauthorized } from "@/lib/errors";
import { getCurrentSession } from "./session";

// Who is acting in this request, in one shape. A signed-in person acts as a member of their current
// studio (the studio cookie's, else their first), in that membership's role; someone with no studio
// acts as an owner (of the pieces they hold). Resolved once per request: the session, the
// memberships and the cookie are read the first time, then every guard and wrapper reuses it.

/** A studio member acting in their current studio. */
export type StudioActor = { role: StudioRole; user: User; studio: Studio };
/** Someone acting on their own pieces, claims, jobs and visits: no studio. */
export type OwnerActor = { role: "owner"; user: User; studio: null };
export type Actor = StudioActor | OwnerActor;
export type ActorRole = Actor["role"];

/** What a where-builder (claimVisibleTo, jobVisibleTo, …) reads of an Actor; lib/ functions that hold only a user id pass { role: "owner", user, studio: null }. */
export type ActorRef = { role: ActorRole; user: { id: string }; studio: { id: string } | null };

/** The actor a list of roles lets in: only studio roles → a studio actor; "owner" among them → either. */
export type ActorFor<R extends ActorRole> = [Exclude<R, "owner">] extends [never] ? OwnerActor : "owner" extends R ? Actor : StudioActor;

/** The cookie naming the studio a member of several works in. */
export const STUDIO_COOKIE = "gw_studio";

// Every signed-in request runs this. The user id is bound as `+?` (db/bound.ts): a person's memberships
// are a few rows of memberships_user_idx whoever they are, so the plan never needs the value.
const membershipsQuery = perConnection((db) =>
  db
    .select({ role: memberships.role, studio: studios })
    .from(memberships)
    .innerJoin(studios, eq(studios.id, memberships.studioId))
    .where(eq(memberships.userId, bound(sql.placeholder("userId"))))
    .orderBy(asc(memberships.createdAt))
    .prepare(),
);

/** A person's studios with their role in each, oldest membership first. */
export async function studioMemberships(userId: string) {
  return membershipsQuery(getDb()).all({ userId });
}

export const STAFF_ROLES = ["admin", "staff"] as const satisfies readonly StudioRole[];
export const ALL_STUDIO_ROLES = ["admin", "staff", "technician"] as const satisfies readonly StudioRole[];

/** This request's actor, or null when nobody is signed in. */
export const getActor = cache(async (): Promise<Actor | null> => {
  const { user } = await getCurrentSession();
  if (!user) return null;
  const rows = await studioMemberships(user.id);
  const chosen = (await cookies()).get(STUDIO_COOKIE)?.value;
  const current = rows.find((r) => r.studio.id === chosen) ?? rows[0];
  return current ? { role: current.role, user, studio: current.studio } : ownerActor(user);
});

export function ownerActor(user: User): OwnerActor {
  return { role: "owner", user, studio: null };
}

/**
 * The actor if one of `roles` lets them in. "owner" lets in every signed-in person, acting on their
 * own things: a studio member whose role is not listed then acts as an owner (a technician paying
 * for their own table's repair). Nobody signed in → 401; a role not listed → 403.
 */
export async function requireActor<R extends ActorRole>(roles: readonly R[]): Promise<ActorFor<R>> {
  const actor = await getActor();
  if (!actor) throw unauthorized();
  if ((roles as readonly ActorRole[]).includes(actor.role)) return actor as ActorFor<R>;
  if ((roles as readonly ActorRole[]).includes("owner")) return ownerActor(actor.user) as ActorFor<R>;
  if (actor.role === "owner") throw forbidden("This area is for studio members.");
  throw forbidden("Your role in this studio doesn't include this.");
}

export function isStudioActor(actor: Actor): actor is StudioActor {
  return actor.role !== "owner";
}

export function isStaff(actor: Actor): actor is StudioActor & { role: "admin" | "staff" } {
  return actor.role === "admin" || actor.role === "staff";
}
