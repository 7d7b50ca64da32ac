import "server-only";
import { and, eq, gt, isNull } from "drizzle-orm";
import { getDb, type Db } from "@/db/client";
import { invitations, memberships, studios, userTokens, users } from "@/db/schema";
import { PasswordResetEmail } from "@/emails/password-reset";
import { SignUpAttemptEmail, signUpAttemptSubject } from "@/emails/sign-up-attempt";
import { StaffInvitationEmail } from "@/emails/staff-invitation";
import { VerifyEmail } from "@/emails/verify-email";
import { recordAudit } from "@/lib/audit";
import { linkAccountToClients } from "@/lib/clients/link";
import { randomToken, sha256Hex } from "@/lib/crypto";
import { env } from "@/lib/env";
import { badRequest, conflict, notFound, unauthorized } from "@/lib/errors";
import { sendMail } from "@/lib/mail";
import type {
  AcceptInvitationInput,
  ChangePasswordInput,
  ForgotPasswordInput,
  InviteInput,
  ResetPasswordInput,
  SignInInput,
  SignUpInput,
} from "@/lib/validation/auth";
import type { StudioContext } from "./guards";
import { hashPassword, verifyAgainstDummy, verifyPassword } from "./password";
import { afterAnswer } from "./after-answer";
import { checkSignInAllowed, consumeAttempt, recordSignInFailure, recordSignInSuccess, tryAttempt } from "./rate-limit";
import { endAllSessions } from "./session";

// Account flows. They check, write and mail; the caller starts the session (lib/auth/session.ts),
// so these run the same from a server action and from a test.
const HOUR = 60 * 60 * 1000;
export const RESET_TOKEN_TTL_MS = HOUR;
export const VERIFY_TOKEN_TTL_MS = 48 * HOUR;
export const INVITATION_TTL_MS = 7 * 24 * HOUR;

const link = (path: string) => new URL(path, env.APP_URL).href;

/**
 * Creates the account and mails its confirmation link, or, when the address already has an account,
 * mails its owner instead. The caller's answer is the same either way ("check your inbox"), after the
 * same work: the password is hashed in both cases and the mail goes out after the answer.
 */
export async function signUp(input: SignUpInput, ip: string): Promise<void> {
  await consumeAttempt([["signUpIp", ip]]);
  const passwordHash = await hashPassword(input.password);
  const created = getDb()
    .insert(users)
    .values({ email: input.email, name: input.name, passwordHash })
    .onConflictDoNothing({ target: users.email })
    .returning({ id: users.id })
    .get();
  afterAnswer(() => (created ? sendVerificationEmail(created.id, input.next) : sendSignUpAttemptEmail(input.email, input.next)));
}

async function sendSignUpAttemptEmail(email: string, next?: string) {
  const user = getDb().select().from(users).where(eq(users.email, email)).get();
  if (!user || !(await tryAttempt("signUpNotice", user.email))) return;
  await sendMail({
    to: user.email,
    subject: signUpAttemptSubject,
    email: SignUpAttemptEmail({
      name: user.name,
      signInUrl: link(next ? `/sign-in?${new URLSearchParams({ next })}` : "/sign-in"),
      resetUrl: link("/forgot-password"),
    }),
  });
}

/**
 * A wrong password and an unknown e-mail get the same answer, after the same work. Failures slow the
 * address that made them (lib/auth/rate-limit.ts); they never lock the account's owner out.
 */
export async function signIn(input: SignInInput, ip: string) {
  await checkSignInAllowed(input.email, ip);
  const user = getDb().select().from(users).where(eq(users.email, input.email)).get();
  const ok = user ? await verifyPassword(user.passwordHash, input.password) : await verifyAgainstDummy(input.password);
  if (!user || !ok) {
    await recordSignInFailure(input.email, ip);
    throw unauthorized("That e-mail and password don't match an account.");
  }
  await recordSignInSuccess(input.email, ip);
  return user;
}

export type TokenPurpose = (typeof userTokens.$inferSelect)["purpose"];

/** A fresh single-use link token; only its hash is stored. `newEmail` travels with a change_email token. */
export function issueToken(userId: string, purpose: TokenPurpose, ttlMs: number, { newEmail = null, tx = getDb() }: { newEmail?: string | null; tx?: Pick<Db, "insert"> } = {}): string {
  const token = randomToken();
  tx.insert(userTokens)
    .values({ userId, purpose, newEmail, tokenHash: sha256Hex(token), expiresAt: new Date(Date.now() + ttlMs) })
    .run();
  return token;
}

export const usable = (token: string, purpose: TokenPurpose) =>
  and(eq(userTokens.tokenHash, sha256Hex(token)), eq(userTokens.purpose, purpose), isNull(userTokens.usedAt), gt(userTokens.expiresAt, new Date()));

