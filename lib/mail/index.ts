// The one mail path of the product: every message (verification, reset, invitations, care reminders,
// refresh offers, claim and visit mail) is rendered from a React Email template into an HTML part and
// a plain-text part, and handed to whatever SMTP server SMTP_HOST/SMTP_PORT name (the local sink in
// development and tests, a real relay in production).
//
// sendMail is for mail that must not be lost when SMTP is down for a while: a message SMTP refuses is
// kept, rendered, in mail_queue and tried again by the scheduler (retryQueuedMail) with a back-off,
// and the caller goes on as if it had been sent. sendMailNow throws instead; it is for the senders
// that keep their own ledger and retries (care reminders, visit reminders).
//
// No `import "server-only"` here on purpose: the scheduler (jobs/) runs under tsx outside Next.js,
// where that package throws on import. Nothing in here is safe to bundle for the browser anyway
// (nodemailer needs node:net), so a client import would still fail loudly at build time.
import type { ReactElement } from "react";
import nodemailer, { type Transporter } from "nodemailer";
import type SMTPPool from "nodemailer/lib/smtp-pool";
import { render } from "@react-email/render";
import { and, asc, eq, lte, sql } from "drizzle-orm";
import { getDb, type Db } from "@/db/client";
import { mailQueue, type QueuedAttachment, type QueuedMail } from "@/db/schema";
import { env } from "@/lib/env";
import { withEmailBrand } from "@/emails/components/brand";
import { emailBrandFor, senderNameFor } from "@/lib/studio/mail-brand";

export type MailAttachment = {
  filename: string;
  content: string | Buffer | Uint8Array;
  /** e.g. "text/calendar; charset=utf-8; method=REQUEST" for an .ics invite */
  contentType?: string;
  /** "inline" together with `cid` for images referenced from the HTML */
  contentDisposition?: "attachment" | "inline";
  cid?: string;
};

export type SendMailInput = {
  to: string | string[];
  subject: string;
  /** A React element of one of the templates in emails/, e.g. <VerifyEmail name=… url=… /> */
  email: ReactElement;
  /** Extra headers, e.g. List-Unsubscribe and List-Unsubscribe-Post for marketing-type mail */
  headers?: Record<string, string>;
  attachments?: MailAttachment[];
  replyTo?: string;
  /**
   * The studio the message is sent for (a claim, a visit, a quote, a reminder, an invitation). It
   * travels as the X-Grainward-Studio header, and the development outbox shows a studio's admins only
   * their own studio's mail. Account mail (e-mail confirmation, password reset) belongs to no studio:
   * leave it out, and no outbox shows the message.
   */
  studioId?: string;
};

/** Names the studio a message was sent for; read by the development outbox (lib/mail/outbox.ts). */
export const STUDIO_HEADER = "X-Grainward-Studio";

let transport: Transporter<SMTPPool.SentMessageInfo> | undefined;

// Created at first send, not at import: `env` is parsed once when lib/env is first imported, so a
// test that starts its own sink must set process.env.SMTP_PORT before it imports this module.
function getTransport(): Transporter<SMTPPool.SentMessageInfo> {
  transport ??= nodemailer.createTransport({
    host: env.SMTP_HOST,
    port: env.SMTP_PORT,
    secure: false,
    ignoreTLS: true,
    // Reused connections: a new one per message (greeting, EHLO) cost ~100 ms against the local sink,
    // a pooled one ~5 ms. An idle connection closes after 2 s, so scripts that send exit promptly.
    pool: true,
    maxConnections: 2,
    idleTimeout: 2_000,
  });
  return transport;
}

type Rendered = { to: string[]; subject: string; html: string; text: string; headers?: Record<string, string>; replyTo?: string; attachments?: QueuedAttachment[] };

