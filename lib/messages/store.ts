// Threads and their messages: one thread per claim, repair job or visit, made on its first message.
// Every message is added here, whoever wrote it and however it came (the web or e-mail), together with
// the thread's inbox state in the same transaction:
//   an owner's message → unread, waiting since the oldest unanswered one;
//   a staff message    → nothing waits on the studio any more; unread becomes open.
// No server-only import: the inbound e-mail listener (lib/mail/inbound.ts) runs under tsx.
import { and, asc, eq, ne, or, sql } from "drizzle-orm";
import type { Db } from "@/db/client";
import { claims, pieces, repairJobs, threadMessages, threads, users, visits, type Thread } from "@/db/schema";
import type { THREAD_SUBJECTS } from "@/lib/care/vocabulary";
import { ownerJobWhere } from "@/lib/repairs/owner-reach";
import { replyAddress } from "./reply-address";

export type ThreadSubject = (typeof THREAD_SUBJECTS)[number];
export type SubjectRef = { kind: ThreadSubject; id: string };
type Tx = Pick<Db, "select" | "insert" | "update">;

/** The studio, piece and owner of a claim, job or visit; undefined when there is no such row. */
export function subjectFacts(tx: Tx, ref: SubjectRef): { studioId: string; pieceId: string; ownerId: string | null } | undefined {
  if (ref.kind === "claim") return tx.select({ studioId: claims.studioId, pieceId: claims.pieceId, ownerId: claims.ownerId }).from(claims).where(eq(claims.id, ref.id)).get();
  if (ref.kind === "job") return tx.select({ studioId: repairJobs.studioId, pieceId: repairJobs.pieceId, ownerId: repairJobs.ownerId }).from(repairJobs).where(eq(repairJobs.id, ref.id)).get();
  return tx
    .select({ studioId: visits.studioId, pieceId: visits.pieceId, ownerId: repairJobs.ownerId })
    .from(visits)
    .innerJoin(repairJobs, eq(repairJobs.id, visits.jobId))
    .where(eq(visits.id, ref.id))
    .get();
}

/**
 * Whether this owner may write about the claim, job or visit now: it is theirs and they still hold
 * its piece (after a release or transfer the former owner writes no more), and a job has been shown
 * to them (a draft never sent is not theirs to see).
 */
export function ownerMayWrite(tx: Tx, userId: string, ref: SubjectRef): boolean {
  if (ref.kind === "claim") {
    return !!tx
      .select({ id: claims.id })
      .from(claims)
      .innerJoin(pieces, eq(pieces.id, claims.pieceId))
      .where(and(eq(claims.id, ref.id), eq(claims.ownerId, userId), eq(pieces.ownerId, userId)))
      .get();
  }
  if (ref.kind === "job") {
    return !!tx
      .select({ id: repairJobs.id })
      .from(repairJobs)
      .where(and(eq(repairJobs.id, ref.id), ownerJobWhere(userId, "act"), or(ne(repairJobs.state, "draft"), sql`${repairJobs.quoteVersion} > 0`)))
      .get();
  }
  return !!tx.select({ id: visits.id }).from(visits).innerJoin(repairJobs, eq(repairJobs.id, visits.jobId)).where(and(eq(visits.id, ref.id), ownerJobWhere(userId, "act"))).get();
}

/** What a thread is about. */
export function subjectOf(thread: Pick<Thread, "subject" | "claimId" | "jobId" | "visitId">): SubjectRef {
  return { kind: thread.subject, id: (thread.claimId ?? thread.jobId ?? thread.visitId)! };
}

const subjectColumn = { claim: threads.claimId, job: threads.jobId, visit: threads.visitId } as const;

export function findThread(tx: Tx, ref: SubjectRef): Thread | undefined {
  return tx.select().from(threads).where(eq(subjectColumn[ref.kind], ref.id)).get();
}

