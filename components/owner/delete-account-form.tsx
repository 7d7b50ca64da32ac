"use client";

import { Button } from "@/components/ui/button";
import { TextField } from "@/components/ui/field";
import { Notice } from "@/components/ui/notice";
import { useActionForm } from "@/components/forms/use-action-form";
import type { ActionResult } from "@/lib/validation/action";
import type { DeleteAccountInput } from "@/lib/validation/account";

/** The last step of "Delete my account": the current password, then the deletion (the action ends in a redirect). */
export function DeleteAccountForm({ action }: { action: (v: DeleteAccountInput) => Promise<ActionResult<unknown>> }) {
  const { form, onSubmit, formError } = useActionForm({
    schema: () => import("@/lib/validation/account").then((m) => m.deleteAccountSchema),
    action,
    defaultValues: { current: "" },
  });
  const { register, formState } = form;
  return (
    <form onSubmit={onSubmit} noValidate className="space-y-4">
      {formError ? <Notice tone="error" title="Your account is not deleted">{formError}</Notice> : null}
      <TextField label="Your password" type="password" autoComplete="current-password" hint="Type it to confirm you want to delete your account." {...register("current")} error={formState.errors.current?.message} />
      <Button type="submit" variant="danger" className="w-full sm:w-auto" disabled={formState.isSubmitting}>
        {formState.isSubmitting ? "Deleting…" : "Delete my account"}
      </Button>
    </form>
  );
}