async function renderMessage(input: SendMailInput): Promise<Rendered> {
  // Mail sent for a studio carries its name, logo and accent (emails/components/layout.tsx).
  const brand = input.studioId ? emailBrandFor(input.studioId) : null;
  const html = await withEmailBrand(brand, () => render(input.email));
  const rendered = (await withEmailBrand(brand, () => render(input.email, { plainText: true }))).trim();
  return {
    to: Array.isArray(input.to) ? input.to : [input.to],
    subject: input.subject,
    html,
    // Every message carries a text part, even if a template were to render no text at all.
    text: rendered.length > 0 ? rendered : input.subject,
    headers: input.studioId ? { ...input.headers, [STUDIO_HEADER]: input.studioId } : input.headers,
    replyTo: input.replyTo,
    attachments: input.attachments?.map((a) => ({
      filename: a.filename,
      contentBase64: Buffer.from(typeof a.content === "string" ? Buffer.from(a.content, "utf8") : a.content).toString("base64"),
      contentType: a.contentType,
      contentDisposition: a.contentDisposition,
      cid: a.cid,
    })),
  };
}

/** MAIL_FROM's address under the studio's sender name for mail sent for a studio (read from its header, so queued mail too). */
function fromFor(m: Rendered): string | { name: string; address: string } {
  const studioId = m.headers?.[STUDIO_HEADER];
  const name = studioId ? senderNameFor(studioId) : null;
  if (!name) return env.MAIL_FROM;
  return { name, address: /<([^>]+)>/.exec(env.MAIL_FROM)?.[1] ?? env.MAIL_FROM };
}

async function deliver(m: Rendered): Promise<string> {
  const info = await getTransport().sendMail({
    from: fromFor(m),
    to: m.to,
    subject: m.subject,
    html: m.html,
    text: m.text,
    headers: m.headers ?? undefined,
    replyTo: m.replyTo ?? undefined,
    attachments: m.attachments?.map((a) => ({
      filename: a.filename,
      content: Buffer.from(a.contentBase64, "base64"),
      contentType: a.contentType,
      contentDisposition: a.contentDisposition,
      cid: a.cid,
    })),
  });
  return info.messageId;
}

/**
 * An address under the reserved top-level domain ".invalid" (RFC 2606, section 2) can receive nothing: a
 * deleted account's (lib/owner/account-delete.ts). Mail to it is dropped here, not handed to SMTP and
 * queued for a day of retries.
 */
const receivesNothing = (address: string) => /\.invalid>?\s*$/i.test(address);

const errorText = (e: unknown) => (e instanceof Error ? e.message : String(e)).slice(0, 500);

/** Renders and hands the message to SMTP; throws when SMTP refuses it. For senders with their own retries. */
export async function sendMailNow(input: SendMailInput): Promise<{ messageId: string }> {
  return { messageId: await deliver(await renderMessage(input)) };
}

/**
 * Renders and hands the message to SMTP. When SMTP refuses it, the rendered message is queued for the
 * scheduler to try again (`queued: true`); it never throws for that, so the change the mail reports
 * stands. A template that fails to render still throws: that is a bug, not an outage. Addresses that
 * receive nothing (a deleted account's) are left out; with none left, nothing is sent or queued.
 */
export async function sendMail(input: SendMailInput): Promise<{ messageId: string | null; queued: boolean }> {
  const to = (Array.isArray(input.to) ? input.to : [input.to]).filter((address) => !receivesNothing(address));
  if (to.length === 0) return { messageId: null, queued: false };
  const m = await renderMessage({ ...input, to });
  try {
    return { messageId: await deliver(m), queued: false };
  } catch (e) {
    const now = Date.now();
    getDb()
      .insert(mailQueue)
      .values({ ...m, headers: m.headers ?? null, replyTo: m.replyTo ?? null, attachments: m.attachments ?? null, status: "waiting", attempts: 1, nextAttemptAt: new Date(now + MAIL_RETRY_BACKOFF_MIN[0]! * 60_000), lastError: `try 1: ${errorText(e)}`, updatedAt: new Date(now) })
      .run();
    console.error(`mail "${m.subject}" to ${m.to.join(", ")} could not be handed to SMTP (${errorText(e)}); queued for another try`);
    return { messageId: null, queued: true };
  }
}

