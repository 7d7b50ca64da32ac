// How the plans settings name a plan's terms for admins: the day its current terms were saved, in the
// studio's zone ("terms as of 3 March 2026", as owners' plans say "price as of …"), never a version number.
import { formatInstant } from "@/lib/format";

/** "terms as of 3 March 2026". */
export const termsAsOf = (savedAt: Date | number, timeZone: string) => `terms as of ${formatInstant(savedAt, timeZone)}`;

/** Said under a plan whose terms replaced earlier ones; nothing for a plan's first terms. */
export const termsChangedNote = (version: number) => (version > 1 ? "These terms replaced earlier ones; plans bought before keep the terms they were bought under." : null);
