import type { ReactNode } from "react";
import { PageHeader } from "@/components/ui/card";
import { requireAdmin } from "@/lib/auth/guards";
import { forPage } from "@/lib/auth/page";

export default async function SetupLayout({ children }: { children: ReactNode }) {
  await forPage(requireAdmin);
  return (
    <>
      <PageHeader title="Set up your studio" lead="One step at a time; each saves on its own. Skip any step and come back to it later: what is left stays on your overview." />
      {children}
    </>
  );
}
