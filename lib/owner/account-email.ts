import "server-only";
import { and, desc, eq, gt, isNull, ne, sql } from "drizzle-orm";
import type { User } from "lucia";
import { getDb } from "@/db/client";
import { clients, userTokens, users } from "@/db/schema";
import { EmailChangeConfirmEmail, emailChangeConfirmSubject } from "@/emails/email-change-confirm";
import { EmailChangeNoticeEmail, emailChangeNoticeSubject } from "@/emails/email-change-notice";
import { EmailChangeTakenEmail, emailChangeTakenSubject } from "@/emails/email-change-taken";
import { recordAudit } from "@/lib/audit";
import { issueToken, retireTokens, usable } from "@/lib/auth/accounts";
import { afterAnswer } from "@/lib/auth/after-answer";
import { verifyPassword } from "@/lib/auth/password";
import { consumeAttempt, tryAttempt } from "@/lib/auth/rate-limit";
import { endAllSessions } from "@/lib/auth/session";
import { linkAccountToClients } from "@/lib/clients/link";
import { sha256Hex } from "@/lib/crypto";
import { env } from "@/lib/env";
import { badRequest, unauthorized } from "@/lib/errors";
import { sendMail } from "@/lib/mail";
import { mailAfterCommit } from "@/lib/mail/after-commit";
import type { ChangeEmailValues } from "@/lib/validation/account";

// Moving an owner's account to another e-mail address. The owner asks with their current password; a
// single-use link goes to the new address (a change_email token carrying it, stored hashed like every
// mailed token, lib/auth/accounts.ts) and a notice to the old one. The address changes only when that
// link is opened by the same account, signed in. Rules:
// - An address another account uses is answered exactly like a free one ("we sent a link"): the new
//   address gets a notice instead of a link, so the asker never learns whether it has an account.
// - A new request replaces the waiting one (its link stops working); the link works for 24 hours.
// - When the change is made, every session ends (the confirming browser gets a fresh one), links sent
//   to the old address (password reset, verification) stop working, and the studio client records
//   linked to the account that carried the old address carry the new one.
// - Replies by e-mail are matched to their thread by the signed reply address and to the owner by the
//   account's address (lib/mail/inbound.ts): from the change on, the new address; mail from the old one
//   is kept for the studio as unmatched mail, never dropped.

const HOUR = 60 * 60 * 1000;
export const EMAIL_CHANGE_TTL_MS = 24 * HOUR;

const link = (path: string) => new URL(path, env.APP_URL).href;
const wrongPassword = () => badRequest("That isn't your current password.", { current: ["That isn't your current password."] });

/** Checks the signed-in person's current password (rate-limited like a password change); returns their row. */
export async function checkCurrentPassword(userId: string, password: string, ip: string) {
  await consumeAttempt([["changePassword", userId], ["signInIp", ip]]);
  const user = getDb().select().from(users).where(eq(users.id, userId)).get();
  if (!user || user.deletedAt) throw unauthorized();
  if (!(await verifyPassword(user.passwordHash, password))) throw wrongPassword();
  return user;
}

export type PendingEmailChange = { newEmail: string; requestedAt: number; expiresAt: number };

/** The change waiting for its link, if any (the newest; a new request retires the ones before it). */
export function pendingEmailChange(user: Pick<User, "id">, now = new Date()): PendingEmailChange | null {
  const row = getDb()
    .select({ newEmail: userTokens.newEmail, createdAt: userTokens.createdAt, expiresAt: userTokens.expiresAt })
    .from(userTokens)
    .where(and(eq(userTokens.userId, user.id), eq(userTokens.purpose, "change_email"), isNull(userTokens.usedAt), gt(userTokens.expiresAt, now)))
    .orderBy(desc(userTokens.createdAt))
    .get();
  return row?.newEmail ? { newEmail: row.newEmail, requestedAt: row.createdAt.getTime(), expiresAt: row.expiresAt.getTime() } : null;
}

/**
 * Asks for the move to `input.email`. The answer is the same whether or not another account uses that
 * address, after the same work; the mails go after the answer.
 */
export async function requestEmailChange(user: Pick<User, "id">, input: ChangeEmailValues, ip: string): Promise<PendingEmailChange> {
  const row = await checkCurrentPassword(user.id, input.current, ip);
  if (input.email === row.email) throw badRequest("That is already your address.", { email: ["That is already your address."] });
  const now = new Date();
  const token = getDb().transaction((tx) => {
    const replaced = retireTokens(tx, user.id, "change_email");
    const t = issueToken(user.id, "change_email", EMAIL_CHANGE_TTL_MS, { newEmail: input.email, tx });
    // No addresses in the audit row: it outlives a deleted account (lib/owner/account-delete.ts).
    recordAudit(tx, { studioId: null, actorId: user.id, action: "account.email_change_asked", subjectType: "user", subjectId: user.id, data: replaced ? { replaced } : {} });
    return t;
  });
  afterAnswer(() => mailEmailChangeAsked(user.id, input.email, token));
  return { newEmail: input.email, requestedAt: now.getTime(), expiresAt: now.getTime() + EMAIL_CHANGE_TTL_MS };
}

