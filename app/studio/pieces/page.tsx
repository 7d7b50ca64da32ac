import type { Metadata } from "next";
import { Suspense } from "react";
import { RegistryTable } from "@/components/pieces/registry-table";
import { ButtonLink } from "@/components/ui/button";
import { PageHeader } from "@/components/ui/card";
import { SpriteIcon } from "@/components/ui/sprite-icon";
import { requireStaff } from "@/lib/auth/guards";
import { forPage } from "@/lib/auth/page";

export const metadata: Metadata = { title: "Pieces" };

export default async function StudioPiecesPage() {
  await forPage(requireStaff);
  return (
    <>
      <PageHeader
        title="Pieces"
        lead="The registry of every piece the studio has delivered: what it is made of, how it was finished, and its care."
        actions={
          <>
            <ButtonLink href="/studio/pieces/new">
              <SpriteIcon name="plus" className="size-4" /> New piece
            </ButtonLink>
            <ButtonLink href="/studio/pieces/import" variant="secondary">
              <SpriteIcon name="upload" className="size-4" /> Import CSV
            </ButtonLink>
          </>
        }
      />
      <Suspense fallback={<p className="text-muted">Loading pieces…</p>}>
        <RegistryTable />
      </Suspense>
    </>
  );
}
