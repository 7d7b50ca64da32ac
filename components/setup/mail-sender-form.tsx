"use client";

import { toast } from "sonner";
import { actionData } from "@/components/api-client";
import { useActionForm } from "@/components/forms/use-action-form";
import { useRefreshingMutation } from "@/components/forms/use-refreshing-mutation";
import { Button } from "@/components/ui/button";
import { TextField } from "@/components/ui/field";
import { Notice } from "@/components/ui/notice";
import type { MailSenderInput } from "@/lib/studio/setup-schema";
import type { ActionResult } from "@/lib/validation/action";

/** The mail step: the sender name and Reply-To of the studio's e-mails, and a test message to oneself. */
export function MailSenderForm({
  values,
  yourEmail,
  action,
  sendTest,
}: {
  values: MailSenderInput;
  yourEmail: string;
  action: (v: MailSenderInput) => Promise<ActionResult<unknown>>;
  sendTest: (v: Record<string, never>) => Promise<ActionResult<unknown>>;
}) {
  const { form, onSubmit, formError } = useActionForm({ schema: () => import("@/lib/studio/setup-schema").then((m) => m.mailSenderSchema), action, defaultValues: values, onSuccess: () => form.reset(form.getValues()) });
  const e = form.formState.errors;
  // Sending a test changes nothing on the page.
  const { run: test, busy: sending, error: testError } = useRefreshingMutation(() => actionData(sendTest({})), {
    refresh: "never",
    onSuccess: (r) => toast.success(r.message ?? "Test message sent."),
  });

  return (
    <div className="space-y-6">
      <form onSubmit={onSubmit} noValidate className="space-y-4">
        {formError ? <Notice tone="error">{formError}</Notice> : null}
        <div className="grid gap-4 sm:grid-cols-2">
          <TextField label="Sender name" autoComplete="organization" {...form.register("senderName")} error={e.senderName?.message} hint="What owners see as the sender of your e-mails." />
          <TextField label="Reply-To address" type="email" autoComplete="email" {...form.register("replyTo")} error={e.replyTo?.message} hint="Where owners' answers go; leave empty for none." />
        </div>
        <Button type="submit" disabled={form.formState.isSubmitting}>
          {form.formState.isSubmitting ? "Saving…" : "Save sender and reply address"}
        </Button>
      </form>
      <div className="space-y-2 border-t border-line pt-4">
        <p className="text-sm text-muted">Send yourself a message to see your e-mails as owners will, with your name, logo and colour. It goes to {yourEmail}.</p>
        <Button variant="secondary" disabled={sending} onClick={() => test(undefined)}>
          {sending ? "Sending…" : "Send a test message"}
        </Button>
        {testError ? <Notice tone="error">{testError}</Notice> : null}
      </div>
    </div>
  );
}
