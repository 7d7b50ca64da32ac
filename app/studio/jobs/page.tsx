import type { Metadata } from "next";
import { Suspense } from "react";
import { CreateJobButton } from "@/components/jobs/create-job-button";
import { JobsTable } from "@/components/jobs/jobs-table";
import { Card, PageHeader } from "@/components/ui/card";
import { requireStaff } from "@/lib/auth/guards";
import { forPage } from "@/lib/auth/page";
import { formatMoney } from "@/lib/format";
import { jobsToCreate } from "@/lib/repairs/jobs";
import { createJobAction } from "./actions";

export const metadata: Metadata = { title: "Repair jobs" };

const DECISION_WORDS = { covered: "covered", partly_covered: "partly covered", chargeable: "chargeable", declined: "declined" } as const;

export default async function JobsPage() {
  const ctx = await forPage(requireStaff);
  const { fromClaims, fromOffers } = jobsToCreate(ctx);
  return (
    <>
      <PageHeader title="Repair jobs" lead="Accepted claims and accepted refresh offers become jobs with a quote; chargeable quotes are paid online." />
      {fromClaims.length + fromOffers.length > 0 ? (
        <Card className="mb-6 space-y-3">
          <h2 className="font-semibold">Ready to become jobs</h2>
          <ul className="divide-y divide-line">
            {fromClaims.map((c) => (
              <li key={c.id} className="flex flex-wrap items-center justify-between gap-3 py-3">
                <span>
                  <span className="block font-medium">Claim on {c.pieceTitle}</span>
                  <span className="text-sm text-muted">
                    {c.ownerName} · accepted as {c.decision ? DECISION_WORDS[c.decision] : "—"}
                    {c.decision === "partly_covered" ? ` (${c.coveredPct} %)` : ""}
                  </span>
                </span>
                <CreateJobButton action={createJobAction} from="claim" id={c.id} />
              </li>
            ))}
            {fromOffers.map((o) => (
              <li key={o.id} className="flex flex-wrap items-center justify-between gap-3 py-3">
                <span>
                  <span className="block font-medium">Refresh offer accepted: {o.pieceTitle}</span>
                  <span className="text-sm text-muted">
                    {o.ownerName} · offered at {formatMoney(o.priceMinor, o.currency, ctx.studio.country)}
                  </span>
                </span>
                <CreateJobButton action={createJobAction} from="refresh_offer" id={o.id} />
              </li>
            ))}
          </ul>
        </Card>
      ) : null}
      <Suspense>
        <JobsTable country={ctx.studio.country} />
      </Suspense>
    </>
  );
}
