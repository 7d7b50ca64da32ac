"use client";

import { KeyRound } from "lucide-react";
import { Button } from "@/components/ui/button";
import { Notice } from "@/components/ui/notice";
import { useActionForm } from "@/components/forms/use-action-form";
import type { ActionResult } from "@/lib/validation/action";
import type { RegistrationInput } from "@/lib/validation/owner";

/** The one tap that registers a piece whose card was scanned or typed (app/(public)/r/card-confirm.tsx). */
export function RegisterButton({ action, code }: { action: (v: RegistrationInput) => Promise<ActionResult<unknown>>; code: string }) {
  const { form, onSubmit, formError } = useActionForm({ schema: () => import("@/lib/validation/owner").then((m) => m.registrationSchema), action, defaultValues: { code } });
  return (
    <form onSubmit={onSubmit} className="space-y-3">
      {formError ? (
        <Notice tone="error" title="Couldn't register the piece">
          {formError}
        </Notice>
      ) : null}
      <input type="hidden" {...form.register("code")} />
      <Button type="submit" className="w-full" disabled={form.formState.isSubmitting}>
        <KeyRound aria-hidden className="size-4" />
        {form.formState.isSubmitting ? "Registering…" : "Register this piece to my account"}
      </Button>
    </form>
  );
}
