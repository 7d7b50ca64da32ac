"use client";

import { Button } from "@/components/ui/button";
import { TextField } from "@/components/ui/field";
import { Notice } from "@/components/ui/notice";
import { useActionForm } from "@/components/forms/use-action-form";
import type { ActionResult } from "@/lib/validation/action";
import type { ChangePasswordInput } from "@/lib/validation/auth";

export function ChangePasswordForm({ action }: { action: (v: ChangePasswordInput) => Promise<ActionResult<unknown>> }) {
  const { form, onSubmit, formError } = useActionForm({
    schema: () => import("@/lib/validation/auth").then((m) => m.changePasswordSchema),
    action,
    defaultValues: { current: "", password: "", confirm: "" },
    onSuccess: () => form.reset({ current: "", password: "", confirm: "" }),
  });
  const { register, formState } = form;
  return (
    <form onSubmit={onSubmit} noValidate className="space-y-4">
      {formError ? <Notice tone="error" title="Couldn't change the password">{formError}</Notice> : null}
      <TextField label="Current password" type="password" autoComplete="current-password" {...register("current")} error={formState.errors.current?.message} />
      <TextField label="New password" type="password" autoComplete="new-password" hint="At least 10 characters." {...register("password")} error={formState.errors.password?.message} />
      <TextField label="New password, again" type="password" autoComplete="new-password" {...register("confirm")} error={formState.errors.confirm?.message} />
      <Button type="submit" disabled={formState.isSubmitting}>
        {formState.isSubmitting ? "Saving…" : "Change password"}
      </Button>
      <p className="text-sm text-muted">Changing it signs you out on every other device.</p>
    </form>
  );
}
