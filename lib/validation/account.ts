import { z } from "zod";
import { emailField } from "./auth";

// The owner's own account (app/(owner)/account): moving it to another address, and deleting it.

const currentPassword = z.string({ message: "Enter your current password." }).min(1, "Enter your current password.").max(200, "That password is too long.");

export const changeEmailSchema = z.object({ email: emailField, current: currentPassword });
export type ChangeEmailInput = z.input<typeof changeEmailSchema>;
export type ChangeEmailValues = z.output<typeof changeEmailSchema>;

/** The confirmation page's form: the token of the link mailed to the new address. */
export const confirmEmailChangeSchema = z.object({
  token: z.string({ message: "This link is incomplete." }).min(10, "This link is incomplete.").max(200, "This link is not one of ours."),
});

export const deleteAccountSchema = z.object({ current: currentPassword });
export type DeleteAccountInput = z.input<typeof deleteAccountSchema>;
