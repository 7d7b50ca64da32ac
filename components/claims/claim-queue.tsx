"use client";

import { useQuery } from "@tanstack/react-query";
import { useEffect } from "react";
import Link from "next/link";
import { Button } from "@/components/ui/button";
import { SelectField, TextField } from "@/components/ui/field";
import { Notice } from "@/components/ui/notice";
import { SpriteIcon } from "@/components/ui/sprite-icon";
import { CLAIM_AGE_FILTERS, CLAIM_CATEGORIES, CLAIM_STATES } from "@/lib/care/vocabulary";
import { CLAIM_CATEGORY_LABELS, CLAIM_STATE_LABELS_STAFF } from "@/lib/claims/labels";
import type { ClaimState } from "@/lib/claims/states";
import { apiJson } from "@/components/api-client";
import { useUrlFilters } from "@/components/tables/use-url-filters";
import { StateBadge } from "./state-badge";
import { formatAgo, formatCount, formatWait } from "@/lib/format";

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
type List = { claims: Row[]; total: number; page: number; pageSize: number; pieces: { id: string; title: string }[]; now: string };

const STATES: readonly ClaimState[] = CLAIM_STATES;
const FILTERS = ["q", "state", "category", "age", "pieceId", "sort", "page"] as const;
/** The values each listed key can take (lib/validation/claims.ts claimListQuerySchema); others in a link read as unset. */
const KNOWN = { state: [...CLAIM_STATES, "open", "all"], category: [...CLAIM_CATEGORIES, "all"], age: CLAIM_AGE_FILTERS, sort: ["oldest", "newest"] } as const;