/** Minutes to wait after try 1, 2, …; after the last, the message is given up (about a day in all). */
export const MAIL_RETRY_BACKOFF_MIN = [1, 5, 15, 60, 240, 720] as const;
export const MAIL_MAX_ATTEMPTS = MAIL_RETRY_BACKOFF_MIN.length + 1;
/** A try that started this long ago and never finished (the process died mid-send) is made again. */
const STALE_SENDING_MS = 15 * 60_000;

export type MailRetryReport = { sent: number; failed: number; gaveUp: number; stale: number };

/** The scheduler's retry of queued mail: every message due by `now`, each taken by one process only. */
export async function retryQueuedMail(opts: { now?: Date; db?: Db; limit?: number; signal?: AbortSignal } = {}): Promise<MailRetryReport> {
  const db = opts.db ?? getDb();
  const nowMs = (opts.now ?? new Date()).getTime();
  const report: MailRetryReport = { sent: 0, failed: 0, gaveUp: 0, stale: 0 };
  // A send that was cut off may or may not have gone out; sending it again risks a duplicate, which
  // for these messages (links, receipts, notices) is better than losing one.
  report.stale = db
    .update(mailQueue)
    .set({ status: "waiting", updatedAt: new Date(nowMs), lastError: sql`COALESCE(${mailQueue.lastError} || ' — ', '') || 'a try was cut off; trying again'` })
    .where(and(eq(mailQueue.status, "sending"), lte(mailQueue.updatedAt, new Date(nowMs - STALE_SENDING_MS))))
    .run().changes;
  const due = db
    .select()
    .from(mailQueue)
    .where(and(eq(mailQueue.status, "waiting"), lte(mailQueue.nextAttemptAt, new Date(nowMs))))
    .orderBy(asc(mailQueue.nextAttemptAt))
    .limit(opts.limit ?? 200)
    .all();
  for (const row of due) {
    if (opts.signal?.aborted) break;
    const taken = db
      .update(mailQueue)
      .set({ status: "sending", updatedAt: new Date(nowMs) })
      .where(and(eq(mailQueue.id, row.id), eq(mailQueue.status, "waiting"), eq(mailQueue.attempts, row.attempts)))
      .run().changes;
    if (taken === 0) continue; // another process has it
    const attempt = row.attempts + 1;
    try {
      const messageId = await deliver(fromRow(row));
      db.update(mailQueue).set({ status: "sent", attempts: attempt, messageId, sentAt: new Date(nowMs), nextAttemptAt: null, updatedAt: new Date(nowMs) }).where(eq(mailQueue.id, row.id)).run();
      report.sent++;
    } catch (e) {
      const last = attempt >= MAIL_MAX_ATTEMPTS;
      db.update(mailQueue)
        .set({
          status: last ? "gave_up" : "waiting",
          attempts: attempt,
          nextAttemptAt: last ? null : new Date(nowMs + MAIL_RETRY_BACKOFF_MIN[attempt - 1]! * 60_000),
          lastError: `try ${attempt}: ${errorText(e)}`,
          updatedAt: new Date(nowMs),
        })
        .where(eq(mailQueue.id, row.id))
        .run();
      if (last) {
        report.gaveUp++;
        console.error(`mail "${row.subject}" to ${row.to.join(", ")} given up after ${attempt} tries`);
      } else report.failed++;
    }
  }
  return report;
}

function fromRow(r: QueuedMail): Rendered {
  return { to: r.to, subject: r.subject, html: r.html, text: r.text, headers: r.headers ?? undefined, replyTo: r.replyTo ?? undefined, attachments: r.attachments ?? undefined };
}

/** Drops the transport (next send creates a new one). For tests and clean shutdown of scripts. */
export function closeMailTransport(): void {
  transport?.close();
  transport = undefined;
}
