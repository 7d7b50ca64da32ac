"use client";

import { useQuery } from "@tanstack/react-query";
import Link from "next/link";
import { useRouter } from "next/navigation";
import { useEffect, useRef, useState } from "react";
import { toast } from "sonner";
import { apiJson, isApiError } from "@/components/api-client";
import { useRefreshingMutation } from "@/components/forms/use-refreshing-mutation";
import { Button } from "@/components/ui/button";
import { Card } from "@/components/ui/card";
import { Notice } from "@/components/ui/notice";
import { SpriteIcon } from "@/components/ui/sprite-icon";
import { formatDate, formatInstant } from "@/lib/format";
import type { HandoverBatchProgress, HandoverCandidate } from "@/lib/pieces/handover-batch";

// The hand-over page's mailing: pick pieces whose buyer never had the hand-over mail (or all of them),
// send, and follow the mailing as it goes out (polled through the JSON API) to its summary.

const SKIP_WORDS = { no_email: "No e-mail address: won't be sent", no_consent: "No consent to service mail: won't be sent", no_buyer: "No buyer", registered: "Already registered", archived: "Archived" } as const;

export function HandoverMailing({ candidates, batches, initialBatchId, timeZone }: { candidates: HandoverCandidate[]; batches: HandoverBatchProgress[]; initialBatchId: string | null; timeZone: string }) {
  const router = useRouter();
  const [picked, setPicked] = useState<Set<string>>(new Set());
  const [active, setActive] = useState<string | null>(initialBatchId ?? (batches[0] && batches[0].state !== "done" ? batches[0].id : null));
  const sendable = candidates.filter((c) => !c.block).length;

  // The page is read again when the mailing is done (MailingProgress), not when it starts.
  const { run: start, busy } = useRefreshingMutation((json: { all: true } | { pieceIds: string[] }) => apiJson<{ batch: { id: string; total: number } }>("/api/clients/handover-batches", { method: "POST", json }), {
    refresh: "never",
    onSuccess: ({ batch }) => {
      setActive(batch.id);
      setPicked(new Set());
    },
    onError: (words) => toast.error(words),
  });

  const toggle = (id: string) =>
    setPicked((prev) => {
      const next = new Set(prev);
      if (next.has(id)) next.delete(id);
      else next.add(id);
      return next;
    });
  const allPicked = candidates.length > 0 && picked.size === candidates.length;

  return (
    <div className="space-y-6">
      {active ? <MailingProgress batchId={active} timeZone={timeZone} onDone={() => router.refresh()} /> : null}

      <Card className="p-5">
        <h2 className="text-lg font-semibold">Not yet sent</h2>
        {candidates.length === 0 ? (
          <p className="mt-2 text-sm text-muted">Every piece with a buyer has had its hand-over mail (or is registered). Pieces you record with a buyer, or import with buyer columns, appear here until their mail goes out.</p>
        ) : (
          <>
            <p className="mt-1 text-sm text-muted">
              {candidates.length} piece{candidates.length === 1 ? "" : "s"} with a buyer who never had the hand-over mail; {sendable} can get it now. Buyers without an e-mail or without consent to service mail are skipped and counted.
            </p>
            <div className="mt-4 flex flex-wrap gap-3">
              <Button disabled={busy || picked.size === 0} onClick={() => start({ pieceIds: [...picked] })}>
                <SpriteIcon name="mail" className="size-4" /> Send to the {picked.size || ""} picked
              </Button>
              <Button variant="secondary" disabled={busy} onClick={() => start({ all: true })}>
                Send to all not yet sent ({candidates.length})
              </Button>
            </div>
            <div className="mt-4 overflow-x-auto">
              <table className="w-full text-left text-sm">
                <caption className="sr-only">Pieces whose buyer has not had the hand-over mail</caption>
                <thead>
                  <tr className="border-b border-line text-muted">
                    <th scope="col" className="w-12 py-2">
                      <input type="checkbox" className="size-5" aria-label="Pick every piece" checked={allPicked} onChange={() => setPicked(allPicked ? new Set() : new Set(candidates.map((c) => c.pieceId)))} />
                    </th>
                    <th scope="col" className="py-2 pr-3">Piece</th>
                    <th scope="col" className="py-2 pr-3">Buyer</th>
                    <th scope="col" className="py-2 pr-3">Delivered</th>
                    <th scope="col" className="py-2">Mail</th>
                  </tr>
                </thead>
                <tbody>
                  {candidates.map((c) => (
                    <tr key={c.pieceId} className="border-b border-line/60">
                      <td className="py-2">
                        <input type="checkbox" className="size-5" aria-label={`Pick ${c.title}`} checked={picked.has(c.pieceId)} onChange={() => toggle(c.pieceId)} />
                      </td>
                      <td className="py-2 pr-3">
                        <Link className="text-resin underline underline-offset-2" href={`/studio/pieces/${c.pieceId}`}>
                          {c.title}
                        </Link>
                      </td>
                      <td className="py-2 pr-3">
                        <Link className="text-resin underline underline-offset-2" href={`/studio/clients/${c.clientId}`}>
                          {c.clientName}
                        </Link>
                        {c.email ? <span className="block text-xs text-muted">{c.email}</span> : null}
                      </td>
                      <td className="py-2 pr-3 whitespace-nowrap">{formatDate(c.deliveredOn)}</td>
                      <td className="py-2">{c.block ? <span className="text-muted">{SKIP_WORDS[c.block]}</span> : "Ready to send"}</td>
                    </tr>
                  ))}
                </tbody>
              </table>
            </div>
          </>
        )}
      </Card>

      {batches.filter((b) => b.id !== active).length > 0 ? (
        <Card className="p-5">
          <h2 className="text-lg font-semibold">Earlier mailings</h2>
          <ul className="mt-2 space-y-1 text-sm">
            {batches
              .filter((b) => b.id !== active)
              .map((b) => (
                <li key={b.id}>
                  <button type="button" className="min-h-11 text-left text-resin underline underline-offset-2" onClick={() => setActive(b.id)}>
                    {formatInstant(b.createdAt, timeZone, { time: true })}: {b.sent} sent, {b.skipped.reduce((a, s) => a + s.count, 0)} skipped, {b.failed.length} failed{b.state === "done" ? "" : " (still going)"}
                  </button>
                </li>
              ))}
          </ul>
        </Card>
      ) : null}
    </div>
  );
}