/** The subject's thread, made now if it has none. Throws if the subject does not exist (callers check first). */
export function threadFor(tx: Tx, ref: SubjectRef, now: Date): Thread {
  const existing = findThread(tx, ref);
  if (existing) return existing;
  const facts = subjectFacts(tx, ref);
  if (!facts) throw new Error(`threadFor: no ${ref.kind} ${ref.id}`);
  tx.insert(threads)
    .values({
      studioId: facts.studioId,
      subject: ref.kind,
      claimId: ref.kind === "claim" ? ref.id : null,
      jobId: ref.kind === "job" ? ref.id : null,
      visitId: ref.kind === "visit" ? ref.id : null,
      pieceId: facts.pieceId,
      ownerId: facts.ownerId,
      state: "open",
      lastMessageAt: now,
      createdAt: now,
      updatedAt: now,
    })
    .onConflictDoNothing()
    .run();
  return findThread(tx, ref)!;
}

/**
 * The Reply-To for mail to the owner about a claim, job or visit: its thread's own address (the
 * thread is made now if it has no messages yet; the inbox lists only threads with a message).
 */
export function replyToFor(tx: Tx, ref: SubjectRef): string {
  return replyAddress(threadFor(tx, ref, new Date()).id);
}

export type NewMessage = {
  author: "owner" | "staff";
  authorId: string | null;
  body: string;
  source?: "web" | "email";
  fromEmail?: string;
  emailMessageId?: string;
  now: Date;
};

/**
 * Adds a message to a thread and moves the thread's inbox state. With an emailMessageId already on
 * record, nothing is added and null is returned (the same mail delivered twice).
 */
export function appendMessage(tx: Tx, thread: Pick<Thread, "id" | "studioId">, m: NewMessage): { id: string; createdAt: Date } | null {
  const row = tx
    .insert(threadMessages)
    .values({
      studioId: thread.studioId,
      threadId: thread.id,
      author: m.author,
      authorId: m.authorId,
      source: m.source ?? "web",
      fromEmail: m.fromEmail ?? null,
      emailMessageId: m.emailMessageId ?? null,
      body: m.body,
      createdAt: m.now,
    })
    .onConflictDoNothing()
    .returning({ id: threadMessages.id, createdAt: threadMessages.createdAt })
    .get();
  if (!row) return null;
  const fromOwner = m.author === "owner";
  tx.update(threads)
    .set({
      state: fromOwner ? "unread" : sql`CASE WHEN ${threads.state} = 'unread' THEN 'open' ELSE ${threads.state} END`,
      waitingSince: fromOwner ? sql`COALESCE(${threads.waitingSince}, ${m.now.getTime()})` : null,
      lastMessageAt: m.now,
      updatedAt: m.now,
    })
    .where(eq(threads.id, thread.id))
    .run();
  return row;
}

export type MessageView = { id: string; author: "owner" | "staff"; authorName: string; source: "web" | "email"; body: string; createdAt: string };

/** A thread's messages, oldest first. */
export function threadMessagesOf(tx: Tx, threadId: string): MessageView[] {
  return tx
    .select({ id: threadMessages.id, author: threadMessages.author, authorName: users.name, fromEmail: threadMessages.fromEmail, source: threadMessages.source, body: threadMessages.body, createdAt: threadMessages.createdAt })
    .from(threadMessages)
    .leftJoin(users, eq(users.id, threadMessages.authorId))
    .where(eq(threadMessages.threadId, threadId))
    .orderBy(asc(threadMessages.createdAt), asc(threadMessages.id))
    .all()
    .map(({ fromEmail, ...m }) => ({ ...m, authorName: m.authorName ?? fromEmail ?? "", createdAt: m.createdAt.toISOString() }));
}

/** The messages of a subject's thread (none yet: an empty list). */
export function subjectMessages(tx: Tx, ref: SubjectRef): MessageView[] {
  const thread = findThread(tx, ref);
  return thread ? threadMessagesOf(tx, thread.id) : [];
}