/** Takes a single-use token: it must exist for this purpose, be unused and unexpired. */
function takeToken(token: string, purpose: TokenPurpose): string | null {
  const row = getDb().update(userTokens).set({ usedAt: new Date() }).where(usable(token, purpose)).returning({ userId: userTokens.userId }).get();
  return row?.userId ?? null;
}

/** Whether a token could be taken now, without taking it: a link's page shows its form or says it has expired. */
export function isTokenUsable(token: string, purpose: TokenPurpose): boolean {
  if (token.length < 10 || token.length > 200) return false;
  return getDb().select({ id: userTokens.id }).from(userTokens).where(usable(token, purpose)).get() !== undefined;
}

/** Every unused link of this purpose the account was sent stops working (marked used). Returns how many. */
export function retireTokens(tx: Pick<Db, "update">, userId: string, purpose: TokenPurpose): number {
  return tx
    .update(userTokens)
    .set({ usedAt: new Date() })
    .where(and(eq(userTokens.userId, userId), eq(userTokens.purpose, purpose), isNull(userTokens.usedAt)))
    .run().changes;
}

/** After a reset or a password change, no reset link sent before it works any more. */
function retireResetLinks(tx: Pick<Db, "update">, userId: string) {
  retireTokens(tx, userId, "password_reset");
}

export async function sendVerificationEmail(userId: string, next?: string) {
  const user = getDb().select().from(users).where(eq(users.id, userId)).get();
  if (!user || user.emailVerifiedAt) return;
  const token = issueToken(user.id, "verify_email", VERIFY_TOKEN_TTL_MS);
  const params = new URLSearchParams({ token });
  if (next) params.set("next", next);
  await sendMail({
    to: user.email,
    subject: "Confirm your e-mail for Grainward",
    email: VerifyEmail({ name: user.name, url: link(`/verify-email?${params}`) }),
  });
}

export function verifyEmail(token: string): string | null {
  const userId = takeToken(token, "verify_email");
  if (!userId) return null;
  getDb().update(users).set({ emailVerifiedAt: new Date() }).where(eq(users.id, userId)).run();
  // Clients of any studio with this (now confirmed) address are linked to the account.
  linkAccountToClients(userId);
  return userId;
}

/**
 * Always answers the same way, whether or not the address has an account, after the same work: the
 * lookup, the link and the mail happen after the answer has gone.
 */
export async function requestPasswordReset(input: ForgotPasswordInput, ip: string): Promise<void> {
  await consumeAttempt([
    ["resetIp", ip],
    ["resetAccount", input.email],
  ]);
  afterAnswer(() => sendPasswordResetEmail(input.email));
}

async function sendPasswordResetEmail(email: string) {
  const user = getDb().select().from(users).where(eq(users.email, email)).get();
  if (!user || user.deletedAt) return;
  const token = issueToken(user.id, "password_reset", RESET_TOKEN_TTL_MS);
  await sendMail({
    to: user.email,
    subject: "Reset your Grainward password",
    email: PasswordResetEmail({
      name: user.name,
      url: link(`/reset-password?token=${encodeURIComponent(token)}`),
      expiresInMinutes: RESET_TOKEN_TTL_MS / 60_000,
    }),
  });
}

export async function resetPassword(input: ResetPasswordInput) {
  const passwordHash = await hashPassword(input.password);
  const userId = getDb().transaction((tx) => {
    const row = tx.update(userTokens).set({ usedAt: new Date() }).where(usable(input.token, "password_reset")).returning({ userId: userTokens.userId }).get();
    if (!row) return null;
    retireResetLinks(tx, row.userId);
    // Following the link proves the address, so it also counts as verified.
    tx.update(users).set({ passwordHash, emailVerifiedAt: new Date() }).where(eq(users.id, row.userId)).run();
    return row.userId;
  });
  if (!userId) {
    throw badRequest("This reset link has expired or was already used. Ask for a new one.", {
      token: ["This reset link has expired or was already used."],
    });
  }
  await endAllSessions(userId);
  return userId;
}

/** Changes the password after checking the current one, and ends every session (the caller starts a fresh one). */
export async function changePassword(userId: string, input: ChangePasswordInput, ip: string) {
  await consumeAttempt([["changePassword", userId], ["signInIp", ip]]);
  const user = getDb().select().from(users).where(eq(users.id, userId)).get();
  if (!user || !(await verifyPassword(user.passwordHash, input.current))) {
    throw badRequest("That isn't your current password.", { current: ["That isn't your current password."] });
  }
  const passwordHash = await hashPassword(input.password);
  getDb().transaction((tx) => {
    tx.update(users).set({ passwordHash }).where(eq(users.id, userId)).run();
    retireResetLinks(tx, userId);
  });
  await endAllSessions(userId);
}

