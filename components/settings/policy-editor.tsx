"use client";

import { useRouter } from "next/navigation";
import { useActionForm } from "@/components/forms/use-action-form";
import { Button } from "@/components/ui/button";
import { ErrorLine } from "@/components/ui/error-line";
import { SelectField, TextField } from "@/components/ui/field";
import { Notice } from "@/components/ui/notice";
import { CLAIM_CATEGORIES, CLAIM_EXCLUSION_LABELS, CLAIM_EXCLUSIONS, type ClaimCategory } from "@/lib/care/vocabulary";
import { CLAIM_CATEGORY_LABELS } from "@/lib/claims/labels";
import { formatDate } from "@/lib/format";
import type { ActionResult } from "@/lib/validation/action";
import type { PolicyVersionInput } from "@/lib/validation/settings";


export function PolicyEditor({ values, earliest, latestVersion, action }: { values: PolicyVersionInput; earliest: string; latestVersion: number | null; action: (v: PolicyVersionInput) => Promise<ActionResult<unknown>> }) {
  const router = useRouter();
  const { form, onSubmit, formError } = useActionForm({ schema: () => import("@/lib/validation/settings").then((m) => m.policyVersionSchema), action, defaultValues: values, onSuccess: () => router.refresh() });
  const { register, formState, watch } = form;
  const lines = watch("lines");
  const effectiveFrom = watch("effectiveFrom");
  const err = (c: ClaimCategory) => formState.errors.lines?.[c];
  return (
    <form onSubmit={onSubmit} noValidate className="space-y-5">
      {formError ? <Notice tone="error">{formError}</Notice> : null}
      <div className="grid gap-4 sm:grid-cols-2 sm:items-start">
        <TextField
          label="Effective from (delivery date)"
          type="date"
          min={earliest || undefined}
          {...register("effectiveFrom")}
          error={formState.errors.effectiveFrom?.message}
          hint={latestVersion ? `Pieces delivered before ${effectiveFrom ? formatDate(effectiveFrom) : "this date"} keep the terms they were delivered with.` : "Pieces delivered on or after this date get these terms."}
        />
      </div>
      {CLAIM_CATEGORIES.map((c) => {
        const covered = lines?.[c]?.covered;
        const e = err(c);
        const p = `lines.${c}` as const;
        return (
          <fieldset key={c} className="rounded-xl border border-line bg-paper/50 p-4">
            <legend className="px-1 font-semibold">{CLAIM_CATEGORY_LABELS[c]}</legend>
            <label className="flex min-h-11 items-center gap-3 text-sm font-medium">
              <input type="checkbox" className="size-5 accent-resin" {...register(`${p}.covered`)} />
              Covered by the warranty
            </label>
            {covered ? (
              <div className="mt-3 grid gap-4 sm:grid-cols-2">
                <TextField label="Line name (owners read this)" {...register(`${p}.label`)} error={e?.label?.message} />
                <TextField label="Term from delivery (months)" type="number" inputMode="numeric" min={1} {...register(`${p}.termMonths`, { valueAsNumber: true })} error={e?.termMonths?.message} />
                <fieldset className="sm:col-span-2">
                  <legend className="mb-1 text-sm font-medium">Not covered when the owner reports</legend>
                  <div className="grid gap-x-4 sm:grid-cols-2">
                    {CLAIM_EXCLUSIONS.map((x) => (
                      <label key={x} className="flex min-h-11 items-center gap-3 text-sm">
                        <input type="checkbox" className="size-5 accent-resin" value={x} {...register(`${p}.exclusions`)} />
                        {CLAIM_EXCLUSION_LABELS[x]}
                      </label>
                    ))}
                  </div>
                  <ErrorLine>{e?.exclusions?.message}</ErrorLine>
                </fieldset>
                <div className="space-y-2 sm:col-span-2">
                  <p className="text-sm font-medium">Conditions</p>
                  <label className="flex min-h-11 items-center gap-3 text-sm">
                    <input type="checkbox" className="size-5 accent-resin" {...register(`${p}.careLogRequired`)} />
                    The owner logged every refresh task on time
                  </label>
                  {lines?.[c]?.careLogRequired ? (
                    <div className="grid gap-4 pl-8 sm:grid-cols-2">
                      <TextField label="Grace after the due date (days)" type="number" inputMode="numeric" min={0} {...register(`${p}.graceDays`, { valueAsNumber: true })} error={e?.graceDays?.message} />
                      <SelectField label="When care was missed" {...register(`${p}.onMissed`)} error={e?.onMissed?.message}>
                        <option value="partly_covered">Suggest partly covered</option>
                        <option value="not_covered">Suggest not covered</option>
                      </SelectField>
                    </div>
                  ) : null}
                  <label className="flex min-h-11 items-center gap-3 text-sm">
                    <input type="checkbox" className="size-5 accent-resin" {...register(`${p}.climateCheck`)} />
                    Compare the owner&apos;s room climate with the care guide (40–60 % RH)
                  </label>
                </div>
                <TextField label="Share suggested when partly covered (%)" type="number" inputMode="numeric" min={1} max={99} {...register(`${p}.partlyCoveredPct`, { valueAsNumber: true })} error={e?.partlyCoveredPct?.message} />
                <label className="flex min-h-11 items-center gap-3 self-end text-sm">
                  <input type="checkbox" className="size-5 accent-resin" {...register(`${p}.transfersToNewOwner`)} />
                  Passes to a new owner when the piece changes hands
                </label>
              </div>
            ) : (
              <p className="text-sm text-muted">Claims of this kind are reviewed case by case, without a warranty line.</p>
            )}
          </fieldset>
        );
      })}
      <Button type="submit" disabled={formState.isSubmitting}>
        {formState.isSubmitting ? "Saving…" : latestVersion ? "Save as new terms" : "Save the warranty terms"}
      </Button>
    </form>
  );
}
