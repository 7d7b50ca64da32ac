// Inputs of the set-up steps that have no settings form of their own elsewhere: the accent colour, the
// Stripe key and the mail sender. Shared by the forms (loaded lazily) and the server actions.
import { z } from "zod";
import { ACCENT_NAMES } from "./brand";

export const accentSchema = z.object({
  accent: z.enum(ACCENT_NAMES as [string, ...string[]], { error: "Pick one of the colours." }),
});
export type AccentInput = z.input<typeof accentSchema>;
export type AccentValues = z.output<typeof accentSchema>;

export const stripeKeySchema = z.object({
  secretKey: z
    .string({ error: "Paste your Stripe secret key." })
    .trim()
    .min(1, "Paste your Stripe secret key.")
    .max(255, "That is longer than a Stripe key.")
    .regex(/^(sk|rk)_(test|live)_[A-Za-z0-9_]+$/, "A Stripe secret key starts with sk_live_ or sk_test_ (a restricted key with rk_)."),
});
export type StripeKeyInput = z.input<typeof stripeKeySchema>;
export type StripeKeyValues = z.output<typeof stripeKeySchema>;

export const mailSenderSchema = z.object({
  senderName: z
    .string({ error: "Enter the sender name." })
    .trim()
    .min(1, "Enter the name your e-mails come from.")
    .max(80, "Use at most 80 characters.")
    .refine((v) => !/[<>"\r\n]/.test(v), "Leave out < > and quotation marks."),
  replyTo: z.union([z.literal(""), z.email("Enter an e-mail address like studio@example.com.").max(200)]),
});
export type MailSenderInput = z.input<typeof mailSenderSchema>;
export type MailSenderValues = z.output<typeof mailSenderSchema>;
