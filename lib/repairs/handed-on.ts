// A piece changes hands (its owner releases it, lib/owner/transfer.ts) while a repair job of theirs on it
// waits for their payment. They can no longer pay it (an owner acts on a job only while holding its piece,
// lib/repairs/owner-reach.ts), and nobody else can: the job would wait for ever. So, in the release's own
// transaction, such a job goes back to the studio ("Being priced", the state an edited quote goes back to,
// lib/repairs/states.ts) with an audit row, and the staff job page says why (HANDED_ON_WORDS); staff send
// the quote again, which reaches the piece's new owner (lib/repairs/payment.ts sendQuote), or cancel it.
// After the release has committed, the payment pages the former owner opened for these jobs are closed at
// Stripe (closeDueCheckouts), so they can't take money that would only be given back.
//
// The close is durable: in the same transaction each open page of those jobs is written to checkout_closes
// (recordCheckoutCloses), so a close Stripe didn't answer is tried again by the scheduler's pass
// (jobs/checkout-closes.ts, closeDueCheckouts) until Stripe confirms it or the page has expired on its own.
//
// The studio is told at the release what open work the piece leaves behind (openWorkAtRelease: the former
// owner's undecided or accepted claims, their quoted, approved, paid, covered or booked jobs and booked
// visits), in the one staff mail the release sends (lib/owner/transfer.ts, emails/piece-released.tsx).
import { and, asc, eq, inArray, isNull, notInArray, or } from "drizzle-orm";
import { getDb, type Tx } from "@/db/client";
import { checkoutCloses, claims, payments, repairJobs, users, visits, type CheckoutClose, type Claim, type Payment, type RepairJob } from "@/db/schema";
import { AppError } from "@/lib/errors";
import { recordAudit } from "@/lib/audit";
import { OPEN_STATES, type ClaimState } from "@/lib/claims/states";
import { CLAIM_CATEGORY_LABELS, CLAIM_STATE_LABELS_STAFF } from "@/lib/claims/labels";
import { formatInstant, formatVisitWhen } from "@/lib/format";
import { expireCheckoutSession } from "@/lib/payments/stripe";
import { applySession } from "./checkout";
import { moveJob } from "./jobs";
import { ownerActsOnJob } from "./owner-reach";
import { AWAITING_PAYMENT, JOB_STATE_LABELS, jobStateLabel } from "./states";


/** What the staff job page says on a quoted job set back because its piece changed hands (jobHandedOn). */
export const HANDED_ON_WORDS = "It changed hands before this quote was paid. Once the new owner has registered the piece, send the quote again to reach them, or cancel the job.";

/**
 * Inside the release's transaction (after the piece has lost its owner): every job of the studio's on the
 * piece that waits for the former owner's payment goes back to being priced, audited. Returns their ids,
 * for closeHandedOnCheckouts once the transaction has committed.
 */
export function jobsBackToStudio(tx: Tx, piece: { id: string; studioId: string }, formerOwnerId: string): string[] {
  const waiting = tx
    .select()
    .from(repairJobs)
    .where(and(eq(repairJobs.studioId, piece.studioId), eq(repairJobs.pieceId, piece.id), eq(repairJobs.ownerId, formerOwnerId), eq(repairJobs.state, AWAITING_PAYMENT)))
    .all();
  for (const job of waiting) {
    moveJob(tx, job, "draft");
    recordAudit(tx, {
      studioId: job.studioId,
      actorId: formerOwnerId,
      action: "job.handed_on",
      subjectType: "repair_job",
      subjectId: job.id,
      data: { reason: "the piece changed hands before the quote was paid", quoteVersion: job.quoteVersion, totalMinor: job.totalMinor },
    });
  }
  return waiting.map((j) => j.id);
}

/**
 * How long a payment page stays open at Stripe when nobody closes it: we open Checkout Sessions without
 * expires_at (lib/payments/stripe.ts), so Stripe's default of 24 hours applies (the fake does the same,
 * lib/fakes/stripe-fake.ts). From memory of Stripe's API reference (Checkout Session, expires_at).
 */
export const CHECKOUT_PAGE_LIFETIME_MS = 24 * 3600_000;

/**
 * Inside the release's transaction, after jobsBackToStudio: writes down every payment page still open for
 * those jobs as one to close at Stripe (once per page). Returns the rows' ids for closeDueCheckouts.
 */
export function recordCheckoutCloses(tx: Tx, jobIds: readonly string[]): string[] {
  if (jobIds.length === 0) return [];
  const open = tx.select().from(payments).where(and(inArray(payments.jobId, [...jobIds]), eq(payments.status, "open"))).all();
  const ids: string[] = [];
  for (const p of open) {
    const row = tx
      .insert(checkoutCloses)
      .values({ studioId: p.studioId, paymentId: p.id, expiresAt: new Date(p.createdAt.getTime() + CHECKOUT_PAGE_LIFETIME_MS) })
      .onConflictDoNothing()
      .returning({ id: checkoutCloses.id })
      .get();
    if (row) ids.push(row.id);
  }
  return ids;
}

