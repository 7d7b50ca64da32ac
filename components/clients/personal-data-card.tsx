"use client";

import { useState } from "react";
import { toast } from "sonner";
import { apiJson, isApiError } from "@/components/api-client";
import { useRefreshingMutation } from "@/components/forms/use-refreshing-mutation";
import { Button } from "@/components/ui/button";
import { ErrorLine } from "@/components/ui/error-line";
import { Card } from "@/components/ui/card";
import { SpriteIcon } from "@/components/ui/sprite-icon";

type Erased = { erased: { pieces: number; photos: number; claims: number; messages: number } };

/** Admins: download everything held about the client, or erase them on their request (POST …/erase). */
export function PersonalDataCard({ clientId, name, erased }: { clientId: string; name: string; erased: boolean }) {
  const [confirm, setConfirm] = useState(false);
  const [confirmError, setConfirmError] = useState<string | null>(null);
  const { run, busy, error } = useRefreshingMutation((confirmed: boolean) => apiJson<Erased>(`/api/clients/${clientId}/erase`, { method: "POST", json: { confirm: confirmed } }), {
    onSuccess: ({ erased: r }) => {
      toast.success(`Erased. ${r.pieces} piece${r.pieces === 1 ? "" : "s"} kept for the warranty record without them; ${r.photos} photo${r.photos === 1 ? "" : "s"} deleted.`);
      setConfirm(false);
    },
    // The unticked box's own sentence reads better than the form's general one.
    onError: (_, e) => setConfirmError(isApiError(e) ? (e.fieldErrors.confirm?.[0] ?? null) : null),
  });
  const erase = () => run(confirm);
  return (
    <Card className="space-y-3">
      <h2 className="font-display text-xl font-semibold">Personal data</h2>
      <p className="text-sm text-muted">When someone asks what you hold about them, or asks you to forget them.</p>
      <a href={`/api/clients/${clientId}/personal-data`} className="inline-flex min-h-11 items-center gap-2 rounded-lg border border-line bg-card px-4 text-sm font-semibold hover:border-resin hover:text-resin">
        <SpriteIcon name="download" className="size-4" /> Download everything we hold (zip)
      </a>
      {erased ? (
        <p className="text-sm">This client has been erased. Their pieces stay on record without them.</p>
      ) : (
        <div className="space-y-2 border-t border-line pt-3">
          <p className="text-sm">
            Erasing removes {name}&apos;s contact details, notes, consent history, addresses, what they wrote and their photos. Their pieces stay, without them, for your warranty record. It can&apos;t be undone.
          </p>
          <label className="flex min-h-11 items-center gap-2 text-sm">
            <input type="checkbox" checked={confirm} onChange={(e) => setConfirm(e.target.checked)} className="size-5" />
            They asked to be erased, and I understand this can&apos;t be undone
          </label>
          <ErrorLine>{error ? confirmError ?? error : null}</ErrorLine>
          <Button variant="danger" onClick={erase} disabled={busy}>
            <SpriteIcon name="trash" className="size-4" /> {busy ? "Erasing…" : "Erase this client"}
          </Button>
        </div>
      )}
    </Card>
  );
}
