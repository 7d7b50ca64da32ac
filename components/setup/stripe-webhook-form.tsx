"use client";

import { useRouter } from "next/navigation";
import { useActionForm } from "@/components/forms/use-action-form";
import { Button } from "@/components/ui/button";
import { TextField } from "@/components/ui/field";
import { Notice } from "@/components/ui/notice";
import type { StripeWebhookSecretInput } from "@/lib/studio/setup-payments-schema";
import type { ActionResult } from "@/lib/validation/action";

/** The payments step: the signing secret of the studio's own webhook endpoint, kept sealed. */
export function StripeWebhookForm({ action, endpoint }: { action: (v: StripeWebhookSecretInput) => Promise<ActionResult<unknown>>; endpoint: string }) {
  const router = useRouter();
  const { form, onSubmit, formError } = useActionForm({
    schema: () => import("@/lib/studio/setup-payments-schema").then((m) => m.stripeWebhookSecretSchema),
    action,
    defaultValues: { webhookSecret: "" },
    onSuccess: () => {
      form.reset({ webhookSecret: "" });
      router.refresh();
    },
  });
  return (
    <form onSubmit={onSubmit} noValidate className="space-y-4">
      {formError ? <Notice tone="error">{formError}</Notice> : null}
      <p className="text-sm">
        In your Stripe dashboard (Developers → Webhooks), add an endpoint with this address, then paste its signing secret here:{" "}
        <code className="break-all">{endpoint}</code>
      </p>
      <TextField
        label="Webhook signing secret"
        type="password"
        autoComplete="off"
        spellCheck={false}
        {...form.register("webhookSecret")}
        error={form.formState.errors.webhookSecret?.message}
        hint="Starts with whsec_. Stored encrypted; only its last four characters are shown here."
      />
      <Button type="submit" disabled={form.formState.isSubmitting}>
        Save the signing secret
      </Button>
    </form>
  );
}
