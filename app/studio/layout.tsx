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
      {/* The header holds up to a dozen links: a keyboard reaches the page's own content in one step. */}
      <a href="#studio-main" className="sr-only focus:not-sr-only focus:fixed focus:left-4 focus:top-4 focus:z-50 focus:rounded-lg focus:bg-card focus:px-4 focus:py-3 focus:font-semibold focus:text-resin focus:shadow">
        Skip to the page
      </a>
      <SiteHeader nav={studioNavFor(ctx.role)} userName={`${ctx.user.name} · ${ctx.role}`} context={ctx.studio.name}>
        {ctx.role === "technician" ? null : <InboxLink unread={unreadCount(ctx)} />}
      </SiteHeader>
      <main id="studio-main" tabIndex={-1} className="mx-auto max-w-6xl px-4 py-6 focus:outline-none sm:py-10">
        <Suspense>
          <DeniedNotice />
        </Suspense>
        {children}
      </main>
    </>
  );
}
