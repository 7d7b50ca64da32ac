"use client";

import { useState } from "react";
import { useForm } from "react-hook-form";
import { toast } from "sonner";
import type { z } from "zod";
import { Button } from "@/components/ui/button";
import { ErrorLine } from "@/components/ui/error-line";
import { cn } from "@/components/ui/cn";
import type { claimMessageSchema } from "@/lib/validation/claims";
import { useLazyZodResolver } from "@/components/forms/lazy-zod-resolver";
import { apiJson } from "@/components/api-client";
import { useRefreshingMutation } from "@/components/forms/use-refreshing-mutation";
import { formatInstant } from "@/lib/format";

export type ThreadMessage = { id: string; body: string; fromStudio: boolean; createdAt: string; authorName: string };

/** The claim's messages as a thread; each new message is e-mailed to the other side. */
export function MessageThread({
  claimId,
  messages,
  audience,
  studioName,
  canWrite,
  canAskForInfo,
  writeNote,
  timeZone,
}: {
  claimId: string;
  messages: ThreadMessage[];
  audience: "owner" | "staff";
  studioName: string;
  canWrite: boolean;
  canAskForInfo?: boolean;
  /** A line under the message box, e.g. that the other side can no longer reply. */
  writeNote?: string;
  /** The reader's zone (the studio's for staff, the owner's for owners); times name it. */
  timeZone: string;
}) {
  const [askForInfo, setAskForInfo] = useState(false);
  const form = useForm<z.input<typeof claimMessageSchema>>({ resolver: useLazyZodResolver(() => import("@/lib/validation/claims").then((m) => m.claimMessageSchema)), defaultValues: { body: "" } });
  const { run, busy } = useRefreshingMutation(({ body, requestInfo }: { body: string; requestInfo: boolean }) => apiJson(`/api/claims/${claimId}/messages`, { method: "POST", json: { body, ...(requestInfo ? { requestInfo: true } : {}) } }), {
    onSuccess: (_, { requestInfo }) => {
      form.reset({ body: "" });
      setAskForInfo(false);
      toast.success(requestInfo ? "Asked the owner; the claim now waits on their reply." : audience === "staff" ? "Message sent to the owner." : `Message sent to ${studioName}.`);
    },
    onError: (words) => form.setError("body", { type: "server", message: words }),
  });
  const onSubmit = form.handleSubmit((values) => run({ body: values.body, requestInfo: askForInfo }));
  const mine = (m: ThreadMessage) => (audience === "staff" ? m.fromStudio : !m.fromStudio);
  return (
    <section aria-labelledby="thread-heading" className="space-y-3">
      <h2 id="thread-heading" className="font-display text-xl font-semibold">
        Messages
      </h2>
      {messages.length === 0 ? <p className="text-sm text-muted">No messages yet.</p> : null}
      <ol className="space-y-2">
        {messages.map((m) => (
          <li key={m.id} className={cn("max-w-[90%] rounded-xl border p-3", mine(m) ? "ml-auto border-resin/30 bg-resin-soft" : "border-line bg-card")}>
            <p className="text-xs text-muted">
              {/* Owner pages say "you" (as the job and piece pages' conversations do); staff read the owner's name. */}
              {m.fromStudio ? `${m.authorName} · ${studioName}` : audience === "owner" ? "You" : `${m.authorName} · owner`} · {formatInstant(new Date(m.createdAt), timeZone, { time: true })}
            </p>
            <p className="mt-1 whitespace-pre-wrap break-words">{m.body}</p>
          </li>
        ))}
      </ol>
      {canWrite ? (
        <form onSubmit={onSubmit} noValidate className="space-y-2">
          <label htmlFor="message-body" className="block text-sm font-medium">
            {audience === "staff" ? "Message to the owner" : `Message to ${studioName}`}
          </label>
          <textarea
            id="message-body"
            rows={3}
            aria-invalid={form.formState.errors.body ? true : undefined}
            className="block w-full rounded-lg border border-line bg-white px-3 py-2 text-base focus:border-resin aria-[invalid=true]:border-danger"
            aria-describedby={writeNote ? "message-note" : undefined}
            {...form.register("body")}
          />
          {writeNote ? (
            <p id="message-note" className="text-sm text-muted">
              {writeNote}
            </p>
          ) : null}
          <ErrorLine>{form.formState.errors.body?.message}</ErrorLine>
          <div className="flex flex-wrap items-center gap-3">
            {canAskForInfo ? (
              <label className="flex min-h-11 items-center gap-2 text-sm">
                <input type="checkbox" className="size-5" checked={askForInfo} onChange={(e) => setAskForInfo(e.target.checked)} />
                Ask for more information (waits on the owner)
              </label>
            ) : null}
            <Button type="submit" disabled={busy || form.formState.isSubmitting}>
              {busy || form.formState.isSubmitting ? "Sending…" : askForInfo ? "Ask the owner" : "Send message"}
            </Button>
          </div>
        </form>
      ) : null}
    </section>
  );
}
