"use client";

import type { FormEventHandler, ReactNode } from "react";
import { Button } from "@/components/ui/button";
import { Notice } from "@/components/ui/notice";
import { SpriteIcon } from "@/components/ui/sprite-icon";
import { useActionForm } from "@/components/forms/use-action-form";
import type { ActionResult } from "@/lib/validation/action";
import type { RegistrationInput } from "@/lib/validation/owner";

/** The one tap that registers a piece whose card was scanned or typed (app/(public)/r/card-confirm.tsx). */
export function RegisterButton({ action, code }: { action: (v: RegistrationInput) => Promise<ActionResult<unknown>>; code: string }) {
  const { form, onSubmit, formError } = useActionForm({ schema: () => import("@/lib/validation/owner").then((m) => m.registrationSchema), action, defaultValues: { code } });
  return <OneTap onSubmit={onSubmit} formError={formError} submitting={form.formState.isSubmitting} hidden={<input type="hidden" {...form.register("code")} />} />;
}

/** The hand-over link's one tap: registers the piece to the signed-in account (app/(public)/hand-over/[token]). */
export function HandoverRegisterButton({ action, token }: { action: (v: { token: string }) => Promise<ActionResult<unknown>>; token: string }) {
  const { form, onSubmit, formError } = useActionForm({ schema: () => import("@/lib/validation/clients").then((m) => m.handoverTokenSchema), action, defaultValues: { token } });
  return <OneTap onSubmit={onSubmit} formError={formError} submitting={form.formState.isSubmitting} hidden={<input type="hidden" {...form.register("token")} />} />;
}

/** What both one-tap forms show: the error if it failed, and the button. */
function OneTap({ onSubmit, formError, submitting, hidden }: { onSubmit: FormEventHandler<HTMLFormElement>; formError: string | null | undefined; submitting: boolean; hidden: ReactNode }) {
  return (
    <form onSubmit={onSubmit} className="space-y-3">
      {formError ? (
        <Notice tone="error" title="Couldn't register the piece">
          {formError}
        </Notice>
      ) : null}
      {hidden}
      <Button type="submit" className="w-full" disabled={submitting}>
        <SpriteIcon name="key-round" className="size-4" />
        {submitting ? "Registering…" : "Register this piece to my account"}
      </Button>
    </form>
  );
}
