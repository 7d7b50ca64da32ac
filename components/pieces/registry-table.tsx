"use client";

import { keepPreviousData, useQuery } from "@tanstack/react-query";
import Link from "next/link";
import { useEffect, useState } from "react";
import { apiJson, isApiError } from "@/components/api-client";
import { useUrlFilters } from "@/components/tables/use-url-filters";
import { Button, ButtonLink } from "@/components/ui/button";
import { cn } from "@/components/ui/cn";
import { Notice } from "@/components/ui/notice";
import { SpriteIcon } from "@/components/ui/sprite-icon";
import { SPECIES } from "@/lib/care/species";
import { FINISH_CLASSES, FINISH_CLASS_LABELS, PIECE_KINDS, PIECE_KIND_LABELS } from "@/lib/care/vocabulary";
import type { RegistryPage, RegistryRow } from "@/lib/pieces/registry";
import { CardPrintBar } from "./card-print-bar";
import { CareStatus, RegistrationStatus } from "./status";
import { formatCount, formatDate } from "@/lib/format";
import { PAGE_SIZES, SORTS } from "@/lib/validation/piece-list-keys";
import { loadRefusalWords } from "@/components/forms/use-refreshing-mutation";

const FILTER_KEYS = ["q", "kind", "species", "finishClass", "registered", "dueBefore", "warranty", "archived", "sort", "dir", "page", "pageSize"] as const;
/** The values each listed key can take (lib/validation/pieces.ts pieceListQuerySchema); others in a link read as unset. */
const KNOWN = {
  kind: PIECE_KINDS,
  species: SPECIES.map((s) => s.id),
  finishClass: FINISH_CLASSES,
  registered: ["yes", "no"],
  warranty: ["active", "ended"],
  archived: ["hide", "only"],
  sort: SORTS,
  dir: ["asc", "desc"],
  pageSize: PAGE_SIZES,
} as const;

const selectCls = "min-h-11 rounded-lg border border-line bg-white px-3 py-2 text-sm text-ink focus:border-resin";

