"use client";

import { useQuery } from "@tanstack/react-query";
import { Camera, Clock } from "lucide-react";
import Link from "next/link";
import { usePathname, useRouter, useSearchParams } from "next/navigation";
import { SelectField } from "@/components/ui/field";
import { Notice } from "@/components/ui/notice";
import { CLAIM_CATEGORIES } from "@/lib/care/vocabulary";
import { CLAIM_CATEGORY_LABELS, CLAIM_STATE_LABELS_STAFF, formatWait } from "@/lib/claims/labels";
import type { ClaimState } from "@/lib/claims/states";
import { apiJson } from "./api";
import { StateBadge } from "./state-badge";

type Row = {
  id: string;
  state: ClaimState;
  category: keyof typeof CLAIM_CATEGORY_LABELS;
  createdAt: string;
  pieceId: string;
  pieceTitle: string;
  ownerName: string;
  photos: number;
  waitMs: number;
  answered: boolean;
};
type List = { claims: Row[]; pieces: { id: string; title: string }[]; now: string };

const STATES: ClaimState[] = ["submitted", "in_review", "awaiting_owner", "accepted", "declined", "repair_booked", "closed"];
const FILTERS = ["state", "category", "age", "pieceId", "sort"] as const;

/** The triage queue: filters live in the URL, the list comes from GET /api/claims through TanStack Query. */
export function ClaimQueue() {
  const params = useSearchParams();
  const router = useRouter();
  const pathname = usePathname();
  const qs = new URLSearchParams();
  for (const f of FILTERS) {
    const v = params.get(f);
    if (v) qs.set(f, v);
  }
  const key = qs.toString();
  const { data, isPending, isError, error } = useQuery({ queryKey: ["claims", key], queryFn: () => apiJson<List>(`/api/claims?${key}`), refetchInterval: 60_000 });
  const set = (name: (typeof FILTERS)[number], value: string) => {
    const next = new URLSearchParams(qs);
    if (value) next.set(name, value);
    else next.delete(name);
    router.replace(`${pathname}?${next.toString()}`, { scroll: false });
  };
  const now = data ? Date.parse(data.now) : 0;
  return (
    <div className="space-y-4">
      <div className="grid grid-cols-2 gap-3 md:grid-cols-5">
        <SelectField label="State" value={params.get("state") ?? "open"} onChange={(e) => set("state", e.target.value === "open" ? "" : e.target.value)}>
          <option value="open">Open (new, reviewing, waiting)</option>
          <option value="all">All states</option>
          {STATES.map((s) => (
            <option key={s} value={s}>
              {CLAIM_STATE_LABELS_STAFF[s]}
            </option>
          ))}
        </SelectField>
        <SelectField label="Category" value={params.get("category") ?? "all"} onChange={(e) => set("category", e.target.value === "all" ? "" : e.target.value)}>
          <option value="all">All categories</option>
          {CLAIM_CATEGORIES.map((c) => (
            <option key={c} value={c}>
              {CLAIM_CATEGORY_LABELS[c]}
            </option>
          ))}
        </SelectField>
        <SelectField label="Filed" value={params.get("age") ?? "any"} onChange={(e) => set("age", e.target.value === "any" ? "" : e.target.value)}>
          <option value="any">Any time</option>
          <option value="under_2d">In the last 2 days</option>
          <option value="2_to_7d">2–7 days ago</option>
          <option value="over_7d">Over 7 days ago</option>
        </SelectField>
        <SelectField label="Piece" value={params.get("pieceId") ?? ""} onChange={(e) => set("pieceId", e.target.value)}>
          <option value="">All pieces</option>
          {data?.pieces.map((p) => (
            <option key={p.id} value={p.id}>
              {p.title}
            </option>
          ))}
        </SelectField>
        <SelectField label="Sort" value={params.get("sort") ?? "oldest"} onChange={(e) => set("sort", e.target.value === "oldest" ? "" : e.target.value)}>
          <option value="oldest">Oldest first</option>
          <option value="newest">Newest first</option>
        </SelectField>
      </div>
      {isPending ? <p className="text-muted">Loading claims…</p> : null}
      {isError ? <Notice tone="error" title="The queue didn't load">{error.message}</Notice> : null}
      {data && data.claims.length === 0 ? <p className="rounded-xl border border-line bg-card p-5 text-muted">No claims match these filters.</p> : null}
      {data && data.claims.length > 0 ? (
        <ul className="divide-y divide-line overflow-hidden rounded-xl border border-line bg-card" aria-label="Claims">
          {data.claims.map((c) => (
            <li key={c.id}>
              <Link href={`/studio/claims/${c.id}`} className="grid gap-2 px-4 py-3 hover:bg-resin-soft md:grid-cols-[11rem_1fr_auto] md:items-center">
                <StateBadge state={c.state} audience="staff" className="justify-self-start" />
                <span className="min-w-0">
                  <span className="block truncate font-medium">
                    {CLAIM_CATEGORY_LABELS[c.category]} · {c.pieceTitle}
                  </span>
                  <span className="block truncate text-sm text-muted">
                    {c.ownerName} · filed {formatWait(now - Date.parse(c.createdAt))} ago · <Camera aria-hidden className="inline size-4" /> {c.photos} photo{c.photos === 1 ? "" : "s"}
                  </span>
                </span>
                <span className={`flex items-center gap-1 text-sm ${c.answered ? "text-muted" : "font-semibold text-warn"}`}>
                  <Clock aria-hidden className="size-4" />
                  {c.answered ? `first answer after ${formatWait(c.waitMs)}` : `waiting ${formatWait(c.waitMs)} for a first answer`}
                </span>
              </Link>
            </li>
          ))}
        </ul>
      ) : null}
    </div>
  );
}
