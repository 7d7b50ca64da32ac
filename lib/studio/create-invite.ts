// Operators' invite links for starting a studio when STUDIO_SIGNUP is "invite": an expiry and a
// random nonce, signed with a key derived from APP_SECRET (lib/crypto.ts). A link starts one studio:
// the nonce is kept in that studio's "studio.created" audit row (lib/studio/create.ts checks it).
import { timingSafeEqual } from "node:crypto";
import { randomToken, sign } from "@/lib/crypto";
import { env } from "@/lib/env";

const PURPOSE = "studio-invite";
const DAY_MS = 86_400_000;

/** A token good for `days` days from `now`: "<expiry seconds>.<nonce>.<signature>". */
export function studioInviteToken({ days = 14, now = new Date() }: { days?: number; now?: Date } = {}): string {
  const payload = `${Math.floor((now.getTime() + days * DAY_MS) / 1000)}.${randomToken(12)}`;
  return `${payload}.${sign(PURPOSE, payload)}`;
}

export function studioInviteLink(token: string): string {
  return new URL(`/start?${new URLSearchParams({ invite: token })}`, env.APP_URL).toString();
}

export type InviteCheck = { ok: true; nonce: string; expiresAt: Date } | { ok: false; why: "bad" | "expired" };

/** Whether `token` is one of ours and still in date (not whether it was used: that needs the database). */
export function readStudioInvite(token: string, now: Date = new Date()): InviteCheck {
  const m = /^(\d{1,12})\.([A-Za-z0-9_-]{8,64})\.([A-Za-z0-9_-]{20,100})$/.exec(token.trim());
  if (!m) return { ok: false, why: "bad" };
  const [, expiry, nonce, signature] = m as unknown as [string, string, string, string];
  const want = Buffer.from(sign(PURPOSE, `${expiry}.${nonce}`));
  const got = Buffer.from(signature);
  if (got.length !== want.length || !timingSafeEqual(got, want)) return { ok: false, why: "bad" };
  const expiresAt = new Date(Number(expiry) * 1000);
  if (expiresAt.getTime() <= now.getTime()) return { ok: false, why: "expired" };
  return { ok: true, nonce, expiresAt };
}
