// Phone numbers: read with the studio's country (a number typed with +country code is read as
// typed), stored as E.164, shown in the studio's national format, or internationally when the number
// belongs to another country. libphonenumber-js carries the numbering plans.
import { parsePhoneNumberFromString, type CountryCode } from "libphonenumber-js";
import { badRequest } from "@/lib/errors";

const UNREADABLE = "That isn't a phone number we can read. Check the digits, or start with + and the country code.";

/** E.164 ("+14155550132") for a typed number, null for an empty one; a 400 with a phone field error otherwise. */
export function toE164(typed: string, country: string): string | null {
  const s = typed.trim();
  if (!s) return null;
  const parsed = parsePhoneNumberFromString(s, country as CountryCode);
  if (!parsed || !parsed.isPossible()) throw badRequest(UNREADABLE, { phone: [UNREADABLE] });
  return parsed.number;
}

/** How a stored number is shown to the studio: national format for its own country, international otherwise. */
export function displayPhone(e164: string | null, country: string): string {
  if (!e164) return "";
  const parsed = parsePhoneNumberFromString(e164);
  if (!parsed) return e164;
  return parsed.country === country ? parsed.formatNational() : parsed.formatInternational();
}

/** The forms a search text may match a stored number by: its digits, and its E.164 when it reads as a number. */
export function phoneSearchKeys(text: string, country: string): { digits: string; e164: string | null } {
  const digits = text.replace(/\D/g, "");
  const parsed = digits.length >= 6 ? parsePhoneNumberFromString(text, country as CountryCode) : undefined;
  return { digits, e164: parsed?.isPossible() ? parsed.number : null };
}
