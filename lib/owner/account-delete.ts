import "server-only";
import { and, asc, eq, inArray, isNull, sql } from "drizzle-orm";
import type { User } from "lucia";
import { getDb } from "@/db/client";
import { claims, memberships, pieces, planSubscriptions, refreshOffers, repairJobs, sessions, studios, userTokens, users } from "@/db/schema";
import { recordAudit } from "@/lib/audit";
import type { OwnerActor } from "@/lib/auth/actor";
import { endAllSessions } from "@/lib/auth/session";
import { writeState } from "@/lib/claims/move-state";
import { OPEN_STATES } from "@/lib/claims/states";
import { conflict, isAppError, rephrased } from "@/lib/errors";
import { formatAndList, formatCount } from "@/lib/format";
import { appendMessage, threadFor } from "@/lib/messages/store";
import { getMyPiece } from "@/lib/owner/pieces";
import { finishRelease, releaseInTx } from "@/lib/owner/transfer";
import { underPiecePlanLock } from "@/lib/plans/transfer";
import { cancelJob } from "@/lib/repairs/payment";
import { OWNER_CAN_DECLINE } from "@/lib/repairs/states";
import { checkCurrentPassword } from "./account-email";

// Deleting an owner's own account (app/(owner)/account/delete). The rules, in the order they run; the
// page says them in the same words:
// 1. Refused, with what to do, while something can't be undone safely: the account is on a studio's
//    team (the studio's team page removes members), a repair of theirs is paid for or booked and not
//    done, or a care plan's first payment is under way.
// 2. Quotes waiting on their answer or payment are declined (cancelJob as the owner, which first closes
//    any payment page at Stripe; a payment that came through meanwhile stops the deletion there).
// 3. Then, in one transaction (nothing of it stands unless all of it does): open claims are withdrawn
//    (closed), with a note in each claim's thread that the studio's inbox shows; every piece they hold is
//    released (releaseInTx, lib/owner/transfer.ts): a fresh registration code, the studio's open work on it
//    set back, a care plan moved or ended by the studio's transfer setting; a piece the studio archived is
//    released the same way, so it no longer points at the account; refresh offers still open for them
//    are expired; the account is made nameless (rule 4) and the studios' audit rows written.
// 4. The account row stays, because payments, receipts, claims and the audit trail the studios keep
//    for their books point at it, but its name becomes "Former owner (account deleted)", its e-mail an
//    address that receives nothing, its password unusable; its links and sessions are gone. The
//    studios' own client records (their customer list) are theirs and stay as they are.
// 5. After the commit (finishRelease): payment pages and care plans at Stripe, then each piece's fresh code
//    mailed to their old address and the studio told, through mailAfterCommit; archived pieces send no mail.

export const DELETED_NAME = "Former owner (account deleted)";
const deletedEmail = (userId: string) => `deleted-${userId}@deleted.invalid`;
/** Not an argon2 hash: verifyPassword answers false for it, so no password signs in. */
const NO_PASSWORD = "account-deleted";

const CLAIM_WITHDRAWN_NOTE = "I deleted my Grainward account, so this claim is withdrawn. (Written by Grainward when the account was deleted.)";

export type DeletionBlock = { kind: "team" | "repair" | "plan_payment"; words: string };

export type DeletionPreview = {
  blocks: DeletionBlock[];
  pieces: { id: string; title: string; studioName: string }[];
  openClaims: number;
  quotes: number;
};

/** What deleting would do now, and what stops it. */
export function deletionPreview(user: Pick<User, "id">): DeletionPreview {
  const db = getDb();
  const held = db
    .select({ id: pieces.id, title: pieces.title, studioName: studios.name })
    .from(pieces)
    .innerJoin(studios, eq(studios.id, pieces.studioId))
    .where(and(eq(pieces.ownerId, user.id), isNull(pieces.archivedAt)))
    .orderBy(asc(pieces.title))
    .all();
  const openClaims = db.select({ id: claims.id }).from(claims).where(and(eq(claims.ownerId, user.id), inArray(claims.state, [...OPEN_STATES]))).all().length;
  return { blocks: deletionBlocks(user.id), pieces: held, openClaims, quotes: quotesToDecline(user.id).length };
}

