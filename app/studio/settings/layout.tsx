import type { ReactNode } from "react";
import { SettingsNav } from "@/components/settings/settings-nav";
import { PageHeader } from "@/components/ui/card";
import { requireAdmin } from "@/lib/auth/guards";
import { forPage } from "@/lib/auth/page";

export default async function SettingsLayout({ children }: { children: ReactNode }) {
  await forPage(requireAdmin);
  return (
    <>
      <PageHeader title="Settings" lead="The studio's terms: who you are, what you charge, what your warranty covers, and when owners hear from you." />
      <div className="grid gap-6 lg:grid-cols-[13rem_1fr]">
        <SettingsNav />
        <div className="min-w-0">{children}</div>
      </div>
    </>
  );
}
