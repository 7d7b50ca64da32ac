// The care engine (lib/care) throws CareInputError when it is handed a value it cannot compute with
// (a date past year 9999, a size of 0). Reaching it is a gap in a zod schema, not a server fault: the
// route() and action() wrappers (lib/http) answer it as a 400 through this one mapping.
import { CareInputError } from "@/lib/care/errors";
import { badRequest, isAppError, type AppError } from "@/lib/errors";

const FIELD_WORDS: Record<string, string> = {
  date: "a date",
  instant: "a date and time",
  months: "a length of time",
  timeZone: "the time zone",
};

/** An AppError as it is; the care engine's input error as a 400 a person can act on; anything else undefined. */
export function asAppError(e: unknown): AppError | undefined {
  if (isAppError(e)) return e;
  if (e instanceof CareInputError) {
    const what = (e.field && FIELD_WORDS[e.field.split(".").pop() ?? ""]) || "a value";
    return badRequest(`We can't work with ${what} that far out. Check the dates and sizes and try again.`, undefined, "out_of_range");
  }
  return undefined;
}
