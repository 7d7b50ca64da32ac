import type { Metadata } from "next";
import { AuthCard } from "@/components/auth/auth-card";
import { ForgotPasswordForm } from "@/components/auth/forgot-password-form";
import { forgotPasswordAction } from "./actions";

export const metadata: Metadata = { title: "Forgot password" };

export default function ForgotPasswordPage() {
  return (
    <AuthCard title="Choose a new password" lead="Tell us the e-mail you signed up with and we'll send a link.">
      <ForgotPasswordForm action={forgotPasswordAction} />
    </AuthCard>
  );
}
