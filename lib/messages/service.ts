import "server-only";
import { and, asc, desc, eq, exists, inArray, isNotNull, isNull, ne, or, sql, type SQL } from "drizzle-orm";
import type { User } from "lucia";
import { getDb } from "@/db/client";
import { claims, memberships, pieces, repairJobs, studios, threadMessages, threads, unmatchedMail, users, visits, type Thread } from "@/db/schema";
import { recordAudit } from "@/lib/audit";
import { ownerActor } from "@/lib/auth/actor";
import type { StudioContext } from "@/lib/auth/guards";
import { postClaimMessage } from "@/lib/claims/reply";
import { notFound, unprocessable } from "@/lib/errors";
import { ownerJobWhere } from "@/lib/repairs/owner-reach";
import type { InboxQuery, MessageForm, MessageSubject, ThreadUpdate } from "@/lib/validation/messages";
import { mailOwner, mailStudio, type ThreadMailFacts } from "./mail";
import { appendMessage, findThread, ownerMayWrite, subjectOf, threadFor, threadMessagesOf, type MessageView, type SubjectRef } from "./store";
import { threadVisibleTo } from "./access";

// Conversations between a studio and its owners, and the studio's inbox. Owners write on their own
// claims, repair jobs and visits, and only while they hold the piece (a former owner reads their
// history elsewhere but writes no more); staff see and answer their own studio's threads. Anyone
// else gets a 404. Claim threads go through lib/claims (which keeps the claim's state in step).

// ---------------------------------------------------------------- owners

/** A claim, job or visit this owner was found allowed to write about; only `ownerSubject` makes one. */
export type OwnedSubject = SubjectRef & { readonly ownerId: string; readonly __checked: unique symbol };

/** The claim, job or visit, if this owner may write about it now (lib/messages/store: ownerMayWrite); otherwise 404. */
export function ownerSubject(user: Pick<User, "id">, subject: MessageSubject): OwnedSubject {
  const ref: SubjectRef = { kind: subject.about, id: subject.id };
  if (!ownerMayWrite(getDb(), user.id, ref)) throw notFound(`No ${ref.kind === "job" ? "repair job" : ref.kind} of yours with that id.`);
  return { ...ref, ownerId: user.id } as OwnedSubject;
}

function mailFacts(thread: Thread): ThreadMailFacts {
  const db = getDb();
  const studio = db.select({ id: studios.id, name: studios.name, email: studios.email }).from(studios).where(eq(studios.id, thread.studioId)).get()!;
  const piece = db.select({ title: pieces.title }).from(pieces).where(eq(pieces.id, thread.pieceId)).get()!;
  const owner = thread.ownerId ? db.select({ name: users.name, email: users.email }).from(users).where(eq(users.id, thread.ownerId)).get() : undefined;
  const jobId = thread.jobId ?? db.select({ jobId: visits.jobId }).from(visits).where(eq(visits.id, thread.visitId!)).get()!.jobId;
  return { threadId: thread.id, kind: thread.subject === "visit" ? "visit" : "job", jobId, studio, pieceTitle: piece.title, owner: owner ?? { name: "", email: "" } };
}

/** An owner writes to the studio about a claim, repair job or visit of theirs (decided or not), found by `ownerSubject`. */
export async function postOwnerMessage(user: User, ref: OwnedSubject, input: MessageForm): Promise<{ threadId: string; message: MessageView }> {
  if (ref.ownerId !== user.id) throw notFound("No such conversation of yours.");
  if (ref.kind === "claim") {
    const out = await postClaimMessage(ownerActor(user), ref.id, { body: input.body });
    const thread = findThread(getDb(), ref)!;
    return { threadId: thread.id, message: { id: out.message.id, author: "owner", authorName: user.name, source: "web", body: out.message.body, createdAt: out.message.createdAt } };
  }
  const now = new Date();
  const { thread, message } = getDb().transaction((tx) => {
    const thread = threadFor(tx, ref, now);
    const message = appendMessage(tx, thread, { author: "owner", authorId: user.id, body: input.body, now })!;
    recordAudit(tx, { studioId: thread.studioId, actorId: user.id, action: "thread.message", subjectType: ref.kind, subjectId: ref.id, data: { threadId: thread.id, messageId: message.id, fromStudio: false } });
    return { thread, message };
  });
  await mailStudio(mailFacts(thread), input.body);
  return { threadId: thread.id, message: { id: message.id, author: "owner", authorName: user.name, source: "web", body: input.body, createdAt: message.createdAt.toISOString() } };
}

