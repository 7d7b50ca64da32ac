"use client";

import { useRouter } from "next/navigation";
import { useActionForm } from "@/components/forms/use-action-form";
import { Button } from "@/components/ui/button";
import { TextField } from "@/components/ui/field";
import { Notice } from "@/components/ui/notice";
import type { StripeKeyInput } from "@/lib/studio/setup-schema";
import type { ActionResult } from "@/lib/validation/action";

/** The payments step: the studio's Stripe secret key, checked by one call to Stripe before it is kept. */
export function StripeKeyForm({ action }: { action: (v: StripeKeyInput) => Promise<ActionResult<unknown>> }) {
  const router = useRouter();
  const { form, onSubmit, formError } = useActionForm({
    schema: () => import("@/lib/studio/setup-schema").then((m) => m.stripeKeySchema),
    action,
    defaultValues: { secretKey: "" },
    onSuccess: () => {
      form.reset({ secretKey: "" });
      router.refresh();
    },
  });
  return (
    <form onSubmit={onSubmit} noValidate className="space-y-4">
      {formError ? <Notice tone="error">{formError}</Notice> : null}
      <TextField
        label="Stripe secret key"
        type="password"
        autoComplete="off"
        spellCheck={false}
        {...form.register("secretKey")}
        error={form.formState.errors.secretKey?.message}
        hint="From your Stripe dashboard: Developers → API keys. It is checked with Stripe, then stored encrypted; nobody can read it back here."
      />
      <Button type="submit" disabled={form.formState.isSubmitting}>
        {form.formState.isSubmitting ? "Checking with Stripe…" : "Check and save the key"}
      </Button>
    </form>
  );
}
