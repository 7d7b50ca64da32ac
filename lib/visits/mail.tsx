// Visit mail: the confirmation, change and cancellation invites (each with its .ics), the 24 h
// reminder and the report summary. No server-only import: the scheduler sends reminders with it.
import { and, eq } from "drizzle-orm";
import { getDb } from "@/db/client";
import { clients, pieces, repairJobs, studios, users, visits, type Visit } from "@/db/schema";
import { TechnicianVisitEmail } from "@/emails/technician-visit";
import { VisitInviteEmail } from "@/emails/visit-invite";
import { VisitReminderEmail } from "@/emails/visit-reminder";
import { VisitSummaryEmail, type VisitSummaryEmailProps } from "@/emails/visit-summary";
import { localDate } from "@/lib/care/dates";
import { env } from "@/lib/env";
import { sendMail, sendMailNow } from "@/lib/mail";
import { replyToFor } from "@/lib/messages/store";
import { ownerActsOnJob } from "@/lib/repairs/owner-reach";
import { buildInvite, inviteAttachment } from "./ics";
import { formatVisitWhen, formatZone, ownerTimeZone, visitDayWord } from "@/lib/format";

export function loadVisitMailView(visitId: string) {
  const db = getDb();
  const visit = db.select().from(visits).where(eq(visits.id, visitId)).get();
  if (!visit) return null;
  const job = db.select().from(repairJobs).where(eq(repairJobs.id, visit.jobId)).get()!;
  const piece = db.select().from(pieces).where(eq(pieces.id, visit.pieceId)).get()!;
  const studio = db.select().from(studios).where(eq(studios.id, visit.studioId)).get()!;
  const technician = db.select({ name: users.name, email: users.email }).from(users).where(eq(users.id, visit.technicianId)).get()!;
  // Visit mail goes to the job's owner only while they hold the piece (lib/repairs/owner-reach).
  const ownerRow = ownerActsOnJob(job, piece)
    ? db
        .select({ id: users.id, name: users.name, email: users.email, timeZone: users.timeZone, clientZone: clients.timeZone })
        .from(users)
        .leftJoin(clients, and(eq(clients.userId, users.id), eq(clients.studioId, visit.studioId)))
        .where(eq(users.id, job.ownerId!))
        .get()
    : undefined;
  const owner = ownerRow ? { id: ownerRow.id, name: ownerRow.name, email: ownerRow.email, timeZone: ownerTimeZone(ownerRow.timeZone, ownerRow.clientZone, studio.timeZone) } : null;
  return { visit, job, piece, studio, technician, owner };
}
export type VisitMailView = NonNullable<ReturnType<typeof loadVisitMailView>>;

export const jobUrl = (jobId: string) => new URL(`/jobs/${jobId}`, env.APP_URL).href;

function organizerOf(v: VisitMailView) {
  const address = /<([^>]+)>/.exec(env.MAIL_FROM)?.[1] ?? env.MAIL_FROM;
  return { name: v.studio.name, email: v.studio.email || address };
}

/** The .ics for the visit as it now stands (REQUEST) or for its cancellation (CANCEL), for the owner or another attendee. */
export function inviteFor(v: VisitMailView, method: "REQUEST" | "CANCEL", now = new Date(), attendee?: { name: string; email: string }): string {
  const { visit, job, piece, studio, technician, owner } = v;
  return buildInvite({
    method,
    uid: visit.icsUid,
    sequence: visit.sequence,
    startMs: visit.startAt.getTime(),
    endMs: visit.endAt.getTime(),
    summary: `${studio.name}: ${job.title}`,
    description: `Touch-up visit for ${piece.title} with ${technician.name}.\nSee or change it: ${jobUrl(job.id)}`,
    location: visit.location,
    organizer: organizerOf(v),
    attendee: attendee ?? { name: owner?.name ?? "Owner", email: owner?.email ?? organizerOf(v).email },
    now,
  });
}

/**
 * Sends the confirmation, change or cancellation to the job's owner with its invite, and the
 * technician's own copy (see sendTechnicianInvites). `now` is the booking's (or move's,
 * cancellation's) instant: the invite's DTSTAMP and the visit's lastInviteAt, which the 24 h reminder
 * pass compares with the visit's start.
 */
export async function sendVisitInvite(
  visitId: string,
  kind: "booked" | "moved" | "cancelled",
  extra: { previous?: Pick<Visit, "startAt" | "endAt" | "technicianId">; reason?: string } = {},
  nowMs: number = Date.now(),
): Promise<{ sent: boolean }> {
  const v = loadVisitMailView(visitId);
  if (!v) return { sent: false };
  await sendTechnicianInvites(v, kind, extra, new Date(nowMs));
  if (!v.owner) return { sent: false };
  const method = kind === "cancelled" ? "CANCEL" : "REQUEST";
  const now = new Date(nowMs);
  const ics = inviteFor(v, method, now);
  // The owner reads the time, and which day it is, on their own calendar.
  const tz = v.owner.timeZone;
  const when = formatVisitWhen(v.visit.startAt.getTime(), v.visit.endAt.getTime(), tz);
  const subject = kind === "booked" ? `Visit booked: ${when}` : kind === "moved" ? `Visit moved to ${when}` : `Visit cancelled: ${when}`;
  await sendMail({
    studioId: v.studio.id,
    to: v.owner.email,
    // An answer by e-mail lands in the visit's conversation (lib/messages).
    replyTo: replyToFor(getDb(), { kind: "visit", id: v.visit.id }),
    subject,
    email: VisitInviteEmail({
      kind,
      ownerName: v.owner.name,
      studioName: v.studio.name,
      pieceTitle: v.piece.title,
      jobTitle: v.job.title,
      when,
      previousWhen: extra.previous ? formatVisitWhen(extra.previous.startAt.getTime(), extra.previous.endAt.getTime(), tz) : undefined,
      timeZone: formatZone(tz),
      dayWord: kind === "cancelled" ? undefined : visitDayWord(v.visit.startAt.getTime(), nowMs, tz),
      location: v.visit.location,
      technicianName: v.technician.name,
      reason: extra.reason || undefined,
      url: jobUrl(v.job.id),
    }),
    attachments: [inviteAttachment(ics, method)],
  });
  getDb().update(visits).set({ lastInviteAt: now }).where(eq(visits.id, visitId)).run();
  return { sent: true };
}

