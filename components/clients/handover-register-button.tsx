"use client";

import { KeyRound } from "lucide-react";
import { useActionForm } from "@/components/forms/use-action-form";
import { Button } from "@/components/ui/button";
import { Notice } from "@/components/ui/notice";
import type { ActionResult } from "@/lib/validation/action";

type TokenInput = { token: string };

/** The hand-over link's one button: registers the piece to the signed-in account. */
export function HandoverRegisterButton({ action, token }: { action: (v: TokenInput) => Promise<ActionResult<unknown>>; token: string }) {
  const { form, onSubmit, formError } = useActionForm({ schema: () => import("@/lib/validation/clients").then((m) => m.handoverTokenSchema), action, defaultValues: { token } });
  return (
    <form onSubmit={onSubmit} className="space-y-3">
      {formError ? (
        <Notice tone="error" title="Couldn't register the piece">
          {formError}
        </Notice>
      ) : null}
      <input type="hidden" {...form.register("token")} />
      <Button type="submit" className="w-full" disabled={form.formState.isSubmitting}>
        <KeyRound aria-hidden className="size-4" />
        {form.formState.isSubmitting ? "Registering…" : "Register this piece to my account"}
      </Button>
    </form>
  );
}
