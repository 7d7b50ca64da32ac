import type { Metadata } from "next";
import { HandoverMailing } from "@/components/clients/handover-mailing";
import { PageHeader } from "@/components/ui/card";
import { requireStaff } from "@/lib/auth/guards";
import { forPage } from "@/lib/auth/page";
import { handoverCandidates, recentHandoverBatches } from "@/lib/pieces/handover-batch";

export const metadata: Metadata = { title: "Hand-over mail" };
export const dynamic = "force-dynamic";

export default async function HandoverMailPage({ searchParams }: { searchParams: Promise<{ batch?: string }> }) {
  const ctx = await forPage(requireStaff);
  const { batch } = await searchParams;
  const batches = recentHandoverBatches(ctx);
  return (
    <>
      <PageHeader
        title="Hand-over mail"
        lead="Send buyers the mail that tells them what they bought, how to care for it, their warranty, and the link that registers the piece in one tap. Each buyer gets it once; to send it again, use the piece's page."
      />
      <HandoverMailing candidates={handoverCandidates(ctx)} batches={batches} initialBatchId={batches.some((b) => b.id === batch) ? batch! : null} timeZone={ctx.studio.timeZone} />
    </>
  );
}
