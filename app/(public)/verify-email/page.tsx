import type { Metadata } from "next";
import { redirect } from "next/navigation";
import { AuthCard } from "@/components/auth/auth-card";
import { ConfirmEmailForm } from "@/components/auth/confirm-email-form";
import { isTokenUsable } from "@/lib/auth/accounts";
import { safeNextPath } from "@/lib/auth/next-path";
import { confirmEmailAction } from "./actions";

export const metadata: Metadata = { title: "Confirm your e-mail", robots: { index: false } };

// The link in the verification e-mail opens this page; opening it changes nothing (mail scanners
// open links too). The address is confirmed by the POST this page sends, by itself or by its button.
export default async function VerifyEmailPage({ searchParams }: { searchParams: Promise<Record<string, string | string[] | undefined>> }) {
  const params = await searchParams;
  const token = typeof params.token === "string" ? params.token : "";
  const next = safeNextPath(typeof params.next === "string" ? params.next : undefined);
  if (!isTokenUsable(token, "verify_email")) redirect("/verify-email/sent?failed=1");
  return (
    <AuthCard title="Confirm your e-mail" lead="One moment while we confirm your address.">
      <ConfirmEmailForm action={confirmEmailAction} token={token} next={next} />
    </AuthCard>
  );
}
