"use client";

import { Button } from "@/components/ui/button";
import { SelectField, TextField } from "@/components/ui/field";
import { Notice } from "@/components/ui/notice";
import { useActionForm } from "@/components/forms/use-action-form";
import type { ActionResult } from "@/lib/validation/action";
import type { InviteInput } from "@/lib/validation/auth";

export function InviteForm({ action }: { action: (v: InviteInput) => Promise<ActionResult<unknown>> }) {
  const { form, onSubmit, formError } = useActionForm({
    schema: () => import("@/lib/validation/auth").then((m) => m.inviteSchema),
    action,
    defaultValues: { email: "", role: "staff" },
    onSuccess: () => form.reset({ email: "", role: "staff" }),
  });
  const { register, formState } = form;
  return (
    <form onSubmit={onSubmit} noValidate className="grid gap-4 sm:grid-cols-[1fr_12rem_auto] sm:items-start">
      {formError ? <Notice tone="error" className="sm:col-span-3">{formError}</Notice> : null}
      <TextField label="Email" type="email" autoComplete="off" {...register("email")} error={formState.errors.email?.message} />
      <SelectField label="Role" {...register("role")} error={formState.errors.role?.message}>
        <option value="staff">Staff</option>
        <option value="technician">Technician</option>
        <option value="admin">Admin</option>
      </SelectField>
      <Button type="submit" className="sm:mt-7" disabled={formState.isSubmitting}>
        {formState.isSubmitting ? "Sending…" : "Send invitation"}
      </Button>
    </form>
  );
}
