// The "Start a studio" form: the same fields, words and checks as the studio's profile settings
// (lib/validation/settings.ts), plus the operator's invite token when the install asks for one.
import { z } from "zod";
import { profileSchema } from "@/lib/validation/settings";

const profile = profileSchema.shape;

export const startStudioSchema = z.object({
  name: profile.name,
  timeZone: profile.timeZone,
  currency: profile.currency,
  unitSystem: profile.unitSystem,
  invite: z.string().max(300).optional(),
});
export type StartStudioInput = z.input<typeof startStudioSchema>;
export type StartStudioValues = z.output<typeof startStudioSchema>;
