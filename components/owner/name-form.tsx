"use client";

import { Button } from "@/components/ui/button";
import { TextField } from "@/components/ui/field";
import { Notice } from "@/components/ui/notice";
import { useActionForm } from "@/components/forms/use-action-form";
import type { ActionResult } from "@/lib/validation/action";
import type { ChangeNameInput } from "@/lib/validation/auth";

/** The account page's "Your name": what the studio's mails and these pages call the person. */
export function NameForm({ action, name }: { action: (v: ChangeNameInput) => Promise<ActionResult<{ name: string }>>; name: string }) {
  const { form, onSubmit, formError } = useActionForm({
    schema: () => import("@/lib/validation/auth").then((m) => m.changeNameSchema),
    action,
    defaultValues: { name },
    successMessage: "Name saved.",
    onSuccess: (saved) => form.reset({ name: saved.name }),
  });
  const { register, formState } = form;
  return (
    <form onSubmit={onSubmit} noValidate className="space-y-4">
      {formError ? <Notice tone="error" title="Name not saved yet">{formError}</Notice> : null}
      <TextField label="Your name" autoComplete="name" hint="Mails from your studio and these pages greet you by it." {...register("name")} error={formState.errors.name?.message} />
      <Button type="submit" className="w-full sm:w-auto" disabled={formState.isSubmitting}>
        {formState.isSubmitting ? "Saving…" : "Save name"}
      </Button>
    </form>
  );
}
