import type { Metadata } from "next";
import Link from "next/link";
import { AuthCard } from "@/components/auth/auth-card";
import { ResendVerification } from "@/components/auth/resend-verification";
import { Notice } from "@/components/ui/notice";
import { getCurrentSession } from "@/lib/auth/session";
import { safeNextPath } from "@/lib/auth/next-path";
import { resendVerificationAction } from "./actions";

export const metadata: Metadata = { title: "Confirm your e-mail" };

export default async function VerifySentPage({ searchParams }: { searchParams: Promise<Record<string, string | undefined>> }) {
  const params = await searchParams;
  const next = safeNextPath(params.next);
  const { user } = await getCurrentSession();
  // After sign-up (no session yet): the address typed on the form.
  const to = user?.email ?? (typeof params.to === "string" && params.to.length <= 254 ? params.to : undefined);
  return (
    <AuthCard title="Confirm your e-mail">
      {params.failed ? (
        <Notice tone="error" title="That link has expired or was already used">Ask for a fresh one below.</Notice>
      ) : (
        <Notice tone="info" title="Check your inbox">
          We sent a link to {to ? <strong className="break-all">{to}</strong> : "your address"}. Open it to confirm the address and carry on.
        </Notice>
      )}
      {user ? (
        <ResendVerification action={resendVerificationAction} next={next} />
      ) : (
        <p className="text-sm">
          <Link className="text-resin underline" href={next ? `/sign-in?${new URLSearchParams({ next })}` : "/sign-in"}>Sign in</Link> to get a new link.
        </p>
      )}
    </AuthCard>
  );
}