function deletionBlocks(userId: string): DeletionBlock[] {
  const db = getDb();
  const blocks: DeletionBlock[] = [];
  for (const m of db.select({ studioName: studios.name }).from(memberships).innerJoin(studios, eq(studios.id, memberships.studioId)).where(eq(memberships.userId, userId)).all()) {
    blocks.push({ kind: "team", words: `Your account is on the team of ${m.studioName}. Ask an admin there to remove you on the studio's team page; team accounts are not deleted from here.` });
  }
  const owed = db
    .select({ title: repairJobs.title })
    .from(repairJobs)
    .where(and(eq(repairJobs.ownerId, userId), inArray(repairJobs.state, ["paid", "covered", "scheduled"])))
    .orderBy(asc(repairJobs.title))
    .all();
  if (owed.length === 1) {
    blocks.push({ kind: "repair", words: `Your repair “${owed[0]!.title}” is paid for or booked and not done yet. Once the studio has done it, or cancelled it (a paid repair that is cancelled is refunded), you can delete your account.` });
  } else if (owed.length > 1) {
    blocks.push({ kind: "repair", words: `${formatCount(owed.length)} repairs of yours are paid for or booked and not done yet: ${formatAndList(owed.map((j) => `“${j.title}”`))}. Once the studio has done them, or cancelled them (a paid repair that is cancelled is refunded), you can delete your account.` });
  }
  const paying = db
    .select({ title: pieces.title })
    .from(planSubscriptions)
    .innerJoin(pieces, eq(pieces.id, planSubscriptions.pieceId))
    .where(and(eq(planSubscriptions.ownerId, userId), eq(planSubscriptions.state, "awaiting_payment")))
    .all();
  for (const p of paying) {
    blocks.push({ kind: "plan_payment", words: `The first payment for the care plan on “${p.title}” is under way. Once it has gone through or its payment page has closed, you can delete your account.` });
  }
  return blocks;
}

/** Quotes waiting on the owner, on pieces they hold (the only ones they may still decline). */
function quotesToDecline(userId: string) {
  return getDb()
    .select({ id: repairJobs.id, title: repairJobs.title })
    .from(repairJobs)
    .innerJoin(pieces, eq(pieces.id, repairJobs.pieceId))
    .where(and(eq(repairJobs.ownerId, userId), eq(pieces.ownerId, userId), inArray(repairJobs.state, [...OWNER_CAN_DECLINE])))
    .all();
}

/**
 * Deletes the signed-in owner's account by the rules above, after checking their password. Every
 * session ends; the caller sends the browser to the page that says it is done.
 */