/**
 * What one run of closeDueCheckouts did: pages Stripe closed, pages that expired on their own, pages the
 * former owner paid before the close (refunded automatically, lib/repairs/checkout.ts applySession),
 * closes Stripe refused (a 4xx: asked no more) and closes Stripe didn't answer (tried again later).
 */
export type CheckoutClosesResult = { closed: string[]; expired: string[]; paid: string[]; refused: string[]; failed: string[] };

/** A payment row the owner paid at Stripe (whatever became of it after: refunded or not). */
const PAID_STATUSES: readonly Payment["status"][] = ["paid", "partially_refunded", "refunded"];

/**
 * Closes at Stripe each recorded page not yet settled (`ids`: only those, as the release does; the
 * scheduler's pass: all of them). A page already settled here (paid, expired by its webhook) is just marked; one past its expiry is
 * marked expired without asking Stripe; otherwise Stripe is asked to expire it, and what it answers is
 * applied to the payment (lib/repairs/checkout.ts applySession: a page the owner paid first is refunded
 * automatically, and the close settles as "paid"). A close Stripe refuses (a 4xx: no such page under
 * this key, a key it no longer accepts) would be refused again on every pass: it settles as "refused",
 * with an audit row in words, and the staff job page says so (checkoutCloseWords). Never throws: a close
 * Stripe didn't answer stays due, and is counted in `failed`.
 */
export async function closeDueCheckouts({ now = new Date(), ids }: { now?: Date; ids?: readonly string[] } = {}): Promise<CheckoutClosesResult> {
  const db = getDb();
  const due = db
    .select({ close: checkoutCloses, payment: payments })
    .from(checkoutCloses)
    .innerJoin(payments, eq(payments.id, checkoutCloses.paymentId))
    .where(and(isNull(checkoutCloses.settledAt), ids ? inArray(checkoutCloses.id, [...ids]) : undefined))
    .orderBy(asc(checkoutCloses.createdAt))
    .all();
  const out: CheckoutClosesResult = { closed: [], expired: [], paid: [], refused: [], failed: [] };
  const settle = (id: string, outcome: NonNullable<CheckoutClose["outcome"]>) => {
    db.update(checkoutCloses).set({ outcome, settledAt: new Date() }).where(and(eq(checkoutCloses.id, id), isNull(checkoutCloses.settledAt))).run();
    out[outcome].push(id);
  };
  /** Closed, or paid first, as the payment row reads now. */
  const settleAsRead = (close: CheckoutClose) => {
    const status = db.select({ status: payments.status }).from(payments).where(eq(payments.id, close.paymentId)).get()?.status;
    settle(close.id, status && PAID_STATUSES.includes(status) ? "paid" : "closed");
  };
  for (const { close, payment } of due) {
    if (payment.status !== "open") {
      settleAsRead(close);
      continue;
    }
    if (close.expiresAt.getTime() <= now.getTime()) {
      settle(close.id, "expired");
      continue;
    }
    const tries = close.tries + 1;
    db.update(checkoutCloses).set({ tries, lastTriedAt: new Date() }).where(eq(checkoutCloses.id, close.id)).run();
    try {
      await applySession(await expireCheckoutSession(payment.checkoutSessionId, payment));
      settleAsRead(close);
    } catch (e) {
      // A refusal (lib/payments/stripe.ts callStripe: a 409 with Stripe's words) will not change on asking again.
      if (e instanceof AppError && e.status !== 503) {
        db.transaction((tx) =>
          recordAudit(tx, {
          studioId: payment.studioId,
          actorId: null,
          action: "payment.close_refused",
          subjectType: "payment",
          subjectId: payment.id,
          data: { reason: `${e.message} Not asked again; the page closes on its own when it expires.`, checkoutSessionId: payment.checkoutSessionId, jobId: payment.jobId, tries },
          }),
        );
        settle(close.id, "refused");
        continue;
      }
      console.error(`closing payment page ${payment.checkoutSessionId} at Stripe failed (try ${tries}); the scheduler's pass tries again, and a payment made there meanwhile is refunded automatically`, e);
      out.failed.push(close.id);
    }
  }
  return out;
}

/**
 * What the staff job page says about the payment pages a release of the piece asked Stripe to close, if
 * anything: one the former owner paid before it closed (the payment goes back to them automatically,
 * the payments list shows it), and one Stripe refused to close (closeDueCheckouts), with when it expires
 * on its own in the studio's zone.
 */
