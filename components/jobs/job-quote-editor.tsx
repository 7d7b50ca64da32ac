"use client";

import { useRouter } from "next/navigation";
import { useState } from "react";
import { useForm } from "react-hook-form";
import { toast } from "sonner";
import type { z } from "zod";
import { apiJson, isApiError } from "@/components/api-client";
import { Button } from "@/components/ui/button";
import { TextField } from "@/components/ui/field";
import { Notice } from "@/components/ui/notice";
import { CARE_TASK_KINDS, CARE_TASK_LABELS } from "@/lib/care/vocabulary";
import type { jobQuoteSchema, JobQuoteInput } from "@/lib/validation/jobs";
import { useLazyZodResolver } from "@/components/forms/lazy-zod-resolver";

type Product = { id: string; name: string; finishClassLabel: string };

export function JobQuoteEditor({ jobId, initial, products, editable }: { jobId: string; initial: JobQuoteInput; products: Product[]; editable: boolean }) {
  const router = useRouter();
  const [formError, setFormError] = useState<string | null>(null);
  const form = useForm<z.input<typeof jobQuoteSchema>, unknown, JobQuoteInput>({
    resolver: useLazyZodResolver<typeof jobQuoteSchema, z.input<typeof jobQuoteSchema>, JobQuoteInput>(() => import("@/lib/validation/jobs").then((m) => m.jobQuoteSchema)),
    defaultValues: initial,
  });
  const { register, formState, handleSubmit, setError } = form;
  const onSubmit = handleSubmit(async (values) => {
    setFormError(null);
    try {
      await apiJson(`/api/jobs/${jobId}`, { method: "PATCH", json: values });
    } catch (e) {
      if (!isApiError(e)) return setFormError("Couldn't save the quote.");
      setFormError(e.message);
      for (const [field, msgs] of Object.entries(e.fieldErrors)) {
        if (msgs[0]) setError(field as keyof JobQuoteInput, { message: msgs[0] });
      }
      return;
    }
    toast.success("Quote recalculated and saved.");
    router.refresh();
  });
  return (
    <form onSubmit={onSubmit} noValidate className="space-y-5">
      {formError ? <Notice tone="error">{formError}</Notice> : null}
      <fieldset disabled={!editable || formState.isSubmitting} className="space-y-5">
        <TextField label="Job title" {...register("title")} error={formState.errors.title?.message} />
        <fieldset className="space-y-2">
          <legend className="text-sm font-medium">Tasks</legend>
          <div className="grid gap-2 sm:grid-cols-2">
            {CARE_TASK_KINDS.map((k) => (
              <label key={k} className="flex min-h-11 items-center gap-2 rounded-lg border border-line bg-white px-3">
                <input type="checkbox" value={k} {...register("tasks")} className="size-4" />
                {CARE_TASK_LABELS[k]}
              </label>
            ))}
          </div>
          {formState.errors.tasks ? <p role="alert" className="text-sm text-danger">{formState.errors.tasks.message}</p> : null}
        </fieldset>
        <fieldset className="space-y-2">
          <legend className="text-sm font-medium">Products from the catalog</legend>
          {products.length === 0 ? <p className="text-sm text-muted">The catalog has no products yet.</p> : null}
          <div className="grid gap-2 sm:grid-cols-2">
            {products.map((p) => (
              <label key={p.id} className="flex min-h-11 items-center gap-2 rounded-lg border border-line bg-white px-3">
                <input type="checkbox" value={p.id} {...register("productIds")} className="size-4" />
                <span>
                  {p.name} <span className="text-sm text-muted">· {p.finishClassLabel}</span>
                </span>
              </label>
            ))}
          </div>
        </fieldset>
        <div className="grid gap-4 sm:grid-cols-3">
          <TextField label="Coats" type="number" min={1} max={6} {...register("coats")} error={formState.errors.coats?.message} />
          <TextField label="Warranty share (%)" type="number" min={0} max={100} {...register("coveredPct")} error={formState.errors.coveredPct?.message} />
          <label className="flex min-h-11 items-center gap-2 self-end rounded-lg border border-line bg-white px-3">
            <input type="checkbox" {...register("travel")} className="size-4" />
            Charge the travel fee
          </label>
        </div>
        <label className="block space-y-1.5">
          <span className="text-sm font-medium">Notes for the technician</span>
          <textarea rows={3} {...register("notes")} className="block w-full rounded-lg border border-line bg-white px-3 py-2" />
        </label>
        {editable ? (
          <Button type="submit" disabled={formState.isSubmitting}>
            {formState.isSubmitting ? "Recalculating…" : "Save and recalculate"}
          </Button>
        ) : (
          <p className="text-sm text-muted">This quote can no longer be changed.</p>
        )}
      </fieldset>
    </form>
  );
}
