// The inbound SMTP listener: owners' e-mailed answers to a thread's mail. Every such mail carries a
// Reply-To unique to its thread (lib/messages/reply-address.ts); the listener takes the reply, checks
// the signed address and that it comes from the thread's owner, keeps only what they wrote (quoted
// text and signatures stripped by email-reply-parser), and adds it to the thread and the studio's
// inbox once per Message-ID. Mail it cannot match is kept in unmatched_mail for the studio's staff,
// never dropped. It speaks plain SMTP; a deployment puts it behind its MX or relay (README).
// No server-only import: it runs as its own process under tsx (lib/mail/inbound-cli.ts).
import { createHash } from "node:crypto";
import type { AddressInfo } from "node:net";
import EmailReplyParser from "email-reply-parser";
import { eq, sql } from "drizzle-orm";
import { simpleParser, type AddressObject, type ParsedMail } from "mailparser";
import { SMTPServer } from "smtp-server";
import { getDb, type Db } from "@/db/client";
import { claims, studios, threads, unmatchedMail, users } from "@/db/schema";
import type { UNMATCHED_REASONS } from "@/lib/care/vocabulary";
import { recordAudit } from "@/lib/audit";
import { ownerAnswered } from "@/lib/claims/owner-answer";
import { env } from "@/lib/env";
import { checkReplyAddress } from "@/lib/messages/reply-address";
import { appendMessage, ownerMayWrite, subjectOf } from "@/lib/messages/store";
import { MAX_MESSAGE_CHARS } from "@/lib/validation/messages";

/** The largest message taken over SMTP (a reply with a few phone photos); larger ones are refused with 552. */
export const MAX_INBOUND_BYTES = 10 * 1024 * 1024;
/** What unmatched mail keeps of a body. */
const MAX_UNMATCHED_CHARS = 20_000;

export type InboundMail = {
  /** Message-ID header; without one, a hash of the message stands in. */
  messageId: string;
  /** Envelope MAIL FROM and the From header's address (either may be the owner's). */
  senders: string[];
  /** Envelope RCPT TO, then the To and Cc headers; each address once (the envelope repeats the To header). */
  recipients: string[];
  subject: string;
  text: string;
  receivedAt: Date;
};

export type InboundOutcome = { kind: "added"; threadId: string; messageId: string } | { kind: "duplicate"; threadId: string } | { kind: "unmatched"; reason: (typeof UNMATCHED_REASONS)[number]; studioId: string | null; duplicate: boolean };

/** What the person wrote above the quoted mail and their signature; cut to the longest message kept. */
export function replyText(text: string): string {
  const stripped = new EmailReplyParser().parseReply(text.replace(/\r\n?/g, "\n")).trim();
  return stripped.length > MAX_MESSAGE_CHARS ? `${stripped.slice(0, MAX_MESSAGE_CHARS - 1)}…` : stripped;
}

const lower = (s: string) => s.trim().toLowerCase();

/** Adds an e-mailed reply to its thread, or keeps it as unmatched mail. Sent twice: added once. */
export function receiveInboundMail(mail: InboundMail, db: Db = getDb()): InboundOutcome {
  const checks = mail.recipients.map((r) => checkReplyAddress(r));
  const check = checks.find((c) => c.kind === "ok") ?? checks.find((c) => c.kind === "bad") ?? { kind: "none" as const };
  const thread = check.kind === "none" ? undefined : db.select().from(threads).where(eq(threads.id, check.threadId)).get();

  const keep = (reason: (typeof UNMATCHED_REASONS)[number], studioId: string | null): InboundOutcome => {
    const inserted = db
      .insert(unmatchedMail)
      .values({
        studioId,
        threadId: thread?.id ?? null,
        reason,
        emailMessageId: mail.messageId,
        fromEmail: mail.senders.find(Boolean) ?? "",
        toEmail: mail.recipients.join(", ").slice(0, 1000),
        subject: mail.subject.slice(0, 500),
        body: mail.text.trim().slice(0, MAX_UNMATCHED_CHARS),
        receivedAt: mail.receivedAt,
      })
      .onConflictDoNothing()
      .run().changes;
    return { kind: "unmatched", reason, studioId, duplicate: inserted === 0 };
  };

  if (check.kind === "none" || !thread) return keep(check.kind === "none" ? "no_token" : "bad_token", thread?.studioId ?? studioByAddress(db, mail.recipients));
  if (check.kind === "bad") return keep("bad_token", thread.studioId);
  const owner = thread.ownerId ? db.select({ id: users.id, email: users.email }).from(users).where(eq(users.id, thread.ownerId)).get() : undefined;
  if (!owner || !mail.senders.some((s) => lower(s) === lower(owner.email))) return keep("wrong_sender", thread.studioId);
  if (!ownerMayWrite(db, owner.id, subjectOf(thread)) || closedClaim(db, thread.claimId)) return keep("closed", thread.studioId);
  const body = replyText(mail.text);
  if (!body) return keep("empty", thread.studioId);
  const added = db.transaction((tx) => {
    const message = appendMessage(tx, thread, { author: "owner", authorId: owner.id, body, source: "email", fromEmail: mail.senders.find((s) => lower(s) === lower(owner.email)), emailMessageId: mail.messageId, now: mail.receivedAt });
    if (!message) return null; // the same mail delivered again: nothing more happens
    // As on the owner's web page (lib/claims/reply.ts postClaimMessage): an answer to a claim waiting on
    // the owner takes it back to the studio's review, recorded the same way.
    const claim = thread.claimId ? tx.select().from(claims).where(eq(claims.id, thread.claimId)).get() : undefined;
    const after = claim ? ownerAnswered(tx, claim) : undefined;
    const moved = claim && after && after.state !== claim.state ? { from: claim.state, to: after.state } : {};
    const ref = subjectOf(thread);
    recordAudit(tx, claim ? { studioId: thread.studioId, actorId: owner.id, action: "claim.message", subjectType: "claim", subjectId: claim.id, data: { messageId: message.id, fromStudio: false, via: "email", ...moved } } : { studioId: thread.studioId, actorId: owner.id, action: "thread.message", subjectType: ref.kind, subjectId: ref.id, data: { threadId: thread.id, messageId: message.id, fromStudio: false, via: "email" } });
    return message;
  });
  return added ? { kind: "added", threadId: thread.id, messageId: added.id } : { kind: "duplicate", threadId: thread.id };
}