export function checkoutCloseWords(studioId: string, jobId: string, timeZone: string, formerOwnerName: string | null): string[] {
  const rows = getDb()
    .select({ outcome: checkoutCloses.outcome, expiresAt: checkoutCloses.expiresAt, openedAt: payments.createdAt })
    .from(checkoutCloses)
    .innerJoin(payments, eq(payments.id, checkoutCloses.paymentId))
    .where(and(eq(checkoutCloses.studioId, studioId), eq(payments.studioId, studioId), eq(payments.jobId, jobId), inArray(checkoutCloses.outcome, ["paid", "refused"])))
    .orderBy(asc(checkoutCloses.createdAt))
    .all();
  const who = formerOwnerName ?? "the former owner";
  return rows.map((r) => {
    const opened = formatInstant(r.openedAt, timeZone, { time: true });
    if (r.outcome === "paid") return `${formerOwnerName ?? "The former owner"} paid on the payment page opened ${opened} before it could be closed. That payment does not count toward this job and goes back to them automatically: see Payments.`;
    return `The payment service refused to close the payment page opened ${opened}, so it is not asked again. The page stays open until ${formatInstant(r.expiresAt, timeZone, { time: true })}; if ${who} pays on it before then, the payment goes back to them automatically.`;
  });
}

/** The job was set back by a hand-over and waits for staff: a sent quote being priced again, its owner no longer holding the piece. */
export function jobHandedOn(job: Pick<RepairJob, "state" | "quoteVersion" | "ownerId">, piece: { ownerId: string | null }): boolean {
  return job.state === "draft" && job.quoteVersion > 0 && !ownerActsOnJob(job, piece);
}

/**
 * What the staff job page says about a job whose owner no longer holds its piece, if anything: set back
 * by the hand-over (HANDED_ON_WORDS); a quote sent to the former owner, who can no longer approve it; or
 * work paid for or covered, whose visit the former owner no longer sees (lib/repairs/owner-reach.ts).
 */
export function handedOnWords(job: Pick<RepairJob, "state" | "quoteVersion" | "ownerId">, piece: { ownerId: string | null }, formerOwnerName: string | null): string | null {
  if (jobHandedOn(job, piece)) return HANDED_ON_WORDS;
  if (ownerActsOnJob(job, piece)) return null;
  const who = formerOwnerName ?? "The former owner";
  if (job.state === "quoted") return `It changed hands after this quote was sent, and ${who} can no longer approve it. Edit the quote and send it again once the new owner has registered the piece, or cancel the job.`;
  if (job.state === "paid" || job.state === "covered" || job.state === "scheduled")
    return `It changed hands before this work was done. ${who} no longer sees this job's visit or gets its reminders: agree with them and the new owner where and when the work is done, then book or move the visit.`;
  return null;
}


/**
 * What the staff claim page says about a claim whose owner no longer holds its piece, if anything. The
 * claim stays with the studio: the former owner reads it as history (lib/claims/view-claim.ts, read
 * only) and the piece's new owner never sees it (lib/claims/visible.ts, lib/files/access.ts).
 */
export function claimHandedOnWords(claim: Pick<Claim, "state" | "ownerId">, piece: { ownerId: string | null }, formerOwnerName: string, hasJob: boolean): string | null {
  if (ownerActsOnJob(claim, piece) || SETTLED_CLAIM_STATES.includes(claim.state)) return null;
  const who = formerOwnerName;
  const reach = `${who} can still read it but can no longer add to it or approve, pay for or book a repair, and the new owner does not see it.`;
  if (OPEN_STATES.includes(claim.state)) {
    const waiting = claim.state === "awaiting_owner" ? ` The answer you asked ${who} for may not come: resume the review without waiting.` : "";
    return `It changed hands while this claim was open. The claim stays with the studio: ${reach}${waiting} Decide it on what you have (declining it, with your reason, closes it), or once the new owner has registered the piece, ask them whether the fault still needs seeing to: they can file a claim of their own.`;
  }
  return `It changed hands after this claim was accepted. ${reach} ${hasJob ? "Its repair job's page says what to do next." : "Once the new owner has registered the piece, they can file a claim of their own for the repair."}`;
}

/**
 * The staff claim page's two notes on a claim whose owner no longer holds its piece: "The piece changed
 * hands" (claimHandedOnWords: why, and what to do next) and, on an accepted claim with no repair job, the
 * "No repair job for this claim" box, which then says only that no job can be opened, so the two don't
 * say the same thing twice. `refusal` is the box's words when a job can't be opened (lib/repairs/jobs.ts
 * handedOnRefusal), shown whole only when there is no note above to say the rest.
 */