async function mailEmailChangeAsked(userId: string, newEmail: string, token: string) {
  const db = getDb();
  const user = db.select().from(users).where(eq(users.id, userId)).get();
  if (!user) return;
  const holder = db.select({ name: users.name }).from(users).where(and(eq(users.email, newEmail), ne(users.id, userId))).get();
  if (holder) {
    // One notice a window per address, as for sign-ups with an address in use.
    if (await tryAttempt("signUpNotice", newEmail)) {
      await sendMail({ to: newEmail, subject: emailChangeTakenSubject, email: EmailChangeTakenEmail({ name: holder.name }) });
    }
  } else {
    await sendMail({
      to: newEmail,
      subject: emailChangeConfirmSubject,
      email: EmailChangeConfirmEmail({ name: user.name, newEmail, url: link(`/account/email/confirm?token=${encodeURIComponent(token)}`), expiresInHours: EMAIL_CHANGE_TTL_MS / HOUR }),
    });
  }
  await sendMail({
    to: user.email,
    subject: emailChangeNoticeSubject("asked"),
    email: EmailChangeNoticeEmail({ name: user.name, newEmail, stage: "asked", accountUrl: link("/account/email") }),
  });
}

/** Whose change link this is, without taking it: the confirmation page says which address, or why not. */
export function emailChangeLink(token: string): { userId: string; newEmail: string } | null {
  if (token.length < 10 || token.length > 200) return null;
  const row = getDb().select({ userId: userTokens.userId, newEmail: userTokens.newEmail }).from(userTokens).where(usable(token, "change_email")).get();
  return row?.newEmail ? { userId: row.userId, newEmail: row.newEmail } : null;
}

export type EmailChangeOutcome = { kind: "changed"; newEmail: string } | { kind: "gone" } | { kind: "taken" };

/**
 * Takes the link for the signed-in account (another account's link is "gone" for them and stays
 * usable for its owner) and moves the account to the new address. Ends every session of the account;
 * the caller starts a fresh one for this browser.
 */
export async function confirmEmailChange(user: Pick<User, "id">, token: string, now = new Date()): Promise<EmailChangeOutcome> {
  const db = getDb();
  const result = db.transaction((tx): (EmailChangeOutcome & { oldEmail?: string; name?: string }) => {
    const taken = tx
      .update(userTokens)
      .set({ usedAt: now })
      .where(and(eq(userTokens.tokenHash, sha256Hex(token)), eq(userTokens.userId, user.id), eq(userTokens.purpose, "change_email"), isNull(userTokens.usedAt), gt(userTokens.expiresAt, now)))
      .returning({ newEmail: userTokens.newEmail })
      .get();
    const current = tx.select().from(users).where(eq(users.id, user.id)).get();
    if (!taken?.newEmail || !current || current.deletedAt) return { kind: "gone" };
    const newEmail = taken.newEmail;
    // Another account took the address after the link was sent: the link is spent, nothing changes.
    if (tx.select({ id: users.id }).from(users).where(and(eq(users.email, newEmail), ne(users.id, user.id))).get()) return { kind: "taken" };
    tx.update(users).set({ email: newEmail, emailVerifiedAt: now }).where(eq(users.id, user.id)).run();
    // The studios' client records linked to this account that carried the old address carry the new
    // one, unless that studio already has another client with it (its unique address per studio).
    tx.update(clients)
      .set({ email: newEmail, updatedAt: now })
      .where(
        and(
          eq(clients.userId, user.id),
          eq(clients.email, current.email),
          sql`NOT EXISTS (SELECT 1 FROM clients o WHERE o.studio_id = ${clients.studioId} AND o.email = ${newEmail})`,
        ),
      )
      .run();
    // Links mailed to the old address stop working; so does any other waiting change.
    for (const purpose of ["change_email", "password_reset", "verify_email"] as const) retireTokens(tx, user.id, purpose);
    // Clients with the new (now confirmed) address in studios where the account has none are linked, as at sign-up.
    linkAccountToClients(user.id, tx);
    recordAudit(tx, { studioId: null, actorId: user.id, action: "account.email_changed", subjectType: "user", subjectId: user.id, data: {} });
    return { kind: "changed", newEmail, oldEmail: current.email, name: current.name };
  });
  if (result.kind !== "changed") return result;
  await endAllSessions(user.id);
  await mailAfterCommit("e-mail address changed", () =>
    sendMail({
      to: result.oldEmail!,
      subject: emailChangeNoticeSubject("done"),
      email: EmailChangeNoticeEmail({ name: result.name!, newEmail: result.newEmail, stage: "done", accountUrl: link("/account/email") }),
    }),
  );
  return { kind: "changed", newEmail: result.newEmail };
}

/** Cancels the waiting change, if any: its link stops working. */
export function cancelEmailChange(user: Pick<User, "id">): { cancelled: boolean } {
  const cancelled = getDb().transaction((tx) => {
    const n = retireTokens(tx, user.id, "change_email");
    if (n) recordAudit(tx, { studioId: null, actorId: user.id, action: "account.email_change_cancelled", subjectType: "user", subjectId: user.id, data: {} });
    return n > 0;
  });
  return { cancelled };
}
