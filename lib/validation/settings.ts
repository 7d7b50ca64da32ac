// Studio settings, warranty policy versions, reminder timing and team changes: one schema each,
// shared by the forms (react-hook-form's zod resolver), the server actions and the route handlers.
// No transforms, so a value the form has parsed parses again on the server unchanged.
import { z } from "zod";
import { CURRENCIES, CURRENCY_EXPONENTS } from "@/lib/care/quote";
import { CLAIM_CATEGORIES, CLAIM_EXCLUSIONS, REMINDER_STEPS, SLOT_STEPS, STUDIO_ROLES } from "@/lib/care/vocabulary";
import { isTimeZone } from "@/lib/format";
import { policyDate } from "./dates";

export const UNIT_SYSTEM_CHOICES = ["metric", "imperial"] as const;


/** A studio's zone: one the runtime knows, written as an IANA Area/Location name (or UTC), not an abbreviation. */
const isStudioZone = (tz: string) => isTimeZone(tz) && (tz.includes("/") || tz === "UTC");


/** "85", "85.5", "85.50": an amount in major units as typed; the currency decides how many decimals. */
const AMOUNT_RE = /^\d{1,9}(\.\d{1,3})?$/;
const amount = (label: string) => z.string({ error: `Enter the ${label}.` }).trim().regex(AMOUNT_RE, `${label[0]!.toUpperCase()}${label.slice(1)}: a plain amount like 85.00 (no currency sign).`);

export const profileSchema = z
  .object({
    name: z.string({ error: "Enter the studio's name." }).trim().min(1, "Enter the studio's name.").max(120, "Use at most 120 characters."),
    address: z.string().trim().max(300, "Use at most 300 characters."),
    email: z.union([z.literal(""), z.email("Enter an e-mail address like studio@example.com.").max(200, "Use at most 200 characters.")]),
    /** Optional so callers that predate it keep the stored number. */
    phone: z.string().trim().max(40, "Use at most 40 characters.").regex(/^[0-9+()./\- ]*(ext\.? ?\d+)?$/i, "A phone number: digits, spaces and + ( ) - . only.").optional(),
    timeZone: z.string({ error: "Enter a time zone." }).trim().refine(isStudioZone, "Use a time zone name like America/Los_Angeles or Europe/Berlin."),
    currency: z.enum(CURRENCIES, { error: "Pick a currency." }),
    unitSystem: z.enum(UNIT_SYSTEM_CHOICES, { error: "Pick metric or imperial." }),
    /** Percent as typed, e.g. "8.5". */
    taxRatePct: z
      .string({ error: "Enter the tax rate." })
      .trim()
      .regex(/^\d{1,3}(\.\d{1,2})?$/, "Tax rate: a percentage like 8.5 (at most two decimals).")
      .refine((v) => Number(v) <= 100, "Tax rate can't be above 100 %."),
    labourRate: amount("labour rate"),
    travelFee: amount("travel fee"),
  })
  .superRefine((v, ctx) => {
    const exp = (CURRENCY_EXPONENTS as Record<string, number>)[v.currency];
    if (exp === undefined) return;
    for (const field of ["labourRate", "travelFee"] as const) {
      const decimals = v[field].split(".")[1]?.length ?? 0;
      if (decimals > exp) {
        ctx.addIssue({ code: "custom", path: [field], message: exp === 0 ? `${v.currency} has no minor unit: use a whole amount.` : `${v.currency} has ${exp} decimals at most.` });
      }
    }
  });
export type ProfileInput = z.input<typeof profileSchema>;
export type ProfileValues = z.output<typeof profileSchema>;

export const policyLineSchema = z
  .object({
    covered: z.boolean(),
    label: z.string().trim().max(120, "Use at most 120 characters."),
    termMonths: z.number({ error: "Term: a number of months." }).int("Term: whole months.").min(1, "Term: at least 1 month.").max(600, "Term: at most 600 months (50 years)."),
    exclusions: z.array(z.enum(CLAIM_EXCLUSIONS)).max(CLAIM_EXCLUSIONS.length),
    careLogRequired: z.boolean(),
    graceDays: z.number({ error: "Grace: a number of days." }).int("Grace: whole days.").min(0, "Grace can't be negative.").max(730, "Grace: at most 730 days."),
    onMissed: z.enum(["partly_covered", "not_covered"], { error: "Pick what a missed care log means." }),
    climateCheck: z.boolean(),
    partlyCoveredPct: z.number({ error: "Share: a percentage." }).int("Share: whole percent.").min(1, "Share: at least 1 %.").max(99, "Share: at most 99 %."),
    transfersToNewOwner: z.boolean(),
  })
  .superRefine((l, ctx) => {
    if (l.covered && !l.label) ctx.addIssue({ code: "custom", path: ["label"], message: "Name this line as owners will read it." });
  });
export type PolicyLineInput = z.input<typeof policyLineSchema>;

export const policyVersionSchema = z.object({
  effectiveFrom: policyDate(),
  lines: z.object(Object.fromEntries(CLAIM_CATEGORIES.map((c) => [c, policyLineSchema])) as Record<(typeof CLAIM_CATEGORIES)[number], typeof policyLineSchema>),
});
export type PolicyVersionInput = z.input<typeof policyVersionSchema>;
export type PolicyVersionValues = z.output<typeof policyVersionSchema>;

export const reminderTimingSchema = z.object({
  sendHour: z.number({ error: "Pick an hour." }).int("Pick an hour.").min(0, "Pick an hour from 00 to 23.").max(23, "Pick an hour from 00 to 23."),
  steps: z.array(z.enum(REMINDER_STEPS)).max(REMINDER_STEPS.length),
});
export type ReminderTimingInput = z.input<typeof reminderTimingSchema>;
export type ReminderTimingValues = z.output<typeof reminderTimingSchema>;

const wholeNumber = (what: string, min: number, max: number, unit: string) =>
  z
    .number({ error: `Enter the ${what} as a whole number.` })
    .int(`Enter the ${what} as a whole number.`)
    .min(min, `The ${what} is ${min} to ${max} ${unit}.`)
    .max(max, `The ${what} is ${min} to ${max} ${unit}.`);


export const visitRulesSchema = z.object({
  travelBufferMin: wholeNumber("travel buffer", 0, 240, "minutes"),
  leadTimeHours: wholeNumber("booking notice", 0, 336, "hours"),
  slotStepMin: z.number({ error: "Pick a spacing." }).refine((n) => (SLOT_STEPS as readonly number[]).includes(n), "Pick 15, 30 or 60 minutes."),
  ownerChangeCutoffHours: wholeNumber("change cut-off", 0, 168, "hours"),
});
export type VisitRulesInput = z.input<typeof visitRulesSchema>;
export type VisitRulesValues = z.output<typeof visitRulesSchema>;

const membershipId = z.string({ error: "Pick a member." }).trim().min(1, "Pick a member.").max(64);
export const changeRoleSchema = z.object({ membershipId, role: z.enum(STUDIO_ROLES, { error: "Pick a role." }) });
export type ChangeRoleInput = z.input<typeof changeRoleSchema>;
export type ChangeRoleValues = z.output<typeof changeRoleSchema>;
export const removeMemberSchema = z.object({ membershipId });
export type RemoveMemberInput = z.input<typeof removeMemberSchema>;
export type RemoveMemberValues = z.output<typeof removeMemberSchema>;