export type OwnerConversation = { threadId: string; about: SubjectRef; title: string; href: string; lastMessageAt: string; messages: MessageView[] };

/** The conversations on one of the owner's jobs, or on every claim and job of a piece they hold. */
export function ownerConversations(user: Pick<User, "id">, where: { pieceId: string } | { jobId: string }): OwnerConversation[] {
  const db = getDb();
  const mine = or(
    exists(db.select({ one: sql`1` }).from(claims).where(and(eq(claims.id, threads.claimId), eq(claims.ownerId, user.id)))),
    exists(db.select({ one: sql`1` }).from(repairJobs).where(and(or(eq(repairJobs.id, threads.jobId), exists(db.select({ one: sql`1` }).from(visits).where(and(eq(visits.id, threads.visitId), eq(visits.jobId, repairJobs.id))))), ownerJobWhere(user.id, "act")))),
  );
  const scope: SQL =
    "pieceId" in where
      ? and(eq(threads.pieceId, where.pieceId), eq(pieces.ownerId, user.id))!
      : or(eq(threads.jobId, where.jobId), inArray(threads.visitId, db.select({ id: visits.id }).from(visits).where(eq(visits.jobId, where.jobId))))!;
  const rows = db
    .select({ thread: threads, claimCategory: claims.category, jobTitle: repairJobs.title, visitJobId: visits.jobId })
    .from(threads)
    .innerJoin(pieces, eq(pieces.id, threads.pieceId))
    .leftJoin(claims, eq(claims.id, threads.claimId))
    .leftJoin(visits, eq(visits.id, threads.visitId))
    .leftJoin(repairJobs, eq(repairJobs.id, sql`coalesce(${threads.jobId}, ${visits.jobId})`))
    .where(and(scope, mine))
    .orderBy(desc(threads.lastMessageAt))
    .all();
  return rows.map(({ thread, jobTitle, visitJobId }) => {
    const about = subjectOf(thread);
    const title = thread.subject === "claim" ? "Your claim" : thread.subject === "job" ? `Repair job: ${jobTitle ?? ""}` : `Visit for ${jobTitle ?? "the repair job"}`;
    const href = thread.subject === "claim" ? `/claims/${thread.claimId}` : `/jobs/${thread.jobId ?? visitJobId}`;
    return { threadId: thread.id, about, title, href, lastMessageAt: thread.lastMessageAt.toISOString(), messages: threadMessagesOf(db, thread.id) };
  });
}

/** What the owner's job page shows: the messages about the job and its visits, and whether they may write. */
export function ownerJobConversation(user: Pick<User, "id">, jobId: string) {
  const messages = ownerConversations(user, { jobId })
    .flatMap((c) => c.messages)
    .sort((a, b) => a.createdAt.localeCompare(b.createdAt));
  return { canWrite: ownerMayWrite(getDb(), user.id, { kind: "job", id: jobId }), messages };
}

// ---------------------------------------------------------------- the studio's inbox

/** One of this studio's threads; another studio's, or none, is a 404. */
export function studioThread(ctx: StudioContext, threadId: string): Thread {
  const thread = getDb().select().from(threads).where(and(eq(threads.id, threadId), threadVisibleTo(ctx))).get();
  if (!thread) throw notFound("No conversation with that id in this studio.");
  return thread;
}

/** Threads with an owner message nobody in the studio has opened yet: the number in the header. */
export function unreadCount(ctx: StudioContext): number {
  return getDb().select({ n: sql<number>`count(*)` }).from(threads).where(and(threadVisibleTo(ctx), eq(threads.state, "unread"))).get()?.n ?? 0;
}

export type InboxRow = {
  id: string;
  state: Thread["state"];
  about: Thread["subject"];
  /** The claim, job or visit it is about. */
  subjectId: string;
  ownerName: string;
  ownerEmail: string;
  pieceId: string;
  pieceTitle: string;
  assignedToId: string | null;
  assignedToName: string | null;
  waitingSince: string | null;
  /** How long the oldest unanswered owner message has waited, in ms (null: nothing waits). */
  waitedMs: number | null;
  lastMessageAt: string;
  preview: string;
};

