import "server-only";
import { indexPiece } from "@/lib/pieces/search-index";
import { and, eq, isNull } from "drizzle-orm";
import type { User } from "lucia";
import { getDb, type Tx } from "@/db/client";
import { memberships, ownerships, pieces, studios, users } from "@/db/schema";
import { PieceReleasedEmail, pieceReleasedSubject } from "@/emails/piece-released";
import { TransferCodeEmail, transferCodeSubject } from "@/emails/transfer-code";
import { recordAudit } from "@/lib/audit";
import { localDate } from "@/lib/care/dates";
import { env } from "@/lib/env";
import { notFound } from "@/lib/errors";
import { sendMail } from "@/lib/mail";
import { mailAfterCommit } from "@/lib/mail/after-commit";
import { newRegistrationCode } from "@/lib/pieces/registration";
import { finishPlanHandOver, recordPlanHandOver, underPiecePlanLock } from "@/lib/plans/transfer";
import { closeDueCheckouts, jobsBackToStudio, openWorkAtRelease, recordCheckoutCloses } from "@/lib/repairs/handed-on";
import type { ReleaseValues } from "@/lib/validation/owner";
import { formatDate } from "@/lib/format";
import { getMyPiece } from "./pieces";

const link = (path: string) => new URL(path, env.APP_URL).href;

/**
 * Releases a piece the owner holds, for a new owner: the piece loses its owner, gets a fresh
 * registration code (the old card's code stops working), the ownership ends, and the fresh code is
 * returned once and e-mailed to the releasing owner; the studio is told, in one mail that lists the open work
 * the piece leaves with it (lib/repairs/handed-on.ts openWorkAtRelease). Someone else's piece is a 404.
 * `_confirmed` is the owner's ticked confirmation (releaseSchema), checked by the route or action.
 */
export async function releasePiece(user: Pick<User, "id" | "name" | "email" | "timeZone" | "unitSystem">, pieceId: string, _confirmed: ReleaseValues, now = new Date()) {
  // Read what the mail needs while the piece is still theirs (this also 404s a stranger).
  const before = getMyPiece(user, pieceId, now);
  return finishRelease(user, pieceId, await commitRelease(user, pieceId, now), before, now);
}

/**
 * What follows a committed release (commitRelease or releaseInTx): the payment pages and care plan's
 * Stripe steps, then the code to the owner and the word to the studio, each through mailAfterCommit.
 * `before` is the piece as its owner saw it before the release (getMyPiece); null sends no mail (a piece
 * the studio archived, unlinked when its owner deletes their account, lib/owner/account-delete.ts).
 */
export async function finishRelease(
  user: Pick<User, "id" | "name" | "email">,
  pieceId: string,
  { fresh, studio, closes, openWork, plan }: ReturnType<typeof releaseInTx>,
  before: ReturnType<typeof getMyPiece> | null,
  now = new Date(),
) {
  // After the commit: nothing below undoes the release. The plan's hand-over was written with it, so if the
  // process stops here, the plan transfer pass (jobs/plan-transfers.ts) finishes it.
  // Their payment pages close at Stripe; this never fails the release: a page Stripe didn't close now is
  // closed by the scheduler's pass (jobs/checkout-closes.ts), and a payment made there meanwhile is refunded
  // (lib/repairs/checkout.ts).
  await closeDueCheckouts({ ids: closes });
  await finishPlanHandOver(plan); // the piece's care plan moves or ends by the studio's setting (lib/plans/transfer.ts)
  if (!before) return { pieceId, code: fresh.code, transferring: [] as string[], staying: [] as string[] };
  const db = getDb();

  const transferring = before.warranty.lines.filter((l) => l.transfersToNewOwner && l.status !== "not_transferred").map((l) => l.label);
  const staying = before.warranty.lines.filter((l) => !l.transfersToNewOwner).map((l) => l.label);
  await mailAfterCommit("release code", () =>
    sendMail({
      studioId: studio.id,
      to: user.email,
      subject: transferCodeSubject({ pieceTitle: before.title }),
      email: TransferCodeEmail({
        name: user.name,
        pieceTitle: before.title,
        studioName: studio.name,
        code: fresh.code,
        url: link(`/r/${fresh.code}`),
        transferring,
        staying,
      }),
    }),
  );
  const studioTo = studio.email
    ? [studio.email]
    : db
        .select({ email: users.email })
        .from(memberships)
        .innerJoin(users, eq(users.id, memberships.userId))
        .where(and(eq(memberships.studioId, studio.id), eq(memberships.role, "admin")))
        .all()
        .map((r) => r.email);
  if (studioTo.length) {
    await mailAfterCommit("piece released", () =>
      sendMail({
        studioId: studio.id,
        to: studioTo,
        subject: pieceReleasedSubject({ pieceTitle: before.title, openWork: openWork.length }),
        email: PieceReleasedEmail({
          studioName: studio.name,
          pieceTitle: before.title,
          ownerName: user.name,
          releasedOn: formatDate(localDate(now, studio.timeZone)),
          url: link(`/studio/pieces/${pieceId}`),
          openWork: openWork.map((w) => ({ ...w, url: link(w.path) })),
        }),
      }),
    );
  }
  return { pieceId, code: fresh.code, transferring, staying };
}

