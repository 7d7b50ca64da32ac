// Registration codes in Douglas Crockford's Base 32 (crockford.com/base32.html): alphabet without I, L, O, U;
// decoding ignores case and hyphens and reads I and L as 1, O as 0; the check symbol is the value mod 37,
// using the five extra symbols * ~ $ = U for 32–36.
import { CareInputError } from "./errors";

export const CROCKFORD_ALPHABET = "0123456789ABCDEFGHJKMNPQRSTVWXYZ";
/** Check symbols for values 0–36: the alphabet plus * ~ $ = U (Crockford, "Base 32"). */
export const CROCKFORD_CHECK_ALPHABET = CROCKFORD_ALPHABET + "*~$=U";

export const REGISTRATION_CODE_SYMBOLS = 12; // 60 bits
const CODE_BITS = 60n;

function symbolValue(ch: string): number {
  const c = ch.toUpperCase();
  if (c === "I" || c === "L") return 1;
  if (c === "O") return 0;
  return CROCKFORD_ALPHABET.indexOf(c);
}

/** A non-negative integer as Crockford Base32 symbols, optionally with its check symbol appended. */
export function encodeCrockford(value: bigint | number, options: { check?: boolean; minLength?: number } = {}): string {
  let n = typeof value === "bigint" ? value : BigInt(value);
  if (typeof value === "number" && !Number.isSafeInteger(value)) throw new CareInputError(`value must be a safe integer, got ${value}`, "value");
  if (n < 0n) throw new CareInputError("value must not be negative", "value");
  const v = n;
  let out = "";
  do {
    out = CROCKFORD_ALPHABET[Number(n & 31n)]! + out;
    n >>= 5n;
  } while (n > 0n);
  if (options.minLength) out = out.padStart(options.minLength, "0");
  return options.check ? out + checkSymbol(v) : out;
}

export function checkSymbol(value: bigint): string {
  return CROCKFORD_CHECK_ALPHABET[Number(value % 37n)]!;
}

/**
 * Decodes Crockford Base32 (hyphens ignored, case-insensitive, I/L → 1, O → 0). With `check: true` the
 * last symbol is a check symbol and must match, else a CareInputError.
 */
export function decodeCrockford(input: string, options: { check?: boolean } = {}): bigint {
  const s = String(input).replace(/-/g, "");
  const body = options.check ? s.slice(0, -1) : s;
  if (body.length === 0) throw new CareInputError("nothing to decode", "input");
  let n = 0n;
  for (const ch of body) {
    const v = symbolValue(ch);
    if (v < 0) throw new CareInputError(`${JSON.stringify(ch)} is not a Crockford Base32 symbol`, "input");
    n = (n << 5n) | BigInt(v);
  }
  if (options.check) {
    const c = s.slice(-1).toUpperCase();
    const expected = checkSymbol(n);
    const given = c === "I" || c === "L" ? "1" : c === "O" ? "0" : c;
    if (given !== expected) throw new CareInputError(`check symbol ${JSON.stringify(c)} does not match (expected ${expected})`, "input");
  }
  return n;
}

function randomBits60(): bigint {
  const bytes = new Uint8Array(8);
  globalThis.crypto.getRandomValues(bytes);
  let n = 0n;
  for (const b of bytes) n = (n << 8n) | BigInt(b);
  return n & ((1n << CODE_BITS) - 1n);
}

function format(symbols13: string): string {
  return `${symbols13.slice(0, 4)}-${symbols13.slice(4, 8)}-${symbols13.slice(8, 12)}-${symbols13.slice(12)}`;
}

/** 60 random bits as 12 Crockford symbols plus the mod-37 check symbol, shown XXXX-XXXX-XXXX-C. */
export function generateRegistrationCode(): string {
  return format(encodeCrockford(randomBits60(), { check: true, minLength: REGISTRATION_CODE_SYMBOLS }));
}

/**
 * The canonical form XXXX-XXXX-XXXX-C of what a person typed (case, spaces and hyphens ignored; I and L
 * read as 1, O as 0), or null when it is not 13 valid symbols. Does not verify the check symbol.
 */
export function normalizeRegistrationCode(input: string): string | null {
  if (typeof input !== "string") return null;
  const s = input.replace(/[\s-]+/g, "").toUpperCase().replace(/[IL]/g, "1").replace(/O/g, "0");
  if (s.length !== REGISTRATION_CODE_SYMBOLS + 1) return null;
  for (let i = 0; i < REGISTRATION_CODE_SYMBOLS; i++) if (!CROCKFORD_ALPHABET.includes(s[i]!)) return null;
  if (!CROCKFORD_CHECK_ALPHABET.includes(s[REGISTRATION_CODE_SYMBOLS]!)) return null;
  return format(s);
}

/** True when the input normalizes to 13 symbols whose last is the check symbol of the first 12. */
export function isValidRegistrationCode(input: string): boolean {
  const n = normalizeRegistrationCode(input);
  if (!n) return false;
  const s = n.replace(/-/g, "");
  return checkSymbol(decodeCrockford(s.slice(0, REGISTRATION_CODE_SYMBOLS))) === s[REGISTRATION_CODE_SYMBOLS];
}