export type UnmatchedRow = { id: string; reason: (typeof unmatchedMail.$inferSelect)["reason"]; fromEmail: string; subject: string; body: string; receivedAt: string; threadId: string | null };

const lastBody = sql<string>`(select ${threadMessages.body} from ${threadMessages} where ${threadMessages.threadId} = ${threads.id} order by ${threadMessages.createdAt} desc limit 1)`;

/** The inbox: open threads (oldest waiting first), mine, all, done, or the e-mail that matched no thread. */
export function listInbox(ctx: StudioContext, { view }: InboxQuery = { view: "waiting" }, now = Date.now()) {
  const db = getDb();
  const base = { studioId: ctx.studio.id, timeZone: ctx.studio.timeZone, view, unread: unreadCount(ctx), staff: studioStaff(ctx) };
  if (view === "unmatched") {
    const unmatched: UnmatchedRow[] = db
      .select()
      .from(unmatchedMail)
      .where(and(eq(unmatchedMail.studioId, ctx.studio.id), isNull(unmatchedMail.resolvedAt)))
      .orderBy(desc(unmatchedMail.receivedAt))
      .limit(200)
      .all()
      .map((u) => ({ id: u.id, reason: u.reason, fromEmail: u.fromEmail, subject: u.subject, body: u.body, receivedAt: u.receivedAt.toISOString(), threadId: u.threadId }));
    return { ...base, threads: [] as InboxRow[], unmatched };
  }
  const filter =
    view === "done" ? eq(threads.state, "done") : view === "mine" ? and(ne(threads.state, "done"), eq(threads.assignedToId, ctx.user.id)) : view === "all" ? undefined : ne(threads.state, "done");
  const owner = users;
  const rows = db
    .select({ thread: threads, ownerName: owner.name, ownerEmail: owner.email, pieceTitle: pieces.title, preview: lastBody })
    .from(threads)
    .innerJoin(pieces, eq(pieces.id, threads.pieceId))
    .leftJoin(owner, eq(owner.id, threads.ownerId))
    .where(and(threadVisibleTo(ctx), filter, exists(db.select({ one: sql`1` }).from(threadMessages).where(eq(threadMessages.threadId, threads.id)))))
    .orderBy(sql`${threads.waitingSince} IS NULL`, asc(threads.waitingSince), desc(threads.lastMessageAt))
    .limit(200)
    .all();
  const names = new Map(base.staff.map((s) => [s.id, s.name]));
  const out: InboxRow[] = rows.map(({ thread: t, ownerName, ownerEmail, pieceTitle, preview }) => ({
    id: t.id,
    state: t.state,
    about: t.subject,
    subjectId: subjectOf(t).id,
    ownerName: ownerName ?? "Former owner",
    ownerEmail: ownerEmail ?? "",
    pieceId: t.pieceId,
    pieceTitle,
    assignedToId: t.assignedToId,
    assignedToName: t.assignedToId ? (names.get(t.assignedToId) ?? null) : null,
    waitingSince: t.waitingSince?.toISOString() ?? null,
    waitedMs: t.waitingSince ? now - t.waitingSince.getTime() : null,
    lastMessageAt: t.lastMessageAt.toISOString(),
    preview: (preview ?? "").slice(0, 160),
  }));
  return { ...base, threads: out, unmatched: [] as UnmatchedRow[] };
}

/** Who a thread can be assigned to: the studio's admins and staff. */
export function studioStaff(ctx: StudioContext): { id: string; name: string }[] {
  return getDb()
    .select({ id: users.id, name: users.name })
    .from(memberships)
    .innerJoin(users, eq(users.id, memberships.userId))
    .where(and(eq(memberships.studioId, ctx.studio.id), inArray(memberships.role, ["admin", "staff"])))
    .orderBy(asc(users.name))
    .all();
}