/** The triage queue: filters live in the URL, the list comes from GET /api/claims through TanStack Query. */
export function ClaimQueue() {
  const { qs: key, get, set, anySetBut, typed, setTyped } = useUrlFilters(FILTERS, KNOWN);
  const { data, isPending, isError, error } = useQuery({ queryKey: ["claims", key], queryFn: () => apiJson<List>(`/api/claims?${key}`), refetchInterval: 60_000 });
  const now = data ? Date.parse(data.now) : 0;
  const lastPage = data ? Math.max(1, Math.ceil(data.total / data.pageSize)) : 1;
  const from = data && data.total > 0 ? (data.page - 1) * data.pageSize + 1 : 0;
  const to = data ? Math.min(data.total, data.page * data.pageSize) : 0;
  // A page past the end (an old link, or claims closed since): go to the last page, never "No claims match".
  const pastEnd = !!data && data.claims.length === 0 && data.total > 0 && data.page > 1;
  useEffect(() => {
    if (pastEnd) set({ page: lastPage > 1 ? String(lastPage) : "" });
    // eslint-disable-next-line react-hooks/exhaustive-deps -- only a page found past the end moves the URL
  }, [pastEnd, lastPage]);
  return (
    <div className="space-y-4">
      <div className="relative">
        <TextField label="Search claims" placeholder="Piece title, owner name or e-mail" value={typed} onChange={(e) => setTyped(e.target.value)} className="pl-10" type="search" maxLength={100} />
        <SpriteIcon name="search" className="pointer-events-none absolute bottom-3 left-3 size-5 text-muted" />
      </div>
      <div className="grid grid-cols-2 gap-3 md:grid-cols-5">
        <SelectField label="State" value={get("state") || "open"} onChange={(e) => set({ state: e.target.value === "open" ? "" : e.target.value })}>
          <option value="open">Open (new, reviewing, waiting)</option>
          <option value="all">All states</option>
          {STATES.map((s) => (
            <option key={s} value={s}>
              {CLAIM_STATE_LABELS_STAFF[s]}
            </option>
          ))}
        </SelectField>
        <SelectField label="Category" value={get("category") || "all"} onChange={(e) => set({ category: e.target.value === "all" ? "" : e.target.value })}>
          <option value="all">All categories</option>
          {CLAIM_CATEGORIES.map((c) => (
            <option key={c} value={c}>
              {CLAIM_CATEGORY_LABELS[c]}
            </option>
          ))}
        </SelectField>
        <SelectField label="Filed" value={get("age") || "any"} onChange={(e) => set({ age: e.target.value === "any" ? "" : e.target.value })}>
          <option value="any">Any time</option>
          <option value="under_2d">In the last 2 days</option>
          <option value="2_to_7d">2–7 days ago</option>
          <option value="over_7d">Over 7 days ago</option>
        </SelectField>
        <SelectField label="Piece" value={get("pieceId")} onChange={(e) => set({ pieceId: e.target.value })}>
          <option value="">All pieces</option>
          {data?.pieces.map((p) => (
            <option key={p.id} value={p.id}>
              {p.title}
            </option>
          ))}
        </SelectField>
        <SelectField label="Sort" value={get("sort") || "oldest"} onChange={(e) => set({ sort: e.target.value === "oldest" ? "" : e.target.value })}>
          <option value="oldest">Oldest first</option>
          <option value="newest">Newest first</option>
        </SelectField>
      </div>
      {isPending || pastEnd ? <p className="text-muted">Loading claims…</p> : null}
      {isError ? <Notice tone="error" title="The queue didn't load">{error.message}</Notice> : null}
      {data && !pastEnd ? (
        <p className="text-sm text-muted" aria-live="polite">
          {data.total === 0 ? "" : `${from}–${to} of ${formatCount(data.total)} claim${data.total === 1 ? "" : "s"}`}
        </p>
      ) : null}
      {data && data.claims.length === 0 && !pastEnd ? (
        <p className="rounded-xl border border-line bg-card p-5 text-muted">
          {get("q")
            ? `No claims match “${get("q")}” with these filters.`
            : anySetBut(["sort"])
              ? "No claims match these filters."
              : "No open claims. When an owner reports damage on one of the studio's pieces, the claim appears here with its photos and a coverage check."}
        </p>
      ) : null}
      {data && data.claims.length > 0 ? (
        <ul className="divide-y divide-line overflow-hidden rounded-xl border border-line bg-card" aria-label="Claims">
          {data.claims.map((c) => (
            <li key={c.id}>
              <Link href={`/studio/claims/${c.id}`} className="grid gap-2 px-4 py-3 hover:bg-resin-soft md:grid-cols-[11rem_1fr_auto] md:items-center">
                <StateBadge state={c.state} audience="staff" className="justify-self-start" />
                <span className="min-w-0">
                  {/* One line each from md up; on a phone they wrap rather than lose the piece's name and the photo count. */}
                  <span className="block font-medium md:truncate">
                    {CLAIM_CATEGORY_LABELS[c.category]} · {c.pieceTitle}
                  </span>
                  <span className="block text-sm text-muted md:truncate">
                    {c.ownerName} · filed {formatAgo(now - Date.parse(c.createdAt))} · <SpriteIcon name="camera" className="inline size-4" /> {c.photos} photo{c.photos === 1 ? "" : "s"}
                  </span>
                </span>
                <span className={`flex items-center gap-1 text-sm ${c.answered ? "text-muted" : "font-semibold text-warn"}`}>
                  <SpriteIcon name="clock" className="size-4" />
                  {c.answered ? `first answer in ${formatWait(c.waitMs)}` : `waiting ${formatWait(c.waitMs)} for a first answer`}
                </span>
              </Link>
            </li>
          ))}
        </ul>
      ) : null}
      {data && lastPage > 1 ? (
        <nav aria-label="Pages of claims" className="flex items-center justify-between gap-3">
          <Button variant="secondary" disabled={data.page <= 1} onClick={() => set({ page: data.page - 1 > 1 ? String(data.page - 1) : "" })}>
            Previous
          </Button>
          <span className="text-sm text-muted">
            Page {data.page} of {lastPage}
          </span>
          <Button variant="secondary" disabled={data.page >= lastPage} onClick={() => set({ page: String(data.page + 1) })}>
            Next
          </Button>
        </nav>
      ) : null}
    </div>
  );
}
