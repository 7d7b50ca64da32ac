import type { Metadata } from "next";
import { redirect } from "next/navigation";
import { SetupStepList } from "@/components/setup/setup-step-list";
import { ButtonLink } from "@/components/ui/button";
import { Card } from "@/components/ui/card";
import { requireAdmin } from "@/lib/auth/guards";
import { forPage } from "@/lib/auth/page";
import { firstUnfinishedStep, setupChecklist, setupHref } from "@/lib/studio/setup";

export const metadata: Metadata = { title: "Set up your studio" };

/** Resumes the set-up at the first step not done; when every step is, says so. */
export default async function SetupPage() {
  const ctx = await forPage(requireAdmin);
  const items = setupChecklist(ctx);
  const next = firstUnfinishedStep(items);
  if (next) redirect(setupHref(next));
  return (
    <Card className="space-y-4">
      <h2 className="font-display text-xl font-semibold">Every step is done</h2>
      <p className="text-sm text-muted">Your studio is set up. You can change any of it later here or in Settings.</p>
      <SetupStepList items={items} />
      <ButtonLink href="/studio">Go to the overview</ButtonLink>
    </Card>
  );
}