/** One thread as staff see it. `markRead`: opening it in the inbox takes it out of unread. */
export function getThread(ctx: StudioContext, threadId: string, { markRead = false }: { markRead?: boolean } = {}) {
  let thread = studioThread(ctx, threadId);
  const db = getDb();
  const wasUnread = thread.state === "unread";
  if (markRead && wasUnread) {
    db.update(threads).set({ state: "open", updatedAt: new Date() }).where(and(eq(threads.id, thread.id), eq(threads.state, "unread"))).run();
    thread = studioThread(ctx, threadId);
  }
  const piece = db.select({ id: pieces.id, title: pieces.title }).from(pieces).where(eq(pieces.id, thread.pieceId)).get()!;
  const owner = thread.ownerId ? db.select({ id: users.id, name: users.name, email: users.email }).from(users).where(eq(users.id, thread.ownerId)).get() : undefined;
  const visitJobId = thread.visitId ? db.select({ jobId: visits.jobId }).from(visits).where(eq(visits.id, thread.visitId)).get()?.jobId : undefined;
  const subjectHref = thread.claimId ? `/studio/claims/${thread.claimId}` : `/studio/jobs/${thread.jobId ?? visitJobId}`;
  return {
    thread: {
      id: thread.id,
      state: thread.state,
      about: thread.subject,
      assignedToId: thread.assignedToId,
      waitingSince: thread.waitingSince?.toISOString() ?? null,
      waitedMs: thread.waitingSince ? Date.now() - thread.waitingSince.getTime() : null,
      lastMessageAt: thread.lastMessageAt.toISOString(),
    },
    piece,
    owner: owner ?? null,
    subjectHref,
    messages: threadMessagesOf(db, thread.id),
    staff: studioStaff(ctx),
    timeZone: ctx.studio.timeZone,
    /** It was unread until this call opened it (the header's count has changed). */
    openedNow: markRead && wasUnread,
  };
}

/** Assign a thread to a staff member (or nobody), mark it done, or open it again. */
export function updateThread(ctx: StudioContext, threadId: string, input: ThreadUpdate) {
  const thread = studioThread(ctx, threadId);
  if (input.assignedToId && !studioStaff(ctx).some((s) => s.id === input.assignedToId)) {
    throw unprocessable("not_staff", "Pick someone on the studio's staff.", { assignedToId: ["Pick someone on the studio's staff."] });
  }
  const now = new Date();
  getDb().transaction((tx) => {
    tx.update(threads)
      .set({
        ...(input.assignedToId !== undefined ? { assignedToId: input.assignedToId } : {}),
        ...(input.state === "done" ? { state: "done" as const, waitingSince: null } : input.state === "open" ? { state: "open" as const } : {}),
        updatedAt: now,
      })
      .where(eq(threads.id, thread.id))
      .run();
    recordAudit(tx, { studioId: ctx.studio.id, actorId: ctx.user.id, action: "thread.updated", subjectType: "thread", subjectId: thread.id, data: { ...input } });
  });
  return getThread(ctx, threadId);
}

/** A staff reply on the same thread; the owner gets it by e-mail with the thread's Reply-To. */
/** A staff reply on a thread found by `studioThread`. */
export async function replyToThread(ctx: StudioContext, thread: Thread, { body }: MessageForm) {
  if (thread.studioId !== ctx.studio.id) throw notFound("No conversation with that id in this studio.");
  if (thread.claimId) {
    await postClaimMessage(ctx, thread.claimId, { body });
    return getThread(ctx, thread.id);
  }
  if (!thread.ownerId) throw unprocessable("no_owner", "This piece has no owner on record any more, so there is nobody to answer.");
  const now = new Date();
  getDb().transaction((tx) => {
    const message = appendMessage(tx, thread, { author: "staff", authorId: ctx.user.id, body, now })!;
    recordAudit(tx, { studioId: ctx.studio.id, actorId: ctx.user.id, action: "thread.message", subjectType: thread.subject, subjectId: subjectOf(thread).id, data: { threadId: thread.id, messageId: message.id, fromStudio: true } });
  });
  await mailOwner(mailFacts(thread), ctx.user.name, body);
  return getThread(ctx, thread.id);
}

/** Staff set aside an unmatched e-mail once they have dealt with it. */
export function resolveUnmatched(ctx: StudioContext, id: string): void {
  const now = new Date();
  const changed = getDb()
    .update(unmatchedMail)
    .set({ resolvedAt: now, resolvedById: ctx.user.id })
    .where(and(eq(unmatchedMail.id, id), eq(unmatchedMail.studioId, ctx.studio.id), isNull(unmatchedMail.resolvedAt)))
    .run().changes;
  if (changed === 0) {
    const exists_ = getDb().select({ id: unmatchedMail.id }).from(unmatchedMail).where(and(eq(unmatchedMail.id, id), eq(unmatchedMail.studioId, ctx.studio.id), isNotNull(unmatchedMail.resolvedAt))).get();
    if (!exists_) throw notFound("No such e-mail in this studio's inbox.");
  }
}