export async function inviteMember(ctx: StudioContext, input: InviteInput) {
  const db = getDb();
  const member = db
    .select({ id: memberships.id })
    .from(memberships)
    .innerJoin(users, eq(users.id, memberships.userId))
    .where(and(eq(memberships.studioId, ctx.studio.id), eq(users.email, input.email)))
    .get();
  if (member) throw conflict("That person is already a member of this studio.");
  const token = randomToken();
  const invitation = db.transaction((tx) => {
    // One waiting invitation per address: a new one (a lost mail sent again, or another role) replaces
    // what was waiting, so the person never holds two links that would make them members in two roles.
    const replaced = tx
      .update(invitations)
      .set({ revokedAt: new Date() })
      .where(and(eq(invitations.studioId, ctx.studio.id), eq(invitations.email, input.email), isNull(invitations.acceptedAt), isNull(invitations.revokedAt), gt(invitations.expiresAt, new Date())))
      .returning({ id: invitations.id, role: invitations.role })
      .all();
    const row = tx
      .insert(invitations)
      .values({
        studioId: ctx.studio.id,
        email: input.email,
        role: input.role,
        tokenHash: sha256Hex(token),
        invitedById: ctx.user.id,
        expiresAt: new Date(Date.now() + INVITATION_TTL_MS),
      })
      .returning()
      .get();
    recordAudit(tx, {
      studioId: ctx.studio.id,
      actorId: ctx.user.id,
      action: "member.invited",
      subjectType: "invitation",
      subjectId: row.id,
      data: { email: input.email, role: input.role, ...(replaced.length ? { replaced: replaced.length } : {}) },
    });
    return { ...row, replaced: replaced.map((r) => r.role) };
  });
  await sendMail({
    studioId: ctx.studio.id,
    to: input.email,
    subject: `${ctx.user.name} invited you to ${ctx.studio.name} on Grainward`,
    email: StaffInvitationEmail({
      studioName: ctx.studio.name,
      role: input.role,
      inviterName: ctx.user.name,
      url: link(`/invite/${encodeURIComponent(token)}`),
      expiresInDays: INVITATION_TTL_MS / (24 * HOUR),
    }),
  });
  return invitation;
}

export function findOpenInvitation(token: string) {
  return (
    getDb()
      .select({ invitation: invitations, studioName: studios.name })
      .from(invitations)
      .innerJoin(studios, eq(studios.id, invitations.studioId))
      .where(
        and(
          eq(invitations.tokenHash, sha256Hex(token)),
          isNull(invitations.acceptedAt),
          isNull(invitations.revokedAt),
          gt(invitations.expiresAt, new Date()),
        ),
      )
      .get() ?? null
  );
}

/**
 * Accepting creates the account when the invited address has none; the link proves the address.
 * The invitation is taken by compare-and-set inside the transaction, so of two accepts at once (or an
 * accept racing a withdrawal) exactly one makes a membership and the other is told it was used.
 */
export async function acceptInvitation(input: AcceptInvitationInput, signedInUserId: string | null) {
  const found = findOpenInvitation(input.token);
  if (!found) throw invitationGone();
  const { invitation } = found;
  const db = getDb();
  const existing = db.select().from(users).where(eq(users.email, invitation.email)).get();
  if (existing && existing.id !== signedInUserId) throw signInFirst();
  const passwordHash = existing ? null : await hashPassword(input.password);
  const result = db.transaction((tx) => {
    const now = new Date();
    const taken = tx
      .update(invitations)
      .set({ acceptedAt: now })
      .where(and(eq(invitations.id, invitation.id), isNull(invitations.acceptedAt), isNull(invitations.revokedAt), gt(invitations.expiresAt, now)))
      .returning({ id: invitations.id })
      .get();
    if (!taken) return null;
    const current = tx.select().from(users).where(eq(users.email, invitation.email)).get();
    // An account for the address appeared since the check above (rolls the transaction back).
    if (current && current.id !== signedInUserId) throw signInFirst();
    const user =
      current ??
      tx
        .insert(users)
        .values({ email: invitation.email, name: input.name, passwordHash: passwordHash!, emailVerifiedAt: now })
        .returning()
        .get();
    tx.insert(memberships)
      .values({ studioId: invitation.studioId, userId: user.id, role: invitation.role })
      .onConflictDoNothing()
      .run();
    recordAudit(tx, {
      studioId: invitation.studioId,
      actorId: user.id,
      action: "member.joined",
      subjectType: "user",
      subjectId: user.id,
      data: { role: invitation.role },
    });
    return { userId: user.id, newAccount: !current };
  });
  if (!result) throw invitationGone();
  return result;
}

const invitationGone = () => notFound("This invitation has expired, was withdrawn, or was already used.");
const signInFirst = () => badRequest("Sign in as the invited address first, then open the invitation again.");