export function claimHandedOnNotes(
  claim: Pick<Claim, "state" | "ownerId">,
  piece: { ownerId: string | null },
  formerOwnerName: string,
  hasJob: boolean,
  refusal: string | null,
): { changedHands: string | null; noJob: string | null } {
  const changedHands = claimHandedOnWords(claim, piece, formerOwnerName, hasJob);
  const noJob = claim.state === "accepted" && !hasJob && refusal ? (changedHands ? CLAIM_NO_JOB_WORDS : refusal) : null;
  return { changedHands, noJob };
}

/** The "No repair job for this claim" box under "The piece changed hands" (claimHandedOnNotes). */
export const CLAIM_NO_JOB_WORDS = "A repair job can't be opened from this claim now that its piece has changed hands.";

/** Claims that need nothing more from the studio. */
const SETTLED_CLAIM_STATES: readonly ClaimState[] = ["declined", "closed"];
/** Jobs the release leaves with the studio besides those it set back: a sent quote, and work paid for, covered or booked. */
const OPEN_JOB_STATES: readonly RepairJob["state"][] = ["quoted", "paid", "covered", "scheduled"];

/** One claim, job or visit a release leaves with the studio, written out for the staff mail. */
export type OpenWorkLine = { kind: "Claim" | "Repair job" | "Visit"; title: string; state: string; next: string; path: string };

/**
 * Inside the release's transaction, after jobsBackToStudio (the piece has no owner now): the open work of
 * the former owner's on the piece, in the studio's words with times in its zone. A claim not declined or
 * closed; a job set back (`setBack`), or quoted, paid, covered or booked; and each booked visit of those
 * jobs. Empty when there is none.
 */
export function openWorkAtRelease(tx: Tx, piece: { id: string; studioId: string }, formerOwner: { id: string; name: string }, setBack: readonly string[], timeZone: string): OpenWorkLine[] {
  const handedOn = { ownerId: null };
  const claimRows = tx
    .select()
    .from(claims)
    .where(and(eq(claims.studioId, piece.studioId), eq(claims.pieceId, piece.id), eq(claims.ownerId, formerOwner.id), notInArray(claims.state, [...SETTLED_CLAIM_STATES])))
    .orderBy(asc(claims.createdAt))
    .all();
  const jobRows = tx
    .select()
    .from(repairJobs)
    .where(
      and(
        eq(repairJobs.studioId, piece.studioId),
        eq(repairJobs.pieceId, piece.id),
        eq(repairJobs.ownerId, formerOwner.id),
        or(inArray(repairJobs.state, [...OPEN_JOB_STATES]), setBack.length ? inArray(repairJobs.id, [...setBack]) : undefined),
      ),
    )
    .orderBy(asc(repairJobs.createdAt))
    .all();
  const visitRows = jobRows.length
    ? tx
        .select({ id: visits.id, jobId: visits.jobId, startAt: visits.startAt, endAt: visits.endAt, technician: users.name })
        .from(visits)
        .innerJoin(users, eq(users.id, visits.technicianId))
        .where(and(eq(visits.studioId, piece.studioId), inArray(visits.jobId, jobRows.map((j) => j.id)), eq(visits.state, "booked")))
        .orderBy(asc(visits.startAt))
        .all()
    : [];
  const jobTitle = new Map(jobRows.map((j) => [j.id, j.title]));
  return [
    ...claimRows.map((c) => ({
      kind: "Claim" as const,
      title: CLAIM_CATEGORY_LABELS[c.category],
      state: CLAIM_STATE_LABELS_STAFF[c.state],
      next: claimHandedOnWords(c, handedOn, formerOwner.name, jobRows.some((j) => j.claimId === c.id))!,
      path: `/studio/claims/${c.id}`,
    })),
    ...jobRows.map((j) => ({
      kind: "Repair job" as const,
      title: j.title,
      state: setBack.includes(j.id) ? `${JOB_STATE_LABELS.draft} again (it was ${JOB_STATE_LABELS[AWAITING_PAYMENT].toLowerCase()})` : jobStateLabel(j),
      next: handedOnWords(j, handedOn, formerOwner.name)!,
      path: `/studio/jobs/${j.id}`,
    })),
    ...visitRows.map((v) => ({
      kind: "Visit" as const,
      title: `${jobTitle.get(v.jobId)} with ${v.technician}`,
      state: `Booked for ${formatVisitWhen(v.startAt.getTime(), v.endAt.getTime(), timeZone)}`,
      next: `${formerOwner.name} no longer sees this visit or gets its reminders. Agree with them and the new owner whether it goes ahead, then move or cancel it on the job's page.`,
      path: `/studio/jobs/${v.jobId}`,
    })),
  ];
}
