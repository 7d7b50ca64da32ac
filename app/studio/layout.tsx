import type { ReactNode } from "react";
import { Suspense } from "react";
import { InboxLink } from "@/components/inbox/inbox-link";
import { DeniedNotice } from "@/components/shell/denied-notice";
import { SiteHeader } from "@/components/shell/site-header";
import { requireStudioMember } from "@/lib/auth/guards";
import { studioNavFor } from "@/lib/auth/navigation";
import { forPage } from "@/lib/auth/page";
import { unreadCount } from "@/lib/messages/service";

export default async function StudioLayout({ children }: { children: ReactNode }) {
  const ctx = await forPage(requireStudioMember);
  return (
    <>
      <SiteHeader nav={studioNavFor(ctx.role)} userName={`${ctx.user.name} · ${ctx.role}`} context={ctx.studio.name}>
        {ctx.role === "technician" ? null : <InboxLink unread={unreadCount(ctx)} />}
      </SiteHeader>
      <main className="mx-auto max-w-6xl px-4 py-6 sm:py-10">
        <Suspense>
          <DeniedNotice />
        </Suspense>
        {children}
      </main>
    </>
  );
}
