// The one mail path of the product: every message (verification, reset, invitations, care reminders,
// refresh offers, claim and visit mail) goes through sendMail, rendered from a React Email template
// into an HTML part and a plain-text part, and handed to whatever SMTP server SMTP_HOST/SMTP_PORT
// name (the local sink in development and tests, a real relay in production).
//
// No `import "server-only"` here on purpose: the scheduler (jobs/) runs under tsx outside Next.js,
// where that package throws on import. Nothing in here is safe to bundle for the browser anyway
// (nodemailer needs node:net), so a client import would still fail loudly at build time.
import type { ReactElement } from "react";
import nodemailer, { type Transporter } from "nodemailer";
import type SMTPTransport from "nodemailer/lib/smtp-transport";
import { render } from "@react-email/render";
import { env } from "@/lib/env";

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
};

let transport: Transporter<SMTPTransport.SentMessageInfo> | undefined;

// Created at first send, not at import: `env` is parsed once when lib/env is first imported, so a
// test that starts its own sink must set process.env.SMTP_PORT before it imports this module.
function getTransport(): Transporter<SMTPTransport.SentMessageInfo> {
  transport ??= nodemailer.createTransport({
    host: env.SMTP_HOST,
    port: env.SMTP_PORT,
    secure: false,
    ignoreTLS: true,
  });
  return transport;
}

export async function sendMail(input: SendMailInput): Promise<{ messageId: string }> {
  const html = await render(input.email);
  const rendered = (await render(input.email, { plainText: true })).trim();
  // Every message carries a text part, even if a template were to render no text at all.
  const text = rendered.length > 0 ? rendered : input.subject;

  const info = await getTransport().sendMail({
    from: env.MAIL_FROM,
    to: input.to,
    subject: input.subject,
    html,
    text,
    headers: input.headers,
    replyTo: input.replyTo,
    attachments: input.attachments?.map((a) => ({
      filename: a.filename,
      content: a.content instanceof Uint8Array && !Buffer.isBuffer(a.content) ? Buffer.from(a.content) : a.content,
      contentType: a.contentType,
      contentDisposition: a.contentDisposition,
      cid: a.cid,
    })),
  });
  return { messageId: info.messageId };
}

/** Drops the transport (next send creates a new one). For tests and clean shutdown of scripts. */
export function closeMailTransport(): void {
  transport?.close();
  transport = undefined;
}
