"use client";

import Link from "next/link";
import { useState } from "react";
import { toast } from "sonner";
import { Button } from "@/components/ui/button";
import { Notice } from "@/components/ui/notice";
import { useActionForm } from "@/components/forms/use-action-form";
import type { ActionResult } from "@/lib/validation/action";
import type { ReleaseInput } from "@/lib/validation/owner";
import { ConfirmDialog } from "@/components/ui/confirm-dialog";
import { SpriteIcon } from "@/components/ui/sprite-icon";

type Released = { code: string; pieceId: string };

/** `planNote`: what releasing does to the care plan the owner pays for on the piece, said again in the confirm step. */
export function ReleaseForm({ action, pieceTitle, planNote = null }: { action: (v: ReleaseInput) => Promise<ActionResult<Released>>; pieceTitle: string; planNote?: string | null }) {
  const [asking, setAsking] = useState(false);
  const [released, setReleased] = useState<Released | null>(null);
  const { form, onSubmit, formError } = useActionForm({
    schema: () => import("@/lib/validation/owner").then((m) => m.releaseSchema),
    action,
    defaultValues: { confirm: false as unknown as true },
    onSuccess: (data) => {
      setAsking(false);
      setReleased(data);
      toast.success("Released. The new code is below and in your e-mail.");
    },
  });
  const { register, formState } = form;

  if (released) {
    return (
      <div className="space-y-4">
        <Notice tone="ok" title="Released for its next owner">
          Give them this registration code. It is shown only this once — we also e-mailed it to you.
        </Notice>
        <p className="break-all rounded-xl border-2 border-dashed border-resin bg-card p-4 text-center font-mono text-2xl font-semibold tracking-wider" aria-label="New registration code">
          {released.code}
        </p>
        <Button
          variant="secondary"
          className="w-full"
          onClick={async () => {
            try {
              await navigator.clipboard.writeText(released.code);
              toast.success("Code copied.");
            } catch {
              toast.error("Couldn't copy — write the code down instead.");
            }
          }}
        >
          <SpriteIcon name="copy" className="size-4" />
          Copy the code
        </Button>
        <p className="text-sm text-muted">The next owner opens Grainward, chooses “Register a piece” and types it in. The code on the old drawer card no longer works.</p>
        <Link href="/pieces" className="flex min-h-11 items-center justify-center rounded-lg bg-resin px-4 text-sm font-semibold text-white hover:bg-resin-dark">
          Back to my pieces
        </Link>
      </div>
    );
  }

  return (
    <form
      onSubmit={form.handleSubmit(() => setAsking(true))}
      noValidate
      className="space-y-4"
    >
      {formError ? (
        <Notice tone="error" title="Not released">
          {formError}
        </Notice>
      ) : null}
      <label className="flex min-h-11 items-start gap-3 rounded-lg border border-line bg-white p-3 text-sm">
        <input type="checkbox" className="mt-0.5 size-5 shrink-0 accent-[#0f5e5e]" {...register("confirm")} aria-describedby={formState.errors.confirm ? "confirm-error" : undefined} />
        <span>I am selling or giving away the {pieceTitle}, and it should leave my account.</span>
      </label>
      {formState.errors.confirm ? (
        <p id="confirm-error" role="alert" className="text-sm font-medium text-danger">
          {formState.errors.confirm.message}
        </p>
      ) : null}
      <Button type="submit" variant="danger" className="w-full">
        <SpriteIcon name="handshake" className="size-4" />
        Release this piece
      </Button>
      <ConfirmDialog
        open={asking}
        title="Release this piece?"
        confirmLabel="Yes, release it"
        busy={formState.isSubmitting}
        onCancel={() => setAsking(false)}
        onConfirm={() => void onSubmit()}
      >
        <p>The {pieceTitle} leaves your account straight away: no more reminders, and you can&apos;t log care or file claims for it.</p>
        <p>You get a new registration code to hand over. Only the next owner registering with it brings it back onto an account.</p>
        {planNote ? <p>{planNote}</p> : null}
      </ConfirmDialog>
    </form>
  );
}
