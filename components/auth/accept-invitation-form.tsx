"use client";

import { Button } from "@/components/ui/button";
import { TextField } from "@/components/ui/field";
import { Notice } from "@/components/ui/notice";
import { useActionForm } from "@/components/forms/use-action-form";
import type { ActionResult } from "@/lib/validation/action";
import type { AcceptInvitationInput } from "@/lib/validation/auth";

export function AcceptInvitationForm({
  action,
  token,
  email,
  hasAccount,
}: {
  action: (v: AcceptInvitationInput) => Promise<ActionResult<unknown>>;
  token: string;
  email: string;
  hasAccount: boolean;
}) {
  // A signed-in invitee only confirms; the name and password fields are placeholders the schema accepts.
  const { form, onSubmit, formError } = useActionForm({
    schema: () => import("@/lib/validation/auth").then((m) => m.acceptInvitationSchema),
    action,
    defaultValues: hasAccount ? { token, name: "member", password: "unused-password" } : { token, name: "", password: "" },
  });
  const { register, formState } = form;
  return (
    <form onSubmit={onSubmit} noValidate className="space-y-4">
      {formError ? <Notice tone="error">{formError}</Notice> : null}
      <input type="hidden" {...register("token")} />
      {hasAccount ? null : (
        <>
          <TextField label="Email" value={email} readOnly disabled />
          <TextField label="Your name" autoComplete="name" {...register("name")} error={formState.errors.name?.message} />
          <TextField label="Password" type="password" autoComplete="new-password" hint="At least 10 characters." {...register("password")} error={formState.errors.password?.message} />
        </>
      )}
      <Button type="submit" className="w-full" disabled={formState.isSubmitting}>
        {formState.isSubmitting ? "Joining…" : "Join the studio"}
      </Button>
    </form>
  );
}
