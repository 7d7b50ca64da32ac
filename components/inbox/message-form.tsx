"use client";

import { useId } from "react";
import { useForm } from "react-hook-form";
import { toast } from "sonner";
import type { MessageFormInput } from "@/lib/validation/messages";
import { apiJson } from "@/components/api-client";
import { useLazyZodResolver } from "@/components/forms/lazy-zod-resolver";
import { useRefreshingMutation } from "@/components/forms/use-refreshing-mutation";
import { Button } from "@/components/ui/button";
import { ErrorLine } from "@/components/ui/error-line";

/**
 * Writes one message: an owner's about their claim, job or visit (`/api/threads` with `about`), or a
 * staff reply on a thread (`/api/threads/[id]/messages`). What was typed stays when sending fails.
 */
export function MessageForm({ endpoint, extra, label, sentText, submitText = "Send message" }: { endpoint: string; extra?: Record<string, string>; label: string; sentText: string; submitText?: string }) {
  const id = useId();
  const form = useForm<MessageFormInput>({ resolver: useLazyZodResolver(() => import("@/lib/validation/messages").then((m) => m.messageFormSchema)), defaultValues: { body: "" } });
  const error = form.formState.errors.body;
  const { run, busy } = useRefreshingMutation((body: string) => apiJson(endpoint, { method: "POST", json: { ...extra, body } }), {
    onSuccess: () => {
      form.reset({ body: "" });
      toast.success(sentText);
    },
    onError: (words) => form.setError("body", { type: "server", message: words }),
  });
  const onSubmit = form.handleSubmit((values) => run(values.body));
  const sending = busy || form.formState.isSubmitting;
  return (
    <form onSubmit={onSubmit} noValidate className="space-y-2">
      <label htmlFor={`${id}-body`} className="block text-sm font-medium">
        {label}
      </label>
      <textarea
        id={`${id}-body`}
        rows={4}
        maxLength={4000}
        aria-invalid={error ? true : undefined}
        aria-describedby={error ? `${id}-error` : undefined}
        className="block w-full rounded-lg border border-line bg-white px-3 py-2 text-base focus:border-resin aria-[invalid=true]:border-danger"
        {...form.register("body")}
      />
      <ErrorLine id={`${id}-error`}>{error?.message}</ErrorLine>
      <Button type="submit" disabled={sending}>
        {sending ? "Sending…" : submitText}
      </Button>
    </form>
  );
}
