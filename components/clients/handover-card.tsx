"use client";

import Link from "next/link";
import { toast } from "sonner";
import { apiJson } from "@/components/api-client";
import { useRefreshingMutation } from "@/components/forms/use-refreshing-mutation";
import { Button } from "@/components/ui/button";
import { ErrorLine } from "@/components/ui/error-line";
import { Card } from "@/components/ui/card";
import { SpriteIcon } from "@/components/ui/sprite-icon";
import type { HandoverStatus } from "@/lib/pieces/handover";
import { formatInstant } from "@/lib/format";

/** The piece page's hand-over mail: to whom, sent when (and how often), link opened, registered; send or resend. */
export function HandoverCard({ pieceId, status }: { pieceId: string; status: HandoverStatus }) {
  const { run, busy, error } = useRefreshingMutation(() => apiJson(`/api/pieces/${pieceId}/handover`, { method: "POST" }), {
    onSuccess: () => toast.success(status.sendCount ? "Sent again, with a fresh link. The earlier link no longer works." : "Hand-over mail sent."),
  });
  const send = () => run(undefined);
  // Always with the zone's name: staff may read this from anywhere.
  const at = (iso: string) => formatInstant(iso, status.timeZone, { time: true });
  const steps: [string, string | null][] = [
    ["Sent", status.lastSentAt ? `${at(status.lastSentAt)}${status.sendCount > 1 ? ` (sent ${status.sendCount} times, first ${at(status.firstSentAt!)})` : ""}` : null],
    ["Link opened", status.openedAt ? at(status.openedAt) : null],
    ["Registered through the link", status.registeredAt ? at(status.registeredAt) : null],
  ];
  return (
    <Card className="space-y-3">
      <h2 className="font-display text-xl font-semibold">Hand-over mail</h2>
      <p className="text-sm">
        {status.client ? (
          <>
            Buyer:{" "}
            <Link href={`/studio/clients/${status.client.id}`} className="text-resin underline">
              {status.client.name}
            </Link>
            {status.client.email ? <span className="break-all"> · {status.client.email}</span> : null}
          </>
        ) : (
          "No buyer recorded."
        )}
      </p>
      {status.sendCount ? (
        <dl className="space-y-1 text-sm" aria-label="Hand-over mail">
          {steps.map(([label, value]) => (
            <div key={label} className="flex justify-between gap-3">
              <dt className="text-muted">{label}</dt>
              <dd className="text-right font-medium">{value ?? "Not yet"}</dd>
            </div>
          ))}
        </dl>
      ) : (
        <p className="text-sm text-muted">Not sent.</p>
      )}
      {status.blockMessage ? <p className="text-sm text-muted">{status.blockMessage}</p> : null}
      <ErrorLine>{error}</ErrorLine>
      {!status.block ? (
        <Button variant="secondary" onClick={send} disabled={busy}>
          <SpriteIcon name="mail" className="size-4" /> {busy ? "Sending…" : status.sendCount ? "Send it again" : "Send the hand-over mail"}
        </Button>
      ) : null}
      <p className="text-xs text-muted">The drawer card keeps its code for whoever owns the piece later.</p>
    </Card>
  );
}