function MailingProgress({ batchId, timeZone, onDone }: { batchId: string; timeZone: string; onDone: () => void }) {
  const reported = useRef<string | null>(null);
  const { data, error } = useQuery({
    queryKey: ["handover-batch", batchId],
    queryFn: () => apiJson<{ batch: HandoverBatchProgress }>(`/api/clients/handover-batches/${batchId}`).then((r) => r.batch),
    refetchInterval: (q) => (q.state.data?.state === "done" ? false : 1000),
  });
  const done = data?.state === "done";
  useEffect(() => {
    // Once per mailing: the list of pieces not yet sent is read again.
    if (done && reported.current !== batchId) {
      reported.current = batchId;
      onDone();
    }
  }, [done, batchId, onDone]);
  if (error) return <Notice tone="error">{isApiError(error) ? error.message : "The mailing's progress could not be read."}</Notice>;
  if (!data) return <p className="text-sm text-muted">Starting the mailing…</p>;
  const skipped = data.skipped.reduce((a, s) => a + s.count, 0);
  return (
    <Card className="p-5" aria-live="polite">
      <h2 className="text-lg font-semibold">{data.state === "done" ? "Mailing finished" : "Sending hand-over mail…"}</h2>
      <p className="mt-1 text-sm text-muted">Started {formatInstant(data.createdAt, timeZone, { time: true })}. You can leave this page; the mail keeps going out.</p>
      <progress className="mt-3 h-3 w-full accent-resin" max={data.total} value={data.finished} aria-label="Hand-over mail sent so far" />
      <p className="mt-1 text-sm" data-testid="mailing-count">
        {data.finished} of {data.total} done
      </p>
      <dl className="mt-4 grid gap-3 text-sm sm:grid-cols-3">
        <div>
          <dt className="font-semibold">Sent</dt>
          <dd data-testid="mailing-sent">{data.sent}</dd>
        </div>
        <div>
          <dt className="font-semibold">Skipped</dt>
          <dd data-testid="mailing-skipped">
            {skipped}
            {data.skipped.length ? (
              <ul className="mt-1 text-muted">
                {data.skipped.map((s) => (
                  <li key={s.reason}>
                    {s.label}: {s.count}
                  </li>
                ))}
              </ul>
            ) : null}
          </dd>
        </div>
        <div>
          <dt className="font-semibold">Failed</dt>
          <dd data-testid="mailing-failed">
            {data.failed.length}
            {data.failed.length ? (
              <ul className="mt-1 text-muted">
                {data.failed.map((f) => (
                  <li key={f.pieceId}>
                    <Link className="text-resin underline underline-offset-2" href={`/studio/pieces/${f.pieceId}`}>
                      {f.title}
                    </Link>
                    : {f.reason}
                  </li>
                ))}
              </ul>
            ) : null}
          </dd>
        </div>
      </dl>
    </Card>
  );
}
