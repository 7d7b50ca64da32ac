import type { Metadata } from "next";
import Link from "next/link";
import { ClaimForm } from "@/components/claims/claim-form";
import { PageHeader } from "@/components/ui/card";
import { requireUser } from "@/lib/auth/guards";
import { forPage } from "@/lib/auth/page";
import { claimFormContext } from "@/lib/claims/file-claim";

export const metadata: Metadata = { title: "Report damage" };
export const dynamic = "force-dynamic";

export default async function NewClaimPage({ params }: { params: Promise<{ id: string }> }) {
  const { id } = await params;
  const { piece, today, unit } = await forPage(async () => claimFormContext(await requireUser(), id));
  return (
    <>
      <p className="mb-2 text-sm">
        <Link href="/claims" className="inline-flex min-h-11 items-center text-resin underline">
          ← My claims
        </Link>
      </p>
      <PageHeader title="Report damage" lead={`Tell ${piece.studioName} what happened to the ${piece.title}. They will look at it and answer you here and by e-mail.`} />
      <ClaimForm pieceId={piece.id} pieceTitle={piece.title} today={today} unit={unit} />
    </>
  );
}