/** The registry: all table state lives in the URL, so a view can be shared and survives a reload. */
export function RegistryTable() {
  const { qs, get: v, set, clear, anySetBut, typed, setTyped } = useUrlFilters(FILTER_KEYS, KNOWN);

  // Pieces ticked for printing their drawer cards; kept across pages and filters until cleared.
  const [chosen, setChosen] = useState<ReadonlySet<string>>(new Set());
  const toggle = (ids: string[], on: boolean) =>
    setChosen((prev) => {
      const next = new Set(prev);
      for (const id of ids) {
        if (on) next.add(id);
        else next.delete(id);
      }
      return next;
    });


  const query = useQuery({
    queryKey: ["pieces", qs],
    queryFn: ({ signal }) => apiJson<RegistryPage>(`/api/pieces${qs ? `?${qs}` : ""}`, { signal }),
    placeholderData: keepPreviousData,
  });

  const data = query.data;
  const sort = v("sort") || (v("q") ? "created" : "delivered");
  const dir = v("dir") || (sort === "title" || sort === "next_due" ? "asc" : "desc");
  const filtersOn = anySetBut(["sort", "dir", "page", "pageSize"]);
  const exportQs = new URLSearchParams(qs);
  exportQs.delete("page");
  exportQs.delete("pageSize");

  const sortButton = (key: string, label: string) => {
    const active = sort === key;
    return (
      <button
        type="button"
        onClick={() => set({ sort: key, dir: active ? (dir === "asc" ? "desc" : "asc") : key === "title" || key === "next_due" ? "asc" : "desc" })}
        className="inline-flex min-h-11 items-center gap-1 font-semibold hover:text-resin"
        aria-label={`Sort by ${label.toLowerCase()}${active ? (dir === "asc" ? ", now ascending" : ", now descending") : ""}`}
      >
        {label}
        <SpriteIcon name={active && dir === "asc" ? "arrow-up" : "arrow-down"} className={cn("size-4", active ? "opacity-100" : "opacity-30")} />
      </button>
    );
  };

  const from = data ? (data.page - 1) * data.pageSize + 1 : 0;
  const to = data ? Math.min(data.total, from + data.rows.length - 1) : 0;
  const lastPage = data ? Math.max(1, Math.ceil(data.total / data.pageSize)) : 1;
  // A page past the end (an old link, or pieces archived since): go to the last page, never "No pieces recorded yet".
  const pastEnd = !!data && data.rows.length === 0 && data.total > 0 && data.page > 1;
  useEffect(() => {
    if (pastEnd) set({ page: lastPage > 1 ? String(lastPage) : null });
    // eslint-disable-next-line react-hooks/exhaustive-deps -- only a page found past the end moves the URL
  }, [pastEnd, lastPage]);

  return (
    <div className="space-y-4">
      <form role="search" onSubmit={(e) => (e.preventDefault(), set({ q: typed.trim() || null }))} className="space-y-3 rounded-xl border border-line bg-card p-4">
        <label htmlFor="registry-search" className="block text-sm font-medium">
          Search pieces
        </label>
        <div className="relative">
          <SpriteIcon name="search" className="pointer-events-none absolute left-3 top-1/2 size-5 -translate-y-1/2 text-muted" />
          <input
            id="registry-search"
            type="search"
            value={typed}
            onChange={(e) => setTyped(e.target.value)}
            placeholder="Title, species, owner name or e-mail, notes — or a whole registration code"
            className="block min-h-11 w-full rounded-lg border border-line bg-white py-2 pl-10 pr-3 text-base focus:border-resin"
          />
        </div>
        <div className="grid grid-cols-1 gap-3 sm:grid-cols-2 lg:grid-cols-4">
          <Filter label="Kind" value={v("kind")} onChange={(x) => set({ kind: x })}>
            <option value="">Any kind</option>
            {PIECE_KINDS.map((k) => (
              <option key={k} value={k}>
                {PIECE_KIND_LABELS[k]}
              </option>
            ))}
          </Filter>
          <Filter label="Species" value={v("species")} onChange={(x) => set({ species: x })}>
            <option value="">Any species</option>
            {SPECIES.map((s) => (
              <option key={s.id} value={s.id}>
                {s.commonName}
              </option>
            ))}
          </Filter>
          <Filter label="Finish class" value={v("finishClass")} onChange={(x) => set({ finishClass: x })}>
            <option value="">Any finish</option>
            {FINISH_CLASSES.map((c) => (
              <option key={c} value={c}>
                {FINISH_CLASS_LABELS[c]}
              </option>
            ))}
          </Filter>
          <Filter label="Registration" value={v("registered")} onChange={(x) => set({ registered: x })}>
            <option value="">Registered or not</option>
            <option value="yes">Registered</option>
            <option value="no">Not registered</option>
          </Filter>
          <div className="space-y-1">
            <label htmlFor="f-due" className="block text-sm font-medium">
              Next care due by
            </label>
            <input id="f-due" type="date" value={v("dueBefore")} onChange={(e) => set({ dueBefore: e.target.value || null })} className={cn(selectCls, "w-full")} />
          </div>
          <Filter label="Warranty" value={v("warranty")} onChange={(x) => set({ warranty: x })}>
            <option value="">Any</option>
            <option value="active">Under warranty</option>
            <option value="ended">Not under warranty</option>
          </Filter>
          <Filter label="Archive" value={v("archived")} onChange={(x) => set({ archived: x })}>
            <option value="">Current pieces</option>
            <option value="only">Archived pieces</option>
          </Filter>
          <Filter label="Sort by" value={sort} onChange={(x) => set({ sort: x, dir: null })}>
            {v("q") ? <option value="relevance">Best match</option> : null}
            <option value="delivered">Delivery date</option>
            <option value="title">Title</option>
            <option value="next_due">Next care due</option>
            <option value="created">Newest recorded</option>
          </Filter>
        </div>
        <div className="flex flex-wrap items-center gap-2">
          {filtersOn ? (
            <Button variant="ghost" onClick={clear}>
              <SpriteIcon name="x" className="size-4" /> Clear search and filters
            </Button>
          ) : null}
          <a href={`/api/pieces/export.csv${exportQs.size ? `?${exportQs}` : ""}`} className="ml-auto inline-flex min-h-11 items-center gap-2 rounded-lg border border-line bg-card px-4 text-sm font-semibold hover:border-resin hover:text-resin">
            <SpriteIcon name="download" className="size-4" /> Export these as CSV
          </a>
        </div>
      </form>

      <CardPrintBar selected={[...chosen]} onClear={() => setChosen(new Set())} />

      <div aria-live="polite" className="text-sm text-muted">
        {query.isPending || pastEnd ? "Loading pieces…" : data ? (data.total === 0 ? (filtersOn ? "No pieces match." : null) : `${from}–${to} of ${data.totalIsCapped ? `more than ${formatCount(data.total)}` : formatCount(data.total)} piece${data.total === 1 ? "" : "s"}${data.totalIsCapped ? " — add a word or a filter to narrow the search" : ""}${data.matchedBy === "code" ? " · found by registration code" : ""}`) : null}
        {query.isFetching && !query.isPending ? " · updating…" : null}
      </div>

      {query.isError ? (
        <Notice tone="error" title={isApiError(query.error) && query.error.status === 400 ? "Check the search" : "The registry could not be loaded"}>
          <p>{loadRefusalWords(query.error)}</p>
          <Button variant="secondary" className="mt-2" onClick={() => query.refetch()}>
            Try again
          </Button>
        </Notice>
      ) : query.isPending || pastEnd ? (
        <ul aria-hidden className="space-y-2">
          {Array.from({ length: 5 }, (_, i) => (
            <li key={i} className="h-16 animate-pulse rounded-xl border border-line bg-card" />
          ))}
        </ul>
      ) : data && data.rows.length === 0 ? (
        <div className="rounded-xl border border-dashed border-line bg-card p-8 text-center">
          {filtersOn ? (
            <>
              <p className="font-semibold">No pieces match this search.</p>
              <p className="mt-1 text-muted">Try fewer words, another filter, or clear them.</p>
            </>
          ) : (
            <>
              <p className="font-semibold">No pieces recorded yet.</p>
              <p className="mt-1 text-muted">Record a delivered piece, or import earlier deliveries from a spreadsheet.</p>
              <div className="mt-4 flex justify-center gap-2">
                <ButtonLink href="/studio/pieces/new">New piece</ButtonLink>
                <ButtonLink href="/studio/pieces/import" variant="secondary">
                  Import CSV
                </ButtonLink>
              </div>
            </>
          )}
        </div>
      ) : data ? (
        <>
          <table className="hidden w-full border-separate border-spacing-0 overflow-hidden rounded-xl border border-line bg-card text-left md:table">
            <thead className="text-sm">
              <tr className="[&>th]:border-b [&>th]:border-line [&>th]:px-4 [&>th]:py-1">
                <th scope="col" className="w-12">
                  <Tick
                    label="Choose every piece on this page"
                    checked={data.rows.length > 0 && data.rows.every((r) => chosen.has(r.id))}
                    onChange={(on) => toggle(data.rows.map((r) => r.id), on)}
                  />
                </th>
                <th scope="col">{sortButton("title", "Piece")}</th>
                <th scope="col">Species and finish</th>
                <th scope="col">{sortButton("delivered", "Delivered")}</th>
                <th scope="col">Owner</th>
                <th scope="col">{sortButton("next_due", "Next care")}</th>
              </tr>
            </thead>
            <tbody>
              {data.rows.map((r) => (
                <tr key={r.id} className="align-top hover:bg-resin-soft/60 [&>td]:border-b [&>td]:border-line [&>td]:px-4 [&>td]:py-3">
                  <td className="!py-1">
                    <Tick label={`Choose ${r.title}`} checked={chosen.has(r.id)} onChange={(on) => toggle([r.id], on)} />
                  </td>
                  <td>
                    <Link href={`/studio/pieces/${r.id}`} className="font-semibold text-resin underline underline-offset-2">
                      {r.title}
                    </Link>
                    <p className="text-sm text-muted">
                      {PIECE_KIND_LABELS[r.kind]}
                      {r.archived ? " · archived" : ""}
                    </p>
                  </td>
                  <td className="text-sm">
                    <p>{[r.primarySpecies, r.secondarySpecies].filter(Boolean).join(" + ")}</p>
                    <p className="text-muted">{r.finishClasses.map((c) => FINISH_CLASS_LABELS[c]).join(", ") || "No finish layers yet"}</p>
                  </td>
                  <td className="text-sm whitespace-nowrap">{formatDate(r.deliveredOn, { short: true })}</td>
                  <td className="text-sm">
                    <RegistrationStatus registered={r.registered} />
                    {r.owner ? <p className="text-muted">{r.owner.name}</p> : null}
                  </td>
                  <td className="text-sm">
                    <NextCare row={r} />
                  </td>
                </tr>
              ))}
            </tbody>
          </table>
          <ul className="space-y-3 md:hidden">
            {data.rows.map((r) => (
              <li key={r.id} className="flex items-start gap-2">
                <Tick label={`Choose ${r.title}`} checked={chosen.has(r.id)} onChange={(on) => toggle([r.id], on)} />
                <Link href={`/studio/pieces/${r.id}`} className="block flex-1 rounded-xl border border-line bg-card p-4 hover:border-resin">
                  <p className="font-semibold">{r.title}</p>
                  <p className="text-sm text-muted">
                    {PIECE_KIND_LABELS[r.kind]} · {r.primarySpecies} · delivered {formatDate(r.deliveredOn, { short: true })}
                  </p>
                  <div className="mt-2 flex flex-wrap items-center gap-x-4 gap-y-1 text-sm">
                    <RegistrationStatus registered={r.registered} />
                    <NextCare row={r} />
                  </div>
                </Link>
              </li>
            ))}
          </ul>
          {/* Previous, the page and Next share one row on a phone; the page size takes the next row there. */}
          <nav aria-label="Pages" className="flex flex-wrap items-center gap-2">
            <Button variant="secondary" disabled={data.page <= 1} onClick={() => set({ page: String(data.page - 1) })}>
              <SpriteIcon name="chevron-left" className="size-4" /> Previous
            </Button>
            <span className="flex-1 text-center text-sm text-muted sm:flex-none sm:px-2">
              Page {data.page} of {lastPage}
            </span>
            <Button variant="secondary" disabled={data.page >= lastPage} onClick={() => set({ page: String(data.page + 1) })}>
              Next <SpriteIcon name="chevron-right" className="size-4" />
            </Button>
            <div className="w-full sm:ml-auto sm:w-auto">
              <label htmlFor="page-size" className="sr-only">
                Rows per page
              </label>
              <select id="page-size" value={String(data.pageSize)} onChange={(e) => set({ pageSize: e.target.value === "25" ? null : e.target.value })} className={selectCls}>
                {[10, 25, 50, 100].map((n) => (
                  <option key={n} value={n}>
                    {n} a page
                  </option>
                ))}
              </select>
            </div>
          </nav>
        </>
      ) : null}
    </div>
  );
}

