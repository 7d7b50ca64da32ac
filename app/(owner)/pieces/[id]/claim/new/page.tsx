import type { Metadata } from "next";
import Link from "next/link";
import { ClaimForm } from "@/components/claims/claim-form";
import { PageHeader } from "@/components/ui/card";
import { requireUser } from "@/lib/auth/guards";
import { forPage } from "@/lib/auth/page";
import { claimFormContext } from "@/lib/claims/file-claim";

export const metadata: Metadata = { title: "Report damage" };
export const dynamic = "force-dynamic";

/** The form is for one piece: back goes to that piece, or to the claims list when the owner came from it (?from=claims). */
export default async function NewClaimPage({ params, searchParams }: { params: Promise<{ id: string }>; searchParams: Promise<{ from?: string | string[] }> }) {
  const { id } = await params;
  const fromClaims = (await searchParams).from === "claims";
  const { piece, today, unit } = await forPage(async () => claimFormContext(await requireUser(), id));
  return (
    <>
      <p className="mb-2 text-sm">
        <Link href={fromClaims ? "/claims" : `/pieces/${piece.id}`} className="inline-flex min-h-11 items-center text-resin underline">
          ← {fromClaims ? "My claims" : piece.title}
        </Link>
      </p>
      <PageHeader title="Report damage" lead={`Tell ${piece.studioName} what happened to the ${piece.title}. They will look at it and answer you here and by e-mail.`} />
      <ClaimForm pieceId={piece.id} pieceTitle={piece.title} today={today} unit={unit} />
    </>
  );
}
