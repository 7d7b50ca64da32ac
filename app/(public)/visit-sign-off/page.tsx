import type { Metadata } from "next";
import { AuthCard } from "@/components/auth/auth-card";
import { Notice } from "@/components/ui/notice";
import { SignOffForm } from "@/components/visits/sign-off-form";
import { signOffPreview } from "@/lib/visits/sign-off";
import { confirmSignOffAction } from "./actions";

export const metadata: Metadata = { title: "Sign off the visit", robots: { index: false } };
export const dynamic = "force-dynamic";

// The link in the visit report mail opens this page; opening it changes nothing (mail scanners open
// links too). The owner signs off with the button, which POSTs the token once.
export default async function VisitSignOffPage({ searchParams }: { searchParams: Promise<Record<string, string | string[] | undefined>> }) {
  const params = await searchParams;
  if (params.done) {
    return (
      <AuthCard title="Thank you">
        <Notice tone="ok" title="The visit is signed off">The studio can see that you checked the work. You can close this page.</Notice>
      </AuthCard>
    );
  }
  const token = typeof params.token === "string" ? params.token : "";
  const visit = params.failed ? null : signOffPreview(token);
  if (!visit) {
    return (
      <AuthCard title="Sign off the visit">
        <Notice tone="error" title="This link has expired or was already used">
          A visit is signed off once. If something about the work isn&apos;t right, write to the studio from your piece&apos;s page.
        </Notice>
      </AuthCard>
    );
  }
  return (
    <AuthCard title="Sign off the visit" lead={`${visit.studioName} · ${visit.when}`}>
      <div className="space-y-2">
        <p>
          <strong>{visit.jobTitle}</strong> on {visit.pieceTitle}
        </p>
        <p className="text-sm font-semibold">What the technician reported</p>
        <p className="whitespace-pre-wrap rounded-lg bg-paper px-3 py-2 text-sm">{visit.work}</p>
      </div>
      <SignOffForm action={confirmSignOffAction} token={token} />
      <p className="text-sm text-muted">Not happy with the work? Don&apos;t sign off; write to the studio instead.</p>
    </AuthCard>
  );
}
