"use client";

import { useState } from "react";
import { useForm, useWatch, type FieldPath } from "react-hook-form";
import { toast } from "sonner";
import type { z } from "zod";
import { Button } from "@/components/ui/button";
import { ErrorLine } from "@/components/ui/error-line";
import { ConfirmDialog } from "@/components/ui/confirm-dialog";
import { TextField } from "@/components/ui/field";
import { Notice } from "@/components/ui/notice";
import { SpriteIcon } from "@/components/ui/sprite-icon";
import { CLAIM_DECISION_LABELS, decisionText } from "@/lib/claims/labels";
import type { ClaimState } from "@/lib/claims/states";
import type { claimDecisionSchema } from "@/lib/validation/claims";
import { useLazyZodResolver } from "@/components/forms/lazy-zod-resolver";
import { apiJson, isApiError } from "@/components/api-client";
import { useRefreshingMutation } from "@/components/forms/use-refreshing-mutation";

type Values = z.input<typeof claimDecisionSchema>;
const DECISIONS = ["covered", "partly_covered", "chargeable", "declined"] as const;

/** Start or resume the review of a claim (not a decision). */
export function ReviewButton({ claimId, state, version }: { claimId: string; state: ClaimState; version: number }) {
  const { run, busy } = useRefreshingMutation(() => apiJson(`/api/claims/${claimId}/state`, { method: "POST", json: { to: "in_review", expectedVersion: version } }), {
    onSuccess: () => toast.success(state === "submitted" ? "Review started." : "Back in review."),
    onError: (words) => toast.error(words),
  });
  if (state !== "submitted" && state !== "awaiting_owner") return null;
  return (
    <Button disabled={busy} onClick={() => run(undefined)}>
      <SpriteIcon name="scan-search" className="size-5" /> {state === "submitted" ? "Start review" : "Resume review without waiting"}
    </Button>
  );
}

/** The decision: covered, partly covered (a share), chargeable, or declined with a reason the owner sees. */
export function DecisionForm({ claimId, version, suggestion, suggestedPct }: { claimId: string; version: number; suggestion: string | null; suggestedPct: number | null }) {
  const [formError, setFormError] = useState<string | null>(null);
  const defaultDecision = suggestion === "covered" ? "covered" : suggestion === "partly_covered" ? "partly_covered" : undefined;
  const form = useForm<Values, unknown, z.output<typeof claimDecisionSchema>>({
    resolver: useLazyZodResolver<typeof claimDecisionSchema, Values, z.output<typeof claimDecisionSchema>>(() => import("@/lib/validation/claims").then((m) => m.claimDecisionSchema)),
    defaultValues: { decision: defaultDecision, coveredPct: suggestion === "partly_covered" ? suggestedPct : null, reason: "", expectedVersion: version },
  });
  const decision = useWatch({ control: form.control, name: "decision" });
  const errors = form.formState.errors;
  // The app's own dialog asks before the decision goes out, not the browser's confirm().
  const [pending, setPending] = useState<z.output<typeof claimDecisionSchema> | null>(null);
  const { run: send, busy: sending } = useRefreshingMutation((values: z.output<typeof claimDecisionSchema>) => apiJson(`/api/claims/${claimId}/decision`, { method: "POST", json: { ...values, expectedVersion: version } }), {
    onSuccess: (_, values) => {
      setPending(null);
      toast.success(`Decided: ${CLAIM_DECISION_LABELS[values.decision]}. The owner has been e-mailed.`);
    },
    onError: (words, e) => {
      setPending(null);
      setFormError(words);
      if (isApiError(e)) for (const [f, m] of Object.entries(e.fieldErrors)) if (m[0]) form.setError(f as FieldPath<Values>, { type: "server", message: m[0] });
    },
  });
  const onSubmit = form.handleSubmit((values) => {
    setFormError(null);
    setPending(values);
  });
  return (
    <form onSubmit={onSubmit} noValidate className="space-y-4">
      <ConfirmDialog
        open={pending !== null}
        title={pending ? `Decide: ${decisionText(pending.decision, pending.coveredPct ?? null)}?` : "Decide this claim?"}
        confirmLabel="Send the decision"
        busy={sending}
        onConfirm={() => pending && send(pending)}
        onCancel={() => setPending(null)}
      >
        <p>The owner is e-mailed straight away, and the decision can&apos;t be changed here afterwards.</p>
        {pending?.reason ? <p className="break-words text-muted">Your note: “{pending.reason}”</p> : null}
      </ConfirmDialog>
      {formError ? <Notice tone="error" title="Not decided">{formError}</Notice> : null}
      <fieldset className="space-y-2">
        <legend className="text-sm font-medium">Decision</legend>
        <div className="grid grid-cols-2 gap-2">
          {DECISIONS.map((d) => (
            <label key={d} className="flex min-h-11 cursor-pointer items-center gap-2 rounded-lg border border-line bg-white px-3 text-sm has-[:checked]:border-resin has-[:checked]:bg-resin-soft has-[:checked]:font-semibold">
              {/* After a failed submit, a new decision checks the note again: a declined claim's "tell the owner why" goes once another decision makes the note optional. */}
              <input type="radio" value={d} className="size-4" {...form.register("decision", { deps: "reason" })} />
              {CLAIM_DECISION_LABELS[d]}
            </label>
          ))}
        </div>
        <ErrorLine>{errors.decision?.message}</ErrorLine>
      </fieldset>
      {decision === "partly_covered" ? (
        <TextField
          label="Covered share, %"
          type="number"
          inputMode="numeric"
          min={1}
          max={99}
          error={errors.coveredPct?.message}
          {...form.register("coveredPct", { setValueAs: (v) => (v === "" || v == null ? null : Number(v)) })}
        />
      ) : null}
      <div className="space-y-1.5">
        <label htmlFor="decision-reason" className="block text-sm font-medium">
          {decision === "declined" ? "Reason (the owner sees this)" : "Note to the owner (they see this)"}
        </label>
        <textarea
          id="decision-reason"
          rows={3}
          aria-invalid={errors.reason ? true : undefined}
          className="block w-full rounded-lg border border-line bg-white px-3 py-2 text-base focus:border-resin aria-[invalid=true]:border-danger"
          {...form.register("reason")}
        />
        <ErrorLine>{errors.reason?.message}</ErrorLine>
      </div>
      <Button type="submit" disabled={form.formState.isSubmitting}>
        <SpriteIcon name="gavel" className="size-5" /> {form.formState.isSubmitting ? "Saving…" : "Record the decision"}
      </Button>
      <p className="text-xs text-muted">The coverage check&apos;s suggestion is recorded beside your decision.</p>
    </form>
  );
}
