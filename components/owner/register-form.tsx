"use client";

import { KeyRound } from "lucide-react";
import { Button } from "@/components/ui/button";
import { TextField } from "@/components/ui/field";
import { Notice } from "@/components/ui/notice";
import { useActionForm } from "@/components/forms/use-action-form";
import type { ActionResult } from "@/lib/validation/action";
import type { RegistrationInput } from "@/lib/validation/owner";

/** Manual entry of a registration code; the check symbol is verified here before anything is sent. */
export function RegisterForm({ action, code }: { action: (v: RegistrationInput) => Promise<ActionResult<unknown>>; code?: string }) {
  const { form, onSubmit, formError } = useActionForm({ schema: () => import("@/lib/validation/owner").then((m) => m.registrationSchema), action, defaultValues: { code: code ?? "" } });
  const { register, formState } = form;
  return (
    <form onSubmit={onSubmit} noValidate className="space-y-4">
      {formError ? (
        <Notice tone="error" title="Couldn't register the piece">
          {formError}
        </Notice>
      ) : null}
      <TextField
        label="Registration code"
        autoComplete="off"
        autoCapitalize="characters"
        spellCheck={false}
        placeholder="XXXX-XXXX-XXXX-X"
        className="font-mono text-lg tracking-wider"
        hint="13 symbols from the card in the drawer. Capitals, spaces and dashes don't matter."
        {...register("code")}
        error={formState.errors.code?.message}
      />
      <Button type="submit" className="w-full" disabled={formState.isSubmitting}>
        <KeyRound aria-hidden className="size-4" />
        {formState.isSubmitting ? "Registering…" : "Register this piece"}
      </Button>
    </form>
  );
}

/** One tap on the card landing: the code is already known. */
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
