"use client";

import { useRouter } from "next/navigation";
import { useRef, useState } from "react";
import { toast } from "sonner";
import { Button } from "@/components/ui/button";
import { SpriteIcon } from "@/components/ui/sprite-icon";
import { apiJson, isApiError } from "@/components/api-client";
import { useRefreshingMutation } from "@/components/forms/use-refreshing-mutation";

function Confirm({ text, action, onYes, onNo, busy }: { text: string; action: string; onYes: () => void; onNo: () => void; busy: boolean }) {
  return (
    <div role="alertdialog" aria-label={text} className="space-y-2 rounded-lg border border-danger/30 bg-danger-soft p-3 text-sm">
      <p className="font-semibold">{text}</p>
      <div className="flex flex-wrap gap-2">
        <Button variant="danger" disabled={busy} onClick={onYes}>
          {action}
        </Button>
        <Button variant="secondary" onClick={onNo}>
          Cancel
        </Button>
      </div>
    </div>
  );
}

/** Drawer card links, code reissue and delete/archive, each destructive one asked first. */
export function PieceActions({ pieceId, registered, archived }: { pieceId: string; registered: boolean; archived: boolean }) {
  const [ask, setAsk] = useState<null | "reissue" | "delete">(null);
  const [code, setCode] = useState<string | null>(null);
  // A confirmed step closes its question either way; a refusal is toasted.
  const asked = {
    onError: (words: string) => {
      setAsk(null);
      toast.error(words);
    },
  };

  const reissue = useRefreshingMutation(() => apiJson<{ registrationCode: string }>(`/api/pieces/${pieceId}/registration-code`, { method: "POST" }), {
    ...asked,
    onSuccess: (r) => {
      setAsk(null);
      setCode(r.registrationCode);
      toast.success("New registration code issued; the old one no longer works. Print a new drawer card.");
    },
  });
  const remove = useRefreshingMutation(() => apiJson<{ deleted: boolean; archived: boolean }>(`/api/pieces/${pieceId}`, { method: "DELETE" }), {
    ...asked,
    onSuccess: (r) => {
      setAsk(null);
      toast.success(r.deleted ? "Piece record deleted." : "The piece is registered, so it was archived instead of deleted.");
    },
    goTo: (r) => (r.deleted ? "/studio/pieces" : null),
  });
  const unarchive = useRefreshingMutation(() => apiJson(`/api/pieces/${pieceId}`, { method: "PATCH", json: { archived: false } }), {
    onError: (words) => toast.error(words),
    onSuccess: () => toast.success("Piece taken out of the archive."),
  });

  return (
    <div className="space-y-3">
      <div className="flex flex-wrap gap-2">
        <a href={`/api/pieces/${pieceId}/card.pdf`} target="_blank" rel="noopener" className="inline-flex min-h-11 items-center gap-2 rounded-lg bg-resin px-4 text-sm font-semibold text-white hover:bg-resin-dark">
          <SpriteIcon name="file-down" className="size-4" /> Drawer card (4×6 in)
        </a>
        <a href={`/api/pieces/${pieceId}/card.pdf?size=a6`} target="_blank" rel="noopener" className="inline-flex min-h-11 items-center gap-2 rounded-lg border border-line bg-card px-4 text-sm font-semibold hover:border-resin hover:text-resin">
          <SpriteIcon name="file-down" className="size-4" /> A6
        </a>
        <Button variant="secondary" onClick={() => setAsk("reissue")}>
          <SpriteIcon name="key-round" className="size-4" /> Reissue code
        </Button>
        {archived ? (
          <Button variant="secondary" onClick={() => unarchive.run(undefined)}>
            <SpriteIcon name="archive" className="size-4" /> Take out of archive
          </Button>
        ) : (
          <Button variant="secondary" onClick={() => setAsk("delete")}>
            {registered ? <SpriteIcon name="archive" className="size-4" /> : <SpriteIcon name="trash" className="size-4" />} {registered ? "Archive" : "Delete"}
          </Button>
        )}
      </div>
      {ask === "reissue" ? (
        <Confirm text="Issue a new registration code? The code on the printed card stops working at once." action="Issue a new code" busy={reissue.busy} onYes={() => reissue.run(undefined)} onNo={() => setAsk(null)} />
      ) : null}
      {ask === "delete" ? (
        <Confirm
          text={registered ? "This piece is registered to its owner, so it will be archived (kept, hidden from the registry)." : "Delete this piece record, its finish stack and photos? This cannot be undone."}
          action={registered ? "Archive piece" : "Delete piece"}
          busy={remove.busy}
          onYes={() => remove.run(undefined)}
          onNo={() => setAsk(null)}
        />
      ) : null}
      {code ? (
        <p className="rounded-lg border border-line bg-paper p-3 text-sm" role="status">
          New registration code: <span className="font-mono text-base font-semibold">{code}</span>
        </p>
      ) : null}
    </div>
  );
}

/** Photos of the finished piece: uploaded to POST /api/pieces/[id]/photos, served by /api/files. */
export function PhotoUploader({ pieceId }: { pieceId: string }) {
  const router = useRouter();
  const input = useRef<HTMLInputElement>(null);
  const [progress, setProgress] = useState<string | null>(null);
  const upload = async (list: FileList | null) => {
    if (!list?.length) return;
    const all = [...list];
    for (const [i, file] of all.entries()) {
      setProgress(`Uploading ${i + 1} of ${all.length}: ${file.name}…`);
      const body = new FormData();
      body.set("file", file);
      try {
        await apiJson(`/api/pieces/${pieceId}/photos`, { method: "POST", body });
        toast.success(`${file.name} added.`);
      } catch (e) {
        toast.error(`${file.name}: ${isApiError(e) ? e.message : "the upload failed."}`);
      }
    }
    setProgress(null);
    if (input.current) input.current.value = "";
    router.refresh();
  };
  return (
    <div className="space-y-2">
      <label className="inline-flex min-h-11 cursor-pointer items-center gap-2 rounded-lg border border-line bg-card px-4 text-sm font-semibold hover:border-resin hover:text-resin">
        <SpriteIcon name="image-plus" className="size-4" /> Add photos
        <input ref={input} type="file" accept="image/jpeg,image/png,image/webp" multiple className="sr-only" onChange={(e) => upload(e.target.files)} disabled={progress !== null} />
      </label>
      {progress ? (
        <p role="status" className="text-sm text-muted">
          {progress}
        </p>
      ) : null}
    </div>
  );
}