/**
 * The technician's copy, with an invite that names them as the attendee (same UID and SEQUENCE as the
 * owner's). A visit moved to another technician is a new visit for the new one and a cancellation for
 * the one it was taken from.
 */
async function sendTechnicianInvites(v: VisitMailView, kind: "booked" | "moved" | "cancelled", extra: { previous?: Pick<Visit, "startAt" | "endAt" | "technicianId">; reason?: string }, now: Date) {
  const tz = v.studio.timeZone;
  const when = formatVisitWhen(v.visit.startAt.getTime(), v.visit.endAt.getTime(), tz);
  const previousWhen = extra.previous ? formatVisitWhen(extra.previous.startAt.getTime(), extra.previous.endAt.getTime(), tz) : undefined;
  const dayUrl = (ms: number) => new URL(`/studio/today?date=${localDate(ms, tz)}`, env.APP_URL).href;
  const send = async (to: { name: string; email: string }, k: "booked" | "moved" | "cancelled", props: { previousWhen?: string; reason?: string; dayMs: number }) => {
    const method = k === "cancelled" ? "CANCEL" : "REQUEST";
    const subject = k === "booked" ? `New visit: ${when}` : k === "moved" ? `Visit moved to ${when}` : `Visit off your calendar: ${props.previousWhen ?? when}`;
    await sendMail({
      studioId: v.studio.id,
      to: to.email,
      subject,
      email: TechnicianVisitEmail({
        kind: k,
        technicianName: to.name,
        studioName: v.studio.name,
        ownerName: v.owner?.name ?? "the owner",
        pieceTitle: v.piece.title,
        jobTitle: v.job.title,
        when: k === "cancelled" ? (props.previousWhen ?? when) : when,
        previousWhen: k === "moved" ? props.previousWhen : undefined,
        timeZone: formatZone(tz),
        location: v.visit.location,
        reason: props.reason,
        url: dayUrl(props.dayMs),
      }),
      attachments: [inviteAttachment(inviteFor(v, method, now, to), method)],
    });
  };
  const handedOver = kind === "moved" && extra.previous && extra.previous.technicianId !== v.visit.technicianId;
  if (handedOver) {
    const from = getDb().select({ name: users.name, email: users.email }).from(users).where(eq(users.id, extra.previous!.technicianId)).get();
    if (from) await send(from, "cancelled", { previousWhen, reason: `It has gone to ${v.technician.name}.`, dayMs: extra.previous!.startAt.getTime() });
    await send(v.technician, "booked", { dayMs: v.visit.startAt.getTime() });
    return;
  }
  await send(v.technician, kind, { previousWhen, reason: kind === "cancelled" && extra.reason ? `Reason: ${extra.reason}` : undefined, dayMs: v.visit.startAt.getTime() });
}

/** The reminder: "today", "tomorrow" or the date by the owner's calendar day in their zone at `nowMs`. Throws when SMTP refuses it (the visit reminder ledger retries it). */
export async function sendVisitReminder(v: VisitMailView, nowMs: number): Promise<{ messageId: string }> {
  const tz = v.owner!.timeZone;
  const when = formatVisitWhen(v.visit.startAt.getTime(), v.visit.endAt.getTime(), tz);
  const dayWord = visitDayWord(v.visit.startAt.getTime(), nowMs, tz);
  return sendMailNow({
    studioId: v.studio.id,
    to: v.owner!.email,
    replyTo: replyToFor(getDb(), { kind: "visit", id: v.visit.id }),
    subject: `${dayWord[0]!.toUpperCase()}${dayWord.slice(1)}: your visit, ${when}`,
    email: VisitReminderEmail({
      dayWord,
      ownerName: v.owner!.name,
      studioName: v.studio.name,
      pieceTitle: v.piece.title,
      jobTitle: v.job.title,
      when,
      timeZone: formatZone(tz),
      location: v.visit.location,
      technicianName: v.technician.name,
      url: jobUrl(v.job.id),
    }),
  });
}

export async function sendVisitSummary({ studioId, visitId }: { studioId: string; visitId: string }, to: string, props: VisitSummaryEmailProps) {
  return sendMail({ studioId, to, replyTo: replyToFor(getDb(), { kind: "visit", id: visitId }), subject: `Visit report: ${props.pieceTitle}`, email: VisitSummaryEmail(props) });
}
