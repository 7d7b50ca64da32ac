import type { Metadata } from "next";
import { Suspense } from "react";
import { ClaimQueue } from "@/components/claims/claim-queue";
import { PageHeader } from "@/components/ui/card";
import { requireStaff } from "@/lib/auth/guards";
import { forPage } from "@/lib/auth/page";

export const metadata: Metadata = { title: "Claims" };
export const dynamic = "force-dynamic";

export default async function StudioClaimsPage() {
  await forPage(requireStaff);
  return (
    <>
      <PageHeader title="Claims" lead="Damage and defects owners reported, oldest first, with how long each has waited for a first answer." />
      <Suspense fallback={<p className="text-muted">Loading claims…</p>}>
        <ClaimQueue />
      </Suspense>
    </>
  );
}
