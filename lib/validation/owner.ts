import { z } from "zod";
import { isValidRegistrationCode, normalizeRegistrationCode } from "@/lib/care/registration-code";
import { CARE_TASK_KINDS, SURFACES, UNIT_SYSTEMS } from "@/lib/care/vocabulary";
import { pastDate } from "./dates";
import { patchOf } from "./patch";
import { isTimeZone } from "@/lib/format";

// The owner's side: shared by the forms (react-hook-form's zod resolver), the server actions and the
// route handlers, so a form and its API answer with the same words.

export const CODE_TYPO_MESSAGE = "That code has a typo — check the card.";
export const CODE_SHAPE_MESSAGE =
  "A registration code has 13 symbols, like 7K3M-Q9XD-2HRT-P. Check the card in the piece's drawer.";

/**
 * A registration code as typed: case, spaces and hyphens ignored, I/L read as 1 and O as 0
 * (Crockford). The check symbol is verified here, before anything looks the code up.
 */
export const registrationCodeField = z
  .string({ message: "Type the code from the card." })
  .trim()
  .min(1, "Type the code from the card.")
  .max(40, CODE_SHAPE_MESSAGE)
  .superRefine((value, ctx) => {
    if (!normalizeRegistrationCode(value)) ctx.addIssue({ code: "custom", message: CODE_SHAPE_MESSAGE });
    else if (!isValidRegistrationCode(value)) ctx.addIssue({ code: "custom", message: CODE_TYPO_MESSAGE });
  })
  .transform((value) => normalizeRegistrationCode(value)!);

export const registrationSchema = z.object({ code: registrationCodeField });
export type RegistrationInput = z.input<typeof registrationSchema>;
export type RegistrationValues = z.output<typeof registrationSchema>;


/** "top" and "base" for a surface's task, "whole_piece" (stored as no surface) for the annual check. */
export const CARE_LOG_SURFACES = [...SURFACES, "whole_piece"] as const;

export const careLogSchema = z.object({
  taskKind: z.enum(CARE_TASK_KINDS, { message: "Pick what you did." }),
  surface: z.enum(CARE_LOG_SURFACES, { message: "Pick the part of the piece." }),
  doneOn: pastDate("Pick the date you did it."),
  notes: z.string().trim().max(1000, "Keep it under 1,000 characters.").default(""),
  productUsed: z.string().trim().max(200, "Keep it under 200 characters.").default(""),
});
export type CareLogInput = z.input<typeof careLogSchema>;
export type CareLogValues = z.output<typeof careLogSchema>;

export const careLogPatchSchema = patchOf(careLogSchema).refine((v) => Object.keys(v).length > 0, "Nothing to change.");
export type CareLogPatch = z.output<typeof careLogPatchSchema>;

export const preferencesSchema = z.object({
  remindersEnabled: z.boolean({ message: "Choose whether to get care reminders." }),
  timeZone: z.string().trim().min(1, "Pick your time zone.").max(64).refine(isTimeZone, "That isn't a time zone we know — pick one from the list."),
  unitSystem: z.enum(UNIT_SYSTEMS, { message: "Pick metric or imperial." }),
});
export const preferencesPatchSchema = patchOf(preferencesSchema).refine((v) => Object.keys(v).length > 0, "Nothing to change.");
export type PreferencesInput = z.input<typeof preferencesSchema>;
export type PreferencesPatch = z.output<typeof preferencesPatchSchema>;

export const releaseSchema = z.object({
  confirm: z.literal(true, { message: "Tick the box to confirm you are handing this piece on." }),
});
export type ReleaseInput = z.input<typeof releaseSchema>;
export type ReleaseValues = z.output<typeof releaseSchema>;

