import type { Metadata } from "next";
import { Suspense } from "react";
import { ClientsTable } from "@/components/clients/clients-table";
import { ButtonLink } from "@/components/ui/button";
import { PageHeader } from "@/components/ui/card";
import { requireStaff } from "@/lib/auth/guards";
import { forPage } from "@/lib/auth/page";

export const metadata: Metadata = { title: "Clients" };
export const dynamic = "force-dynamic";

export default async function StudioClientsPage() {
  const ctx = await forPage(requireStaff);
  return (
    <>
      <PageHeader
        title="Clients"
        lead="The people you sold to or serve: how to reach them, what they agreed to hear from you, their pieces and everything that happened with them."
        actions={
          <>
            <ButtonLink variant="secondary" href="/studio/clients/hand-over">
              Hand-over mail
            </ButtonLink>
            <ButtonLink href="/studio/clients/new">Add a client</ButtonLink>
          </>
        }
      />
      <Suspense fallback={<p className="text-muted">Loading clients…</p>}>
        <ClientsTable timeZone={ctx.studio.timeZone} />
      </Suspense>
    </>
  );
}
