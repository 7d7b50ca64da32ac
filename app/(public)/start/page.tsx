import type { Metadata } from "next";
import { AuthCard } from "@/components/auth/auth-card";
import { StartStudioForm } from "@/components/setup/start-studio-form";
import { ButtonLink } from "@/components/ui/button";
import { Notice } from "@/components/ui/notice";
import { studioMemberships } from "@/lib/auth/guards";
import { safeNextPath } from "@/lib/auth/next-path";
import { getCurrentSession } from "@/lib/auth/session";
import { zoneChoices } from "@/lib/format";
import { REFUSALS, startGate } from "@/lib/studio/create";
import { startStudioAction } from "./actions";

export const metadata: Metadata = { title: "Start a studio" };

const LEAD = "Keep the records, care reminders and claims for the pieces your workshop builds. You'll be the studio's admin, and can invite your team after.";

export default async function StartStudioPage({ searchParams }: { searchParams: Promise<Record<string, string | string[] | undefined>> }) {
  const raw = (await searchParams).invite;
  const invite = typeof raw === "string" && raw.length <= 300 ? raw : undefined;
  const gate = startGate({ invite });
  if (!gate.allowed) {
    return (
      <AuthCard title="Start a studio">
        <Notice tone="info" title="Not open here">
          {REFUSALS[gate.why]}
        </Notice>
        <ButtonLink href="/" variant="secondary">
          Back to the home page
        </ButtonLink>
      </AuthCard>
    );
  }

  const { user } = await getCurrentSession();
  if (!user) {
    const back = safeNextPath(invite ? `/start?${new URLSearchParams({ invite })}` : "/start") ?? "/start";
    const next = encodeURIComponent(back);
    return (
      <AuthCard title="Start a studio" lead={LEAD}>
        <p className="text-sm">First, the account you&apos;ll sign in with. We&apos;ll bring you back here once it&apos;s ready.</p>
        <div className="flex flex-wrap gap-3">
          <ButtonLink href={`/sign-up?next=${next}`}>Create an account</ButtonLink>
          <ButtonLink href={`/sign-in?next=${next}`} variant="secondary">
            I have an account
          </ButtonLink>
        </div>
      </AuthCard>
    );
  }

  const current = await studioMemberships(user.id);
  return (
    <AuthCard title="Start a studio" lead={LEAD}>
      {current.length ? (
        <Notice tone="info" title="A studio of its own">
          You&apos;re already in {current.map((m) => m.studio.name).join(", ")}. This starts a separate studio with its own pieces and team.
        </Notice>
      ) : null}
      <StartStudioForm action={startStudioAction} invite={invite} timeZones={zoneChoices()} />
    </AuthCard>
  );
}