export async function deleteAccount(actor: OwnerActor, current: string, ip: string, now = new Date()): Promise<void> {
  const { user } = actor;
  const row = await checkCurrentPassword(user.id, current, ip);
  const blocks = deletionBlocks(user.id);
  if (blocks.length) throw conflict(`Your account is not deleted yet. ${blocks.map((b) => b.words).join(" ")}`, { code: "account_in_use" });
  const owner = { id: row.id, name: row.name, email: row.email, timeZone: row.timeZone, unitSystem: row.unitSystem };

  for (const job of quotesToDecline(user.id)) {
    try {
      await cancelJob(actor, job.id);
    } catch (e) {
      if (!isAppError(e)) throw e;
      throw rephrased(e, `Your account is not deleted yet: the quote “${job.title}” could not be declined. ${e.message}`);
    }
  }

  // Read while the pieces are still theirs: what the release mails say (getMyPiece). Archived pieces are
  // unlinked by the same release, without mail: the studio has put them away, there is nothing to hand on.
  const db = getDb();
  const held = db.select({ id: pieces.id, archivedAt: pieces.archivedAt }).from(pieces).where(eq(pieces.ownerId, user.id)).orderBy(asc(pieces.id)).all();
  const before = new Map(held.filter((p) => !p.archivedAt).map((p) => [p.id, getMyPiece(owner, p.id, now)]));

  // Everything else in one transaction, under the plan lock of every piece they hold: nothing of it is
  // written unless all of it is.
  const releases = await underPlanLocks(
    held.map((p) => p.id),
    () =>
      db.transaction((tx) => {
        const open = tx.select().from(claims).where(and(eq(claims.ownerId, user.id), inArray(claims.state, [...OPEN_STATES]))).all();
        for (const claim of open) {
          // Closing an open claim is not a staff move (lib/claims/states.ts); it is checked here: the claim is open and theirs.
          writeState(tx, claim, "closed", undefined);
          appendMessage(tx, threadFor(tx, { kind: "claim", id: claim.id }, now), { author: "owner", authorId: user.id, body: CLAIM_WITHDRAWN_NOTE, now });
          recordAudit(tx, { studioId: claim.studioId, actorId: user.id, action: "claim.withdrawn", subjectType: "claim", subjectId: claim.id, data: { from: claim.state, reason: "account_deleted" } });
        }
        const released = held.map((p) => ({ pieceId: p.id, committed: releaseInTx(tx, owner, p.id, now) }));
        // Refresh offers made to them: a released piece's offer already reads as closed (lib/reminders/offers.ts),
        // an archived one's too; here every one still open is expired, so none stays open for the account.
        const offersExpired = tx.update(refreshOffers).set({ status: "expired" }).where(and(eq(refreshOffers.userId, user.id), eq(refreshOffers.status, "offered"))).run().changes;
        tx.update(users)
          .set({ name: DELETED_NAME, email: deletedEmail(user.id), passwordHash: NO_PASSWORD, emailVerifiedAt: null, remindersEnabled: false, deletedAt: now })
          .where(eq(users.id, user.id))
          .run();
        tx.delete(userTokens).where(eq(userTokens.userId, user.id)).run();
        tx.delete(sessions).where(eq(sessions.userId, user.id)).run();
        // Every studio that keeps a record of this person: what they held, claimed, were quoted or subscribed to.
        const touched = tx.all<{ studioId: string }>(sql`
          SELECT studio_id AS studioId FROM ownerships WHERE user_id = ${user.id}
          UNION SELECT studio_id FROM claims WHERE owner_id = ${user.id}
          UNION SELECT studio_id FROM repair_jobs WHERE owner_id = ${user.id}
          UNION SELECT studio_id FROM plan_subscriptions WHERE owner_id = ${user.id}
          UNION SELECT studio_id FROM clients WHERE user_id = ${user.id}`);
        for (const { studioId } of touched) {
          recordAudit(tx, { studioId, actorId: user.id, action: "account.deleted", subjectType: "user", subjectId: user.id, data: { piecesReleased: held.length, offersExpired } });
        }
        return released;
      }),
  );

  // After the commit: payment pages and care plans at Stripe (recorded with the release, so the scheduled
  // passes finish what fails here), then the codes and the studios' notices through mailAfterCommit.
  for (const r of releases) await finishRelease(owner, r.pieceId, r.committed, before.get(r.pieceId) ?? null, now);
  await endAllSessions(user.id);
}

/** Runs `run` holding the plan lock of each piece (underPiecePlanLock, lib/plans/transfer.ts), taken in the order given. */
function underPlanLocks<T>(pieceIds: string[], run: () => T): Promise<T> {
  const [first, ...rest] = pieceIds;
  if (first === undefined) return Promise.resolve().then(run);
  return underPiecePlanLock(first, () => underPlanLocks(rest, run)).then((inner) => inner);
}
