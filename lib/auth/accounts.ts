import "server-only";
import { and, eq, gt, isNull } from "drizzle-orm";
import { getDb } from "@/db/client";
import { invitations, memberships, studios, userTokens, users } from "@/db/schema";
import { PasswordResetEmail } from "@/emails/password-reset";
import { StaffInvitationEmail } from "@/emails/staff-invitation";
import { VerifyEmail } from "@/emails/verify-email";
import { recordAudit } from "@/lib/audit";
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
import { consumeAttempt, resetAttempts } from "./rate-limit";
import { endAllSessions } from "./session";

// Account flows. They check, write and mail; the caller starts the session (lib/auth/session.ts),
// so these run the same from a server action and from a test.
const HOUR = 60 * 60 * 1000;
export const RESET_TOKEN_TTL_MS = HOUR;
export const VERIFY_TOKEN_TTL_MS = 48 * HOUR;
export const INVITATION_TTL_MS = 7 * 24 * HOUR;

const link = (path: string) => new URL(path, env.APP_URL).href;

export async function signUp(input: SignUpInput, ip: string) {
  await consumeAttempt([["signUpIp", ip]]);
  const db = getDb();
  const existing = db.select({ id: users.id }).from(users).where(eq(users.email, input.email)).get();
  if (existing) {
    throw badRequest("An account with this e-mail already exists.", {
      email: ["An account with this e-mail already exists — sign in, or reset your password."],
    });
  }
  const user = db
    .insert(users)
    .values({ email: input.email, name: input.name, passwordHash: await hashPassword(input.password) })
    .returning()
    .get();
  await sendVerificationEmail(user.id, input.next);
  return user;
}

/** A wrong password and an unknown e-mail get the same answer, after the same work. */
export async function signIn(input: SignInInput, ip: string) {
  await consumeAttempt([
    ["signInIp", ip],
    ["signInAccount", input.email],
  ]);
  const user = getDb().select().from(users).where(eq(users.email, input.email)).get();
  const ok = user ? await verifyPassword(user.passwordHash, input.password) : await verifyAgainstDummy(input.password);
  if (!user || !ok) throw unauthorized("That e-mail and password don't match an account.");
  await resetAttempts("signInAccount", input.email);
  return user;
}

function issueToken(userId: string, purpose: "verify_email" | "password_reset", ttlMs: number): string {
  const token = randomToken();
  getDb()
    .insert(userTokens)
    .values({ userId, purpose, tokenHash: sha256Hex(token), expiresAt: new Date(Date.now() + ttlMs) })
    .run();
  return token;
}

/** Takes a single-use token: it must exist for this purpose, be unused and unexpired. */
function takeToken(token: string, purpose: "verify_email" | "password_reset"): string | null {
  const db = getDb();
  return db.transaction((tx) => {
    const row = tx
      .update(userTokens)
      .set({ usedAt: new Date() })
      .where(
        and(
          eq(userTokens.tokenHash, sha256Hex(token)),
          eq(userTokens.purpose, purpose),
          isNull(userTokens.usedAt),
          gt(userTokens.expiresAt, new Date()),
        ),
      )
      .returning({ userId: userTokens.userId })
      .get();
    return row?.userId ?? null;
  });
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
  return userId;
}

/** Always answers the same way, whether or not the address has an account. */
export async function requestPasswordReset(input: ForgotPasswordInput, ip: string) {
  await consumeAttempt([
    ["resetIp", ip],
    ["resetAccount", input.email],
  ]);
  const user = getDb().select().from(users).where(eq(users.email, input.email)).get();
  if (!user) return;
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
  const userId = takeToken(input.token, "password_reset");
  if (!userId) {
    throw badRequest("This reset link has expired or was already used. Ask for a new one.", {
      token: ["This reset link has expired or was already used."],
    });
  }
  const passwordHash = await hashPassword(input.password);
  // Following the link proves the address, so it also counts as verified.
  getDb()
    .update(users)
    .set({ passwordHash, emailVerifiedAt: new Date() })
    .where(eq(users.id, userId))
    .run();
  await endAllSessions(userId);
  return userId;
}

/** Changes the password after checking the current one, and ends every session (the caller starts a fresh one). */
export async function changePassword(userId: string, input: ChangePasswordInput, ip: string) {
  await consumeAttempt([["signInAccount", `change:${userId}`], ["signInIp", ip]]);
  const user = getDb().select().from(users).where(eq(users.id, userId)).get();
  if (!user || !(await verifyPassword(user.passwordHash, input.current))) {
    throw badRequest("That isn't your current password.", { current: ["That isn't your current password."] });
  }
  getDb().update(users).set({ passwordHash: await hashPassword(input.password) }).where(eq(users.id, userId)).run();
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
      data: { email: input.email, role: input.role },
    });
    return row;
  });
  await sendMail({
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

/** Accepting creates the account when the invited address has none; the link proves the address. */
export async function acceptInvitation(input: AcceptInvitationInput, signedInUserId: string | null) {
  const found = findOpenInvitation(input.token);
  if (!found) throw notFound("This invitation has expired, was withdrawn, or was already used.");
  const { invitation } = found;
  const db = getDb();
  const existing = db.select().from(users).where(eq(users.email, invitation.email)).get();
  if (existing && existing.id !== signedInUserId) {
    throw badRequest("Sign in as the invited address first, then open the invitation again.");
  }
  const passwordHash = existing ? null : await hashPassword(input.password);
  const userId = db.transaction((tx) => {
    const user =
      existing ??
      tx
        .insert(users)
        .values({ email: invitation.email, name: input.name, passwordHash: passwordHash!, emailVerifiedAt: new Date() })
        .returning()
        .get();
    tx.update(invitations).set({ acceptedAt: new Date() }).where(eq(invitations.id, invitation.id)).run();
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
    return user.id;
  });
  return { userId, newAccount: !existing };
}
