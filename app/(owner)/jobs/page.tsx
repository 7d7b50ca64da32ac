import type { Metadata } from "next";
import Link from "next/link";
import { Card, PageHeader } from "@/components/ui/card";
import { StatusBadge } from "@/components/ui/status";
import { requireUser } from "@/lib/auth/guards";
import { forPage } from "@/lib/auth/page";
import { listOwnerJobs } from "@/lib/repairs/jobs";
import { JOB_STATE_TONES, jobAmountText, jobStateLabel } from "@/lib/repairs/states";

export const metadata: Metadata = { title: "Repairs" };

export default async function OwnerJobsPage() {
  const jobs = listOwnerJobs(await forPage(requireUser));
  return (
    <>
      <PageHeader title="Repairs" lead="Quotes and repair visits for your pieces." />
      {jobs.length === 0 ? (
        <Card>No repairs yet. When a studio sends you a quote, it appears here.</Card>
      ) : (
        <ul className="space-y-3">
          {jobs.map((j) => (
            <li key={j.id}>
              <Link href={`/jobs/${j.id}`} className="block rounded-xl border border-line bg-card p-4 hover:border-resin">
                <span className="flex flex-wrap items-center justify-between gap-2">
                  <span className="font-semibold">{j.title}</span>
                  <StatusBadge label={jobStateLabel(j)} tone={JOB_STATE_TONES[j.state]} />
                </span>
                <span className="mt-1 block text-sm text-muted">
                  {/* The piece, as the staff jobs list shows it: a job's title names the work ("Repair: crack or gap"), not the piece. */}
                  {j.pieceTitle} · {j.studioName} · {jobAmountText(j, j.studioCountry)}
                </span>
              </Link>
            </li>
          ))}
        </ul>
      )}
    </>
  );
}
