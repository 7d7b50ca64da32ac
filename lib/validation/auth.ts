import { z } from "zod";

// Shared by the forms (react-hook-form's zod resolver) and the server actions.

export const emailField = z
  .string()
  .trim()
  .toLowerCase()
  .min(1, "Enter your e-mail address.")
  .max(254, "That e-mail address is too long.")
  .pipe(z.email("Enter an e-mail address like name@example.com."));

export const newPasswordField = z
  .string()
  .min(10, "Use at least 10 characters.")
  .max(200, "Use at most 200 characters.");

/** A person's own name, as they sign up, accept an invitation or change it on their account. */
export const personNameField = z.string().trim().min(1, "Tell us your name.").max(120, "Use at most 120 characters.");

export const signInSchema = z.object({
  email: emailField,
  password: z.string().min(1, "Enter your password.").max(200, "That password is too long."),
  next: z.string().max(500).optional(),
});
export type SignInInput = z.infer<typeof signInSchema>;

export const signUpSchema = z.object({
  name: personNameField,
  email: emailField,
  password: newPasswordField,
  next: z.string().max(500).optional(),
});
export type SignUpInput = z.infer<typeof signUpSchema>;

export const forgotPasswordSchema = z.object({ email: emailField });
export type ForgotPasswordInput = z.infer<typeof forgotPasswordSchema>;

export const resetPasswordSchema = z
  .object({
    token: z.string().min(10, "This reset link is incomplete.").max(200),
    password: newPasswordField,
    confirm: z.string(),
  })
  .refine((v) => v.password === v.confirm, { path: ["confirm"], message: "The two passwords differ." });
export type ResetPasswordInput = z.infer<typeof resetPasswordSchema>;

export const inviteSchema = z.object({
  email: emailField,
  role: z.enum(["admin", "staff", "technician"], { message: "Pick a role." }),
});
export type InviteInput = z.infer<typeof inviteSchema>;

export const revokeInvitationSchema = z.object({ invitationId: z.string({ error: "Pick an invitation." }).trim().min(1, "Pick an invitation.").max(64) });
export type RevokeInvitationInput = z.input<typeof revokeInvitationSchema>;
export type RevokeInvitationValues = z.output<typeof revokeInvitationSchema>;

export const acceptInvitationSchema = z.object({
  token: z.string().min(10).max(200),
  name: personNameField,
  password: newPasswordField,
});
export type AcceptInvitationInput = z.infer<typeof acceptInvitationSchema>;

export const changePasswordSchema = z
  .object({
    current: z.string().min(1, "Enter your current password.").max(200),
    password: newPasswordField,
    confirm: z.string(),
  })
  .refine((v) => v.password === v.confirm, { path: ["confirm"], message: "The two passwords differ." })
  .refine((v) => v.password !== v.current, { path: ["password"], message: "Choose a password different from the current one." });
export type ChangePasswordInput = z.infer<typeof changePasswordSchema>;

/** The account page's name form (app/(owner)/account/actions.ts). */
export const changeNameSchema = z.object({ name: personNameField });
export type ChangeNameInput = z.infer<typeof changeNameSchema>;

/** The e-mail confirmation form: the token of the mailed link, and where the person was going. */
export const confirmEmailSchema = z.object({
  token: z.string({ message: "This link is incomplete." }).min(10, "This link is incomplete.").max(200, "This link is not one of ours."),
  next: z.string().max(500).optional(),
});