function closedClaim(db: Db, claimId: string | null): boolean {
  if (!claimId) return false;
  return db.get<{ state: string }>(sql`select state from claims where id = ${claimId}`)?.state === "closed";
}

/** Mail with no reply address, sent to a studio's own address routed here: that studio keeps it. */
function studioByAddress(db: Db, recipients: string[]): string | null {
  for (const r of recipients) {
    const row = db.select({ id: studios.id }).from(studios).where(eq(sql`lower(${studios.email})`, lower(r))).get();
    if (row) return row.id;
  }
  return null;
}

/** Whether the listener takes mail for this address: any at the reply domain, or a studio's own address. */
export function acceptsRecipient(db: Db, address: string): boolean {
  const domain = address.slice(address.lastIndexOf("@") + 1);
  return lower(domain) === lower(env.INBOUND_MAIL_DOMAIN) || studioByAddress(db, [address]) !== null;
}

function addresses(field: AddressObject | AddressObject[] | undefined): string[] {
  const list = Array.isArray(field) ? field : field ? [field] : [];
  return list.flatMap((a) => a.value.map((v) => v.address ?? "")).filter(Boolean);
}

/** Each address once, in first-seen order and spelling; the same address in other case is the same. */
function onceEach(list: string[]): string[] {
  const seen = new Set<string>();
  return list.filter((a) => !seen.has(lower(a)) && seen.add(lower(a)));
}

export function inboundFromParsed(parsed: ParsedMail, raw: Buffer, envelope: { from: string; to: string[] }, receivedAt = new Date()): InboundMail {
  return {
    messageId: (parsed.messageId ?? `<sha256-${createHash("sha256").update(raw).digest("hex")}@no-message-id>`).slice(0, 500),
    senders: [...addresses(parsed.from), envelope.from].filter(Boolean),
    recipients: onceEach([...envelope.to, ...addresses(parsed.to), ...addresses(parsed.cc)]),
    subject: parsed.subject ?? "",
    text: parsed.text ?? "",
    receivedAt,
  };
}

export type InboundListener = { host: string; port: number; close(): Promise<void> };

export async function startInboundListener({ host = "127.0.0.1", port = 0, db }: { host?: string; port?: number; db?: Db } = {}): Promise<InboundListener> {
  const server = new SMTPServer({
    authOptional: true,
    disabledCommands: ["STARTTLS", "AUTH"],
    size: MAX_INBOUND_BYTES,
    logger: false,
    banner: "Grainward inbound mail",
    closeTimeout: 2_000,
    // Only mail for us: the reply domain, or a studio's own address routed here. Anything else is
    // refused while the sender is still connected (they get a bounce; nothing is taken and lost).
    onRcptTo(address, _session, callback) {
      if (acceptsRecipient(db ?? getDb(), address.address)) return callback();
      callback(Object.assign(new Error("No such recipient here"), { responseCode: 550 }));
    },
    onData(stream, session, callback) {
      const chunks: Buffer[] = [];
      stream.on("data", (chunk: Buffer) => chunks.push(chunk));
      stream.on("error", (err) => callback(err));
      stream.on("end", () => {
        if (stream.sizeExceeded) return callback(Object.assign(new Error(`Message too large: we take up to ${MAX_INBOUND_BYTES / 1024 / 1024} MB`), { responseCode: 552 }));
        const raw = Buffer.concat(chunks);
        const envelope = {
          from: session.envelope.mailFrom ? session.envelope.mailFrom.address : "",
          to: session.envelope.rcptTo.map((r) => r.address),
        };
        simpleParser(raw)
          .then((parsed) => {
            const outcome = receiveInboundMail(inboundFromParsed(parsed, raw, envelope), db ?? getDb());
            if (outcome.kind === "unmatched" && !outcome.duplicate) console.warn(`inbound: kept unmatched mail from ${envelope.from || "?"} (${outcome.reason})`);
            callback();
          })
          .catch((err: unknown) => {
            console.error("inbound: could not take a message", err);
            // A temporary failure: the sending server keeps the message and tries again.
            callback(Object.assign(new Error("Could not take the message now; try again later"), { responseCode: 451 }));
          });
      });
    },
  });
  await new Promise<void>((resolve, reject) => {
    server.once("error", reject);
    server.listen(port, host, () => {
      server.off("error", reject);
      resolve();
    });
  });
  server.on("error", (err) => console.error("inbound: SMTP error", err));
  const actual = (server.server.address() as AddressInfo).port;
  return { host, port: actual, close: () => new Promise<void>((resolve) => server.close(() => resolve())) };
}
