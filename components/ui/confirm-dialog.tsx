"use client";

import { useEffect, useId, useRef, type ReactNode } from "react";
import { Button } from "@/components/ui/button";

/** Asks before a destructive change, with the consequence spelled out. */
export function ConfirmDialog({ open, title, children, confirmLabel, cancelLabel = "Cancel", busy, onConfirm, onCancel }: { open: boolean; title: string; children: ReactNode; confirmLabel: string; /** The way back; name it when the action is itself a cancelling ("Keep the job"). */ cancelLabel?: string; busy?: boolean; onConfirm: () => void; onCancel: () => void }) {
  const ref = useRef<HTMLDialogElement>(null);
  const titleId = useId();
  useEffect(() => {
    const d = ref.current;
    if (!d) return;
    if (open && !d.open) d.showModal();
    if (!open && d.open) d.close();
  }, [open]);
  return (
    <dialog
      ref={ref}
      onCancel={(e) => {
        e.preventDefault();
        onCancel();
      }}
      aria-labelledby={titleId}
      className="m-auto w-[calc(100%-2rem)] max-w-md rounded-xl border border-line bg-card p-5 text-ink shadow-xl backdrop:bg-ink/40"
    >
      <h2 id={titleId} className="font-display text-xl font-semibold">
        {title}
      </h2>
      <div className="mt-2 space-y-2 text-sm">{children}</div>
      <div className="mt-5 flex flex-col-reverse gap-2 sm:flex-row sm:justify-end">
        <Button variant="secondary" onClick={onCancel} disabled={busy}>
          {cancelLabel}
        </Button>
        <Button variant="danger" onClick={onConfirm} disabled={busy}>
          {busy ? "Working…" : confirmLabel}
        </Button>
      </div>
    </dialog>
  );
}
