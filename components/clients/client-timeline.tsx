"use client";

import { useQuery } from "@tanstack/react-query";
import Link from "next/link";
import { useState } from "react";
import { apiJson } from "@/components/api-client";
import { Button } from "@/components/ui/button";
import { Notice } from "@/components/ui/notice";
import type { Timeline } from "@/lib/clients/timeline";
import { formatInstant } from "@/lib/format";
import { loadRefusalWords } from "@/components/forms/use-refreshing-mutation";

const PAGE = 50;

/** Everything that happened with the client, newest first: 50 at a time, "Show more" adds 50. */
export function ClientTimeline({ clientId }: { clientId: string }) {
  const [limit, setLimit] = useState(PAGE);
  const query = useQuery({
    queryKey: ["client-timeline", clientId, limit],
    queryFn: () => apiJson<Timeline>(`/api/clients/${clientId}/timeline?limit=${limit}`),
    placeholderData: (previous) => previous,
  });
  const data = query.data;
  return (
    <section aria-labelledby="timeline-heading" className="space-y-3">
      <h2 id="timeline-heading" className="font-display text-xl font-semibold">
        Timeline
      </h2>
      {query.isPending ? <p className="text-muted">Loading the timeline…</p> : null}
      {query.isError ? <Notice tone="error" title="The timeline didn't load">{loadRefusalWords(query.error)}</Notice> : null}
      {data && data.entries.length === 0 ? <p className="text-muted">Nothing has happened with this client yet. Deliveries, care, claims, repairs and visits will appear here.</p> : null}
      {data && data.entries.length > 0 ? (
        <ol className="divide-y divide-line overflow-hidden rounded-xl border border-line bg-card" aria-label="Timeline, newest first">
          {data.entries.map((e) => (
            <li key={e.key} className="grid gap-1 px-4 py-3 md:grid-cols-[14rem_1fr]">
              <time dateTime={e.at} className="text-sm text-muted">
                {formatInstant(e.at, e.allDay ? "UTC" : data.timeZone, { time: !e.allDay })}
              </time>
              {e.href ? (
                <Link href={e.href} className="text-resin underline underline-offset-2">
                  {e.title}
                </Link>
              ) : (
                <span>{e.title}</span>
              )}
            </li>
          ))}
        </ol>
      ) : null}
      {data?.hasMore ? (
        <Button variant="secondary" disabled={query.isFetching} onClick={() => setLimit((n) => n + PAGE)}>
          {query.isFetching ? "Loading…" : "Show more"}
        </Button>
      ) : null}
    </section>
  );
}
