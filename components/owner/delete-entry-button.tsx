"use client";

import { useRouter } from "next/navigation";
import { useState } from "react";
import { toast } from "sonner";
import { Button } from "@/components/ui/button";
import { callApi } from "@/components/api-client";
import { ConfirmDialog } from "@/components/ui/confirm-dialog";
import { SpriteIcon } from "@/components/ui/sprite-icon";

export function DeleteEntryButton({ pieceId, entryId }: { pieceId: string; entryId: string }) {
  const router = useRouter();
  const [open, setOpen] = useState(false);
  const [busy, setBusy] = useState(false);
  return (
    <>
      <Button variant="secondary" className="w-full text-danger sm:w-auto" onClick={() => setOpen(true)}>
        <SpriteIcon name="trash" className="size-4" />
        Delete this entry
      </Button>
      <ConfirmDialog
        open={open}
        title="Delete this care-log entry?"
        confirmLabel="Delete the entry"
        busy={busy}
        onCancel={() => setOpen(false)}
        onConfirm={async () => {
          setBusy(true);
          const r = await callApi(`/api/me/pieces/${pieceId}/care-log/${entryId}`, { method: "DELETE" });
          setBusy(false);
          if (!r.ok) {
            toast.error(r.message);
            return;
          }
          setOpen(false);
          toast.success("Entry deleted. The task's due date counts from the care before it again.");
          router.push(`/pieces/${pieceId}#care-log`);
          router.refresh();
        }}
      >
        <p>The task it counted for goes back to its earlier due date. Its photo is deleted too. This can&apos;t be undone.</p>
      </ConfirmDialog>
    </>
  );
}
