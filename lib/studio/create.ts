import "server-only";
// Starting a studio at /start: who may (STUDIO_SIGNUP, the first-studio rule, an operator's invite
// link), and the one way a studio and its first admin are made outside the demo seed.
import { and, eq, sql } from "drizzle-orm";
import { getDb, type Db } from "@/db/client";
import { auditLog, memberships, studios, type Studio } from "@/db/schema";
import { recordAudit } from "@/lib/audit";
import { forbidden } from "@/lib/errors";
import { env, type Env } from "@/lib/env";
import { readStudioInvite } from "./create-invite";
import type { StartStudioValues } from "./create-schema";

type Tx = Pick<Db, "select">;
export type SignupMode = Env["STUDIO_SIGNUP"];

export type StartGate = { allowed: true; how: "first" | "open" | "invite"; nonce?: string } | { allowed: false; why: keyof typeof REFUSALS };

/** What someone who may not start a studio reads, on the page and from the action. */
export const REFUSALS = {
  closed: "New studios can't be started on this Grainward. If you work at a studio that uses it, ask its admin to invite you to the team.",
  invite_needed: "New studios on this Grainward start from an invitation link. Ask whoever runs this Grainward for one.",
  invite_bad: "We can't read this invitation link. Check that the whole link was copied, or ask for a new one.",
  invite_expired: "This invitation link has expired. Ask whoever runs this Grainward for a new one.",
  invite_used: "This invitation link has already started a studio. Ask for a new link to start another.",
} as const;

/** Whether a studio may be started now: always on an install without one, otherwise as STUDIO_SIGNUP says. */
export function startGate({
  invite,
  mode = env.STUDIO_SIGNUP,
  now = new Date(),
  db = getDb(),
}: {
  invite?: string;
  mode?: SignupMode;
  now?: Date;
  db?: Tx;
} = {}): StartGate {
  if (!db.select({ id: studios.id }).from(studios).limit(1).get()) return { allowed: true, how: "first" };
  if (mode === "open") return { allowed: true, how: "open" };
  if (mode === "closed") return { allowed: false, why: "closed" };
  if (!invite) return { allowed: false, why: "invite_needed" };
  const check = readStudioInvite(invite, now);
  if (!check.ok)
    return {
      allowed: false,
      why: check.why === "expired" ? "invite_expired" : "invite_bad",
    };
  const used = db
    .select({ id: auditLog.id })
    .from(auditLog)
    .where(and(eq(auditLog.action, "studio.created"), sql`json_extract(${auditLog.data}, '$.invite') = ${check.nonce}`))
    .get();
  return used ? { allowed: false, why: "invite_used" } : { allowed: true, how: "invite", nonce: check.nonce };
}

/**
 * Makes a studio with `userId` as its admin. The gate is checked again inside one immediate
 * transaction, so two visitors racing for an empty install make one studio, and an invite link one.
 */
export function createStudio(userId: string, v: StartStudioValues, { db = getDb(), ...opts }: { mode?: SignupMode; now?: Date; db?: Db } = {}): Studio {
  return db.transaction(
    (tx) => {
      const gate = startGate({ invite: v.invite, ...opts, db: tx });
      if (!gate.allowed) throw forbidden(REFUSALS[gate.why]);
      const studio = tx
        .insert(studios)
        .values({
          slug: freeSlug(tx, v.name),
          name: v.name,
          timeZone: v.timeZone,
          currency: v.currency,
          unitSystem: v.unitSystem,
        })
        .returning()
        .get();
      tx.insert(memberships).values({ studioId: studio.id, userId, role: "admin" }).run();
      recordAudit(tx, {
        studioId: studio.id,
        actorId: userId,
        action: "studio.created",
        subjectType: "studio",
        subjectId: studio.id,
        data: { how: gate.how, ...(gate.nonce ? { invite: gate.nonce } : {}) },
      });
      return studio;
    },
    { behavior: "immediate" },
  );
}

/** "Ørsted & Daughters Joinery" → "orsted-daughters-joinery", with -2, -3 … when taken. */
function freeSlug(db: Tx, name: string): string {
  const base =
    name
      .normalize("NFKD")
      .replace(/[\u0300-\u036f]/g, "")
      .replace(/ø/gi, "o")
      .toLowerCase()
      .replace(/[^a-z0-9]+/g, "-")
      .replace(/^-+|-+$/g, "")
      .slice(0, 40)
      .replace(/-+$/, "") || "studio";
  for (let n = 1; ; n++) {
    const slug = n === 1 ? base : `${base}-${n}`;
    if (!db.select({ id: studios.id }).from(studios).where(eq(studios.slug, slug)).get()) return slug;
  }
}
