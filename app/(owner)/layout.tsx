import type { ReactNode } from "react";
import { Suspense } from "react";
import { DeniedNotice } from "@/components/shell/denied-notice";
import { SiteHeader } from "@/components/shell/site-header";
import { Notice } from "@/components/ui/notice";
import { requireUser } from "@/lib/auth/guards";
import { forPage } from "@/lib/auth/page";

export default async function OwnerLayout({ children }: { children: ReactNode }) {
  const user = await forPage(requireUser);
  return (
    <>
      <SiteHeader nav={[
          { href: "/pieces", label: "My pieces" },
          { href: "/claims", label: "Claims" },
          { href: "/jobs", label: "Repairs" },
          { href: "/register", label: "Register a piece" },
          { href: "/account", label: "Account" },
        ]} userName={user.name} />
      <main className="mx-auto max-w-3xl px-4 py-6 sm:py-10">
        <Suspense>
          <DeniedNotice />
        </Suspense>
        {!user.emailVerifiedAt ? (
          <Notice tone="warn" title="Confirm your e-mail" className="mb-6">
            We sent a link to {user.email}. <a className="underline" href="/verify-email/sent">Need a new one?</a>
          </Notice>
        ) : null}
        {children}
      </main>
    </>
  );
}
