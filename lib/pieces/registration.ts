// Registration codes are never stored in plain text: a keyed hash to find a piece by
// its code, and the code sealed with AES-256-GCM so a card can be printed again. A copy of the
// database without APP_SECRET lets nobody register a piece. Used by the seed script too, so no
// server-only import here.
import { decrypt, encrypt, keyedHash } from "@/lib/crypto";
import { generateRegistrationCode, normalizeRegistrationCode } from "@/lib/care/registration-code";

const PURPOSE = "registration-code";

export function registrationCodeHash(normalizedCode: string): string {
  return keyedHash(PURPOSE, normalizedCode);
}

/** A fresh code with its hash and sealed copy, ready for the pieces row. */
export function newRegistrationCode(): { code: string; hash: string; enc: string } {
  const code = generateRegistrationCode();
  return { code, hash: registrationCodeHash(code), enc: encrypt(PURPOSE, code) };
}

export function openRegistrationCode(enc: string): string {
  return decrypt(PURPOSE, enc);
}

/** The lookup hash of whatever a person typed, or null when it is not shaped like a code. */
export function hashTypedCode(input: string): string | null {
  const normalized = normalizeRegistrationCode(input);
  return normalized ? registrationCodeHash(normalized) : null;
}