/** A 44 px tap target around a checkbox, named for the piece it chooses. */
function Tick({ label, checked, onChange }: { label: string; checked: boolean; onChange: (on: boolean) => void }) {
  return (
    <label className="inline-flex size-11 cursor-pointer items-center justify-center">
      <input type="checkbox" aria-label={label} checked={checked} onChange={(e) => onChange(e.target.checked)} className="size-5 accent-resin" />
    </label>
  );
}

function NextCare({ row }: { row: RegistryRow }) {
  if (!row.nextCare) return <span className="text-muted">—</span>;
  return (
    <span className="inline-flex flex-wrap items-center gap-x-2">
      <CareStatus status={row.nextCare.status} />
      <span>
        {row.nextCare.label} · {formatDate(row.nextCare.dueOn, { short: true })}
      </span>
    </span>
  );
}

function Filter({ label, value, onChange, children }: { label: string; value: string; onChange: (v: string | null) => void; children: React.ReactNode }) {
  const id = `f-${label.toLowerCase().replace(/\W+/g, "-")}`;
  return (
    <div className="space-y-1">
      <label htmlFor={id} className="block text-sm font-medium">
        {label}
      </label>
      <select id={id} value={value} onChange={(e) => onChange(e.target.value || null)} className={cn(selectCls, "w-full")}>
        {children}
      </select>
    </div>
  );
}
