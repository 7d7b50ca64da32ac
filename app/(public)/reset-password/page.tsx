import type { Metadata } from "next";
import Link from "next/link";
import { AuthCard } from "@/components/auth/auth-card";
import { ResetPasswordForm } from "@/components/auth/reset-password-form";
import { Notice } from "@/components/ui/notice";
import { resetPasswordAction } from "./actions";

export const metadata: Metadata = { title: "New password" };

export default async function ResetPasswordPage({ searchParams }: { searchParams: Promise<Record<string, string | undefined>> }) {
  const token = (await searchParams).token;
  return (
    <AuthCard title="Choose a new password">
      {token ? (
        <ResetPasswordForm action={resetPasswordAction} token={token} />
      ) : (
        <Notice tone="error" title="This link is incomplete">
          Open the link from the e-mail again, or <Link className="underline" href="/forgot-password">ask for a new one</Link>.
        </Notice>
      )}
    </AuthCard>
  );
}
