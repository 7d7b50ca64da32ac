"use client";

import { useState } from "react";
import { Button } from "@/components/ui/button";
import { TextField } from "@/components/ui/field";
import { Notice } from "@/components/ui/notice";
import { useActionForm } from "@/components/forms/use-action-form";
import type { ActionResult } from "@/lib/validation/action";
import type { ForgotPasswordInput } from "@/lib/validation/auth";

export function ForgotPasswordForm({ action }: { action: (v: ForgotPasswordInput) => Promise<ActionResult<unknown>> }) {
  const [sentTo, setSentTo] = useState<string | null>(null);
  const { form, onSubmit, formError } = useActionForm({
    schema: () => import("@/lib/validation/auth").then((m) => m.forgotPasswordSchema),
    action,
    defaultValues: { email: "" },
    onSuccess: () => setSentTo(form.getValues("email")),
  });
  const { register, formState } = form;
  if (sentTo) {
    return (
      <Notice tone="ok" title="Check your inbox">
        If <strong>{sentTo}</strong> has a Grainward account, a link to choose a new password is on its way. It works once, for one hour.
      </Notice>
    );
  }
  return (
    <form onSubmit={onSubmit} noValidate className="space-y-4">
      {formError ? <Notice tone="error" title="Couldn't send the link">{formError}</Notice> : null}
      <TextField label="Email" type="email" autoComplete="email" inputMode="email" {...register("email")} error={formState.errors.email?.message} />
      <Button type="submit" className="w-full" disabled={formState.isSubmitting}>
        {formState.isSubmitting ? "Sending…" : "Send me a reset link"}
      </Button>
    </form>
  );
}