/**
 * The release itself: one transaction, run under the piece's plan lock (lib/plans/transfer.ts
 * underPiecePlanLock). The piece loses its owner and gets a fresh code, the ownership ends, the jobs
 * waiting for this owner's payment go back to the studio with their open payment pages written down to be
 * closed (recordCheckoutCloses), the hand-over of the care plan they pay for on it is recorded
 * (recordPlanHandOver), so none of it is lost if the process stops after the commit, and the open work the
 * piece leaves with the studio is read for its mail (openWorkAtRelease).
 */
export function commitRelease(user: Pick<User, "id" | "name">, pieceId: string, now = new Date()) {
  return underPiecePlanLock(pieceId, () => getDb().transaction((tx) => releaseInTx(tx, user, pieceId, now)));
}

/** commitRelease's writes inside a transaction the caller holds (and under the piece's plan lock). */
export function releaseInTx(tx: Tx, user: Pick<User, "id" | "name">, pieceId: string, now = new Date()) {
  const fresh = newRegistrationCode();
  const released = tx
    .update(pieces)
    .set({ ownerId: null, clientId: null, registeredAt: null, registrationCodeHash: fresh.hash, registrationCodeEnc: fresh.enc, updatedAt: now })
    .where(and(eq(pieces.id, pieceId), eq(pieces.ownerId, user.id)))
    .returning({ studioId: pieces.studioId })
    .all();
  if (released.length !== 1) throw notFound("No piece with that id among yours.");
  const studioId = released[0]!.studioId;
  tx.update(ownerships).set({ endedAt: now }).where(and(eq(ownerships.pieceId, pieceId), eq(ownerships.userId, user.id), isNull(ownerships.endedAt))).run();
  recordAudit(tx, { studioId, actorId: user.id, action: "piece.released", subjectType: "piece", subjectId: pieceId, data: {} });
  indexPiece(tx, pieceId);
  const studio = tx.select().from(studios).where(eq(studios.id, studioId)).get()!;
  // Repair jobs waiting for this owner's payment go back to the studio, and their payment pages are
  // written down to be closed at Stripe (lib/repairs/handed-on.ts).
  const jobsSetBack = jobsBackToStudio(tx, { id: pieceId, studioId }, user.id);
  const closes = recordCheckoutCloses(tx, jobsSetBack);
  const openWork = openWorkAtRelease(tx, { id: pieceId, studioId }, user, jobsSetBack, studio.timeZone);
  // The piece's care plan: its move or end, refund claim and Stripe step, written with the release.
  const plan = recordPlanHandOver(tx, pieceId, user.id, now);
  return { fresh, studio, closes, openWork, plan };
}
