"use client";

import { keepPreviousData, useQuery } from "@tanstack/react-query";
import Link from "next/link";
import { useEffect, useMemo } from "react";
import { apiJson, isApiError } from "@/components/api-client";
import { loadRefusalWords } from "@/components/forms/use-refreshing-mutation";
import { useUrlFilters } from "@/components/tables/use-url-filters";
import { Button, ButtonLink } from "@/components/ui/button";
import { cn } from "@/components/ui/cn";
import { SelectField } from "@/components/ui/field";
import { Notice } from "@/components/ui/notice";
import { SpriteIcon } from "@/components/ui/sprite-icon";
import type { ClientPage } from "@/lib/clients/list";
import { formatCount, formatInstant } from "@/lib/format";
import { CLIENT_FILTERS, CLIENT_SORTS } from "@/lib/clients/vocabulary";

const KEYS = ["q", "filter", "sort", "dir", "page"] as const;
/** The values each listed key can take (lib/validation/clients.ts clientListQuerySchema); others in a link read as unset. */
const KNOWN = { filter: CLIENT_FILTERS, sort: CLIENT_SORTS, dir: ["asc", "desc"] } as const;

/** The studio's clients: search, filters, sort and page live in the URL; rows come from GET /api/clients. */
/** `timeZone`: the studio's, in which the last-change dates are read. */
export function ClientsTable({ timeZone }: { timeZone: string }) {
  const { qs, get, set, clear, typed, setTyped } = useUrlFilters(KEYS, KNOWN);

  const query = useQuery({ queryKey: ["clients", qs], queryFn: () => apiJson<ClientPage>(`/api/clients${qs ? `?${qs}` : ""}`), placeholderData: keepPreviousData });
  const data = query.data;
  const sort = get("sort") || "name";
  const dir = get("dir") || (sort === "name" ? "asc" : "desc");
  const filtersOn = !!(get("q") || get("filter"));
  const from = data && data.total ? (data.page - 1) * data.pageSize + 1 : 0;
  const to = data ? from + data.rows.length - 1 : 0;
  const exportQs = useMemo(() => {
    const p = new URLSearchParams(qs);
    p.delete("page");
    return p.toString();
  }, [qs]);
  const lastPage = data ? Math.max(1, Math.ceil(data.total / data.pageSize)) : 1;
  // A page past the end (an old link, or clients merged since): go to the last page, never "No clients yet".
  const pastEnd = !!data && data.rows.length === 0 && data.total > 0 && data.page > 1;
  useEffect(() => {
    if (pastEnd) set({ page: lastPage > 1 ? String(lastPage) : null });
    // eslint-disable-next-line react-hooks/exhaustive-deps -- only a page found past the end moves the URL
  }, [pastEnd, lastPage]);

  const sortButton = (key: string, label: string) => {
    const active = sort === key;
    return (
      <button
        type="button"
        onClick={() => set({ sort: key === "name" ? null : key, dir: active ? (dir === "asc" ? "desc" : "asc") : null })}
        className="inline-flex min-h-11 items-center gap-1 font-semibold hover:text-resin"
        aria-label={`Sort by ${label.toLowerCase()}${active ? (dir === "asc" ? ", now ascending" : ", now descending") : ""}`}
      >
        {label}
        <SpriteIcon name={active && dir === "asc" ? "arrow-up" : "arrow-down"} className={cn("size-4", active ? "opacity-100" : "opacity-30")} />
      </button>
    );
  };

  return (
    <div className="space-y-4">
      <form role="search" onSubmit={(e) => (e.preventDefault(), set({ q: typed.trim() || null }))} className="space-y-3 rounded-xl border border-line bg-card p-4">
        <label htmlFor="client-search" className="block text-sm font-medium">
          Search clients
        </label>
        <div className="relative">
          <SpriteIcon name="search" className="pointer-events-none absolute left-3 top-1/2 size-5 -translate-y-1/2 text-muted" />
          <input
            id="client-search"
            type="search"
            value={typed}
            maxLength={200}
            onChange={(e) => setTyped(e.target.value)}
            placeholder="Name, e-mail, phone or the title of one of their pieces"
            className="block min-h-11 w-full rounded-lg border border-line bg-white py-2 pl-10 pr-3 text-base focus:border-resin"
          />
        </div>
        <div className="grid grid-cols-1 gap-3 sm:grid-cols-2 lg:grid-cols-3">
          <SelectField label="Show" value={get("filter")} onChange={(e) => set({ filter: e.target.value || null })}>
            <option value="">Everyone</option>
            <option value="account">With a Grainward account</option>
            <option value="invited">Sent the hand-over mail, not registered yet</option>
            <option value="unregistered">With a piece nobody has registered</option>
            <option value="open_claims">With an open claim</option>
            <option value="paused">Care reminders paused</option>
          </SelectField>
          <SelectField label="Sort by" value={sort} onChange={(e) => set({ sort: e.target.value === "name" ? null : e.target.value, dir: null })}>
            <option value="name">Name</option>
            <option value="newest">Newest client</option>
            <option value="updated">Last changed</option>
          </SelectField>
          <div className="flex items-end">
            {/* The export takes the search and filter, not the page: every client they find. */}
            <a href={`/api/clients/export.csv${exportQs ? `?${exportQs}` : ""}`} className="inline-flex min-h-11 items-center gap-2 rounded-lg border border-line bg-card px-4 text-sm font-semibold hover:border-resin hover:text-resin">
              <SpriteIcon name="download" className="size-4" /> Export these as CSV
            </a>
          </div>
          {filtersOn ? (
            <div className="flex items-end">
              <Button variant="ghost" onClick={clear}>
                <SpriteIcon name="x" className="size-4" /> Clear search and filter
              </Button>
            </div>
          ) : null}
        </div>
      </form>

      <div aria-live="polite" className="text-sm text-muted">
        {query.isPending || pastEnd ? "Loading clients…" : data && data.total > 0 ? `${from}–${to} of ${data.totalIsCapped ? `more than ${formatCount(data.total)}` : formatCount(data.total)} client${data.total === 1 ? "" : "s"}${data.totalIsCapped ? " — add a word or a filter to narrow the search" : ""}` : null}
        {query.isFetching && !query.isPending ? " · updating…" : null}
      </div>

      {query.isError ? (
        <Notice tone="error" title={isApiError(query.error) && query.error.status === 400 ? "Check the search" : "The clients could not be loaded"}>
          {/* What is wrong with the search ("Search for at most 200 characters."), not only that something is. */}
          <p>{loadRefusalWords(query.error)}</p>
          <Button variant="secondary" className="mt-2" onClick={() => query.refetch()}>
            Try again
          </Button>
        </Notice>
      ) : pastEnd ? null : data && data.rows.length === 0 ? (
        <div className="rounded-xl border border-dashed border-line bg-card p-8 text-center">
          {filtersOn ? (
            <>
              <p className="font-semibold">No clients match this search.</p>
              <p className="mt-1 text-muted">Try fewer words or another filter, or clear them.</p>
            </>
          ) : (
            <>
              <p className="font-semibold">No clients yet.</p>
              <p className="mt-1 text-muted">
                The people you sell to and serve appear here, with their pieces and everything that happened with them. Owners who register a piece are added on their own.
              </p>
              <div className="mt-4 flex justify-center">
                <ButtonLink href="/studio/clients/new">Add a client</ButtonLink>
              </div>
            </>
          )}
        </div>
      ) : data ? (
        <>
          <table className="hidden w-full border-separate border-spacing-0 overflow-hidden rounded-xl border border-line bg-card text-left md:table">
            <caption className="sr-only">Clients</caption>
            <thead className="text-sm">
              <tr className="[&>th]:border-b [&>th]:border-line [&>th]:px-4 [&>th]:py-1">
                <th scope="col" aria-sort={sort === "name" ? (dir === "asc" ? "ascending" : "descending") : undefined}>
                  {sortButton("name", "Name")}
                </th>
                <th scope="col">Phone</th>
                <th scope="col">Pieces</th>
                <th scope="col">Open claims</th>
                <th scope="col" aria-sort={sort === "updated" ? (dir === "asc" ? "ascending" : "descending") : undefined}>
                  {sortButton("updated", "Last changed")}
                </th>
              </tr>
            </thead>
            <tbody>
              {data.rows.map((r) => (
                <tr key={r.id} className="align-top hover:bg-resin-soft/60 [&>td]:border-b [&>td]:border-line [&>td]:px-4 [&>td]:py-3">
                  <td>
                    <Link href={`/studio/clients/${r.id}`} className="font-semibold text-resin underline underline-offset-2">
                      {r.name}
                    </Link>
                    <p className="text-sm text-muted">
                      {r.email || "No e-mail"}
                      {r.hasAccount ? " · has an account" : ""}
                    </p>
                  </td>
                  <td className="text-sm whitespace-nowrap">{r.phoneDisplay || <span className="text-muted">—</span>}</td>
                  <td className="text-sm">
                    {r.pieces}
                    {r.unregistered ? <span className="text-muted"> · {r.unregistered} not registered</span> : null}
                  </td>
                  <td className="text-sm">{r.openClaims || <span className="text-muted">—</span>}</td>
                  <td className="text-sm whitespace-nowrap">{formatInstant(r.updatedAt, timeZone)}</td>
                </tr>
              ))}
            </tbody>
          </table>
          <ul className="space-y-3 md:hidden">
            {data.rows.map((r) => (
              <li key={r.id}>
                <Link href={`/studio/clients/${r.id}`} className="block rounded-xl border border-line bg-card p-4 hover:border-resin">
                  <p className="font-semibold">{r.name}</p>
                  <p className="text-sm text-muted">{[r.email, r.phoneDisplay].filter(Boolean).join(" · ") || "No e-mail or phone"}</p>
                  <p className="text-sm text-muted">
                    {r.pieces} piece{r.pieces === 1 ? "" : "s"}
                    {r.openClaims ? ` · ${r.openClaims} open claim${r.openClaims === 1 ? "" : "s"}` : ""}
                  </p>
                </Link>
              </li>
            ))}
          </ul>
          {lastPage > 1 ? (
            <nav aria-label="Pages of clients" className="flex items-center justify-between gap-2">
              <Button variant="secondary" disabled={data.page <= 1} onClick={() => set({ page: data.page - 1 > 1 ? String(data.page - 1) : null })}>
                <SpriteIcon name="chevron-left" className="size-4" /> Previous
              </Button>
              <span className="text-sm text-muted">
                Page {data.page} of {lastPage}
              </span>
              <Button variant="secondary" disabled={data.page >= lastPage} onClick={() => set({ page: String(data.page + 1) })}>
                Next <SpriteIcon name="chevron-right" className="size-4" />
              </Button>
            </nav>
          ) : null}
        </>
      ) : null}
    </div>
  );
}
