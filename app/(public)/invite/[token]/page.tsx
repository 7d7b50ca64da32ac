import type { Metadata } from "next";
import Link from "next/link";
import { AcceptInvitationForm } from "@/components/auth/accept-invitation-form";
import { AuthCard } from "@/components/auth/auth-card";
import { Notice } from "@/components/ui/notice";
import { findOpenInvitation } from "@/lib/auth/accounts";
import { getCurrentSession } from "@/lib/auth/session";
import { acceptInvitationAction } from "./actions";

export const metadata: Metadata = { title: "Join a studio" };

export default async function InvitePage({ params }: { params: Promise<{ token: string }> }) {
  const { token } = await params;
  const found = findOpenInvitation(token);
  if (!found) {
    return (
      <AuthCard title="This invitation can't be used">
        <Notice tone="error" title="Expired, withdrawn or already used">Ask the studio&apos;s admin to send a new one.</Notice>
      </AuthCard>
    );
  }
  const { user } = await getCurrentSession();
  const signedInAsInvitee = user?.email === found.invitation.email;
  const otherAccount = user && !signedInAsInvitee;
  return (
    <AuthCard
      title={`Join ${found.studioName}`}
      lead={<>You&apos;re invited as <strong>{found.invitation.role}</strong>, for {found.invitation.email}.</>}
    >
      {otherAccount ? (
        <Notice tone="warn" title="You are signed in as someone else">
          This invitation is for {found.invitation.email}. Sign out, then open the link again.
        </Notice>
      ) : (
        <AcceptInvitationForm action={acceptInvitationAction} token={token} email={found.invitation.email} hasAccount={signedInAsInvitee} />
      )}
      {!user ? (
        <p className="text-sm text-muted">
          Already have a Grainward account with this address? <Link className="text-resin underline" href={`/sign-in?${new URLSearchParams({ next: `/invite/${encodeURIComponent(token)}` })}`}>Sign in first</Link>.
        </p>
      ) : null}
    </AuthCard>
  );
}
