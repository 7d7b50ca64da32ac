"use client";

import Link from "next/link";
import { Button } from "@/components/ui/button";
import { TextField } from "@/components/ui/field";
import { Notice } from "@/components/ui/notice";
import { useActionForm } from "@/components/forms/use-action-form";
import type { ActionResult } from "@/lib/validation/action";
import type { ResetPasswordInput } from "@/lib/validation/auth";

export function ResetPasswordForm({ action, token }: { action: (v: ResetPasswordInput) => Promise<ActionResult<unknown>>; token: string }) {
  const { form, onSubmit, formError } = useActionForm({
    schema: () => import("@/lib/validation/auth").then((m) => m.resetPasswordSchema),
    action,
    defaultValues: { token, password: "", confirm: "" },
  });
  const { register, formState } = form;
  return (
    <form onSubmit={onSubmit} noValidate className="space-y-4">
      {formError ? (
        <Notice tone="error" title="Couldn't change the password">
          {formError} <Link className="underline" href="/forgot-password">Ask for a new link</Link>
        </Notice>
      ) : null}
      <input type="hidden" {...register("token")} />
      <TextField label="New password" type="password" autoComplete="new-password" hint="At least 10 characters." {...register("password")} error={formState.errors.password?.message} />
      <TextField label="New password, again" type="password" autoComplete="new-password" {...register("confirm")} error={formState.errors.confirm?.message} />
      <Button type="submit" className="w-full" disabled={formState.isSubmitting}>
        {formState.isSubmitting ? "Saving…" : "Save the new password"}
      </Button>
      <p className="text-sm text-muted">Saving signs you out everywhere else.</p>
    </form>
  );
}
