"use client";

import { useQuery } from "@tanstack/react-query";
import Link from "next/link";
import { useUrlFilters } from "@/components/tables/use-url-filters";
import { apiJson } from "@/components/api-client";
import { StatusBadge } from "@/components/ui/status";
import { Notice } from "@/components/ui/notice";
import { JOB_STATE_LABELS, JOB_STATE_TONES, jobAmountText, jobStateLabel } from "@/lib/repairs/states";
import { JOB_STATES, type JOB_ORIGINS } from "@/lib/care/vocabulary";
import { loadRefusalWords } from "@/components/forms/use-refreshing-mutation";

type JobRow = { id: string; title: string; state: (typeof JOB_STATES)[number]; origin: (typeof JOB_ORIGINS)[number]; totalMinor: number; coveredPct: number; currency: string; updatedAt: string; pieceTitle: string; ownerName: string | null; paidMinor?: number; refundedMinor?: number };

export function JobsTable({ country }: { country: string }) {
  // A state not in JOB_STATES (an old or mistyped link) reads as none: all jobs, not "Some fields need a second look."
  const { get, set } = useUrlFilters(["state"], { state: JOB_STATES });
  const state = get("state");
  const query = useQuery({
    queryKey: ["jobs", state],
    queryFn: async ({ signal }): Promise<JobRow[]> => (await apiJson<{ jobs: JobRow[] }>(`/api/jobs${state ? `?state=${state}` : ""}`, { signal })).jobs,
  });
  return (
    <div className="space-y-4">
      <label className="flex max-w-xs flex-col gap-1.5 text-sm font-medium">
        State
        <select
          className="min-h-11 rounded-lg border border-line bg-white px-3"
          value={state}
          onChange={(e) => set({ state: e.target.value })}
        >
          <option value="">All states</option>
          {JOB_STATES.map((s) => (
            <option key={s} value={s}>
              {JOB_STATE_LABELS[s]}
            </option>
          ))}
        </select>
      </label>
      {query.isPending ? (
        <p role="status" className="text-muted">Loading jobs…</p>
      ) : query.isError ? (
        <Notice tone="error" title="Couldn't load the jobs">{loadRefusalWords(query.error)}</Notice>
      ) : query.data.length === 0 ? (
        <p className="rounded-xl border border-line bg-card p-5 text-muted">No repair jobs {state ? "in this state" : "yet"}.</p>
      ) : (
        <ul className="divide-y divide-line overflow-hidden rounded-xl border border-line bg-card">
          {query.data.map((j) => (
            <li key={j.id}>
              <Link href={`/studio/jobs/${j.id}`} className="grid gap-1 px-4 py-3 hover:bg-resin-soft sm:grid-cols-[1fr_auto_8rem] sm:items-center sm:gap-4">
                <span>
                  <span className="block font-medium">{j.title}</span>
                  <span className="block text-sm text-muted">
                    {j.pieceTitle} · {j.ownerName ?? "no owner"}
                  </span>
                </span>
                <StatusBadge label={jobStateLabel(j)} tone={JOB_STATE_TONES[j.state]} />
                <span className="text-sm font-semibold sm:text-right">{jobAmountText(j, country)}</span>
              </Link>
            </li>
          ))}
        </ul>
      )}
    </div>
  );
}
