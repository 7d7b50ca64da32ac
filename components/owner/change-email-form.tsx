"use client";

import { useRouter } from "next/navigation";
import { useState } from "react";
import { toast } from "sonner";
import { Button } from "@/components/ui/button";
import { TextField } from "@/components/ui/field";
import { Notice } from "@/components/ui/notice";
import { useActionForm } from "@/components/forms/use-action-form";
import type { ActionResult } from "@/lib/validation/action";
import type { ChangeEmailInput } from "@/lib/validation/account";

/** The account's "Change e-mail address": the new address and the current password; a link goes to the new address. */
export function ChangeEmailForm({ action }: { action: (v: ChangeEmailInput) => Promise<ActionResult<{ newEmail: string }>> }) {
  const router = useRouter();
  const { form, onSubmit, formError } = useActionForm({
    schema: () => import("@/lib/validation/account").then((m) => m.changeEmailSchema),
    action,
    defaultValues: { email: "", current: "" },
    onSuccess: () => {
      form.reset({ email: "", current: "" });
      router.refresh();
    },
  });
  const { register, formState } = form;
  return (
    <form onSubmit={onSubmit} noValidate className="space-y-4">
      {formError ? <Notice tone="error" title="Address not changed">{formError}</Notice> : null}
      <TextField label="New e-mail address" type="email" autoComplete="email" {...register("email")} error={formState.errors.email?.message} />
      <TextField label="Current password" type="password" autoComplete="current-password" hint="So we know it's you asking." {...register("current")} error={formState.errors.current?.message} />
      <Button type="submit" className="w-full sm:w-auto" disabled={formState.isSubmitting}>
        {formState.isSubmitting ? "Sending…" : "Send the link"}
      </Button>
    </form>
  );
}

/** Cancels the change waiting for its link. */
export function CancelEmailChangeButton({ action }: { action: () => Promise<ActionResult<{ cancelled: boolean }>> }) {
  const router = useRouter();
  const [busy, setBusy] = useState(false);
  return (
    <Button
      variant="secondary"
      disabled={busy}
      onClick={async () => {
        setBusy(true);
        const result = await action();
        setBusy(false);
        if (result.ok) toast.success(result.message ?? "Change cancelled.");
        else toast.error(result.message);
        router.refresh();
      }}
    >
      {busy ? "Cancelling…" : "Cancel this change"}
    </Button>
  );
}
