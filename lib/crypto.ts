import { createCipheriv, createDecipheriv, createHash, createHmac, hkdfSync, randomBytes } from "node:crypto";
import { env } from "@/lib/env";

// Keys are derived from APP_SECRET per purpose, so one leaked derived key exposes one use only.
function key(purpose: string): Buffer {
  return Buffer.from(hkdfSync("sha256", env.APP_SECRET, "grainward", purpose, 32));
}

/** A random URL-safe token with 160 bits of entropy (for e-mail links, sessions, invitations). */
export function randomToken(bytes = 20): string {
  return randomBytes(bytes).toString("base64url");
}

export function sha256Hex(value: string): string {
  return createHash("sha256").update(value).digest("hex");
}

/** Keyed hash for lookups of secrets a database copy must not reveal (registration codes). */
export function keyedHash(purpose: string, value: string): string {
  return createHmac("sha256", key(`hmac:${purpose}`)).update(value).digest("hex");
}

/** AES-256-GCM; output is base64url of iv | tag | ciphertext. */
export function encrypt(purpose: string, plaintext: string): string {
  const iv = randomBytes(12);
  const cipher = createCipheriv("aes-256-gcm", key(`aes:${purpose}`), iv);
  const body = Buffer.concat([cipher.update(plaintext, "utf8"), cipher.final()]);
  return Buffer.concat([iv, cipher.getAuthTag(), body]).toString("base64url");
}

export function decrypt(purpose: string, sealed: string): string {
  const buf = Buffer.from(sealed, "base64url");
  const decipher = createDecipheriv("aes-256-gcm", key(`aes:${purpose}`), buf.subarray(0, 12));
  decipher.setAuthTag(buf.subarray(12, 28));
  return Buffer.concat([decipher.update(buf.subarray(28)), decipher.final()]).toString("utf8");
}

/** An HMAC signature for opaque tokens in links (unsubscribe and the like). */
export function sign(purpose: string, payload: string): string {
  return createHmac("sha256", key(`sign:${purpose}`)).update(payload).digest("base64url");
}
