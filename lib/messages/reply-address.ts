// The Reply-To of every mail to an owner about a thread: reply+<thread>.<signature>@INBOUND_MAIL_DOMAIN.
// The signature is an HMAC keyed from APP_SECRET, so an address cannot be made up for another thread;
// all lower-case hex, because mail systems may change the case of a local part. 6 + 32 + 1 + 20 = 59
// characters, inside the 64 a local part may have (RFC 5321 §4.5.3.1.1).
// No server-only import: the inbound listener runs under tsx, outside Next.js.
import { timingSafeEqual } from "node:crypto";
import { keyedHash } from "@/lib/crypto";
import { env } from "@/lib/env";

const PREFIX = "reply+";
const SIG_CHARS = 20; // 80 bits
const ADDRESS = /^reply\+([0-9a-f]{32})\.([0-9a-f]+)@(.+)$/i;

const compact = (threadId: string) => threadId.replace(/-/g, "").toLowerCase();
const signature = (hex: string) => keyedHash("thread-reply-to", hex).slice(0, SIG_CHARS);
const uuidOf = (hex: string) => `${hex.slice(0, 8)}-${hex.slice(8, 12)}-${hex.slice(12, 16)}-${hex.slice(16, 20)}-${hex.slice(20)}`;

export function replyAddress(threadId: string): string {
  const hex = compact(threadId);
  return `${PREFIX}${hex}.${signature(hex)}@${env.INBOUND_MAIL_DOMAIN}`;
}

export type ReplyAddressCheck =
  /** Not one of our reply addresses at all. */
  | { kind: "none" }
  /** Shaped like one, but the signature does not match (threadId: the thread it names, unverified). */
  | { kind: "bad"; threadId: string }
  | { kind: "ok"; threadId: string };

export function checkReplyAddress(address: string): ReplyAddressCheck {
  const m = ADDRESS.exec(address.trim());
  if (!m || m[3]!.toLowerCase() !== env.INBOUND_MAIL_DOMAIN.toLowerCase()) return { kind: "none" };
  const hex = m[1]!.toLowerCase();
  const given = Buffer.from(m[2]!.toLowerCase());
  const expected = Buffer.from(signature(hex));
  const ok = given.length === expected.length && timingSafeEqual(given, expected);
  return { kind: ok ? "ok" : "bad", threadId: uuidOf(hex) };
}
