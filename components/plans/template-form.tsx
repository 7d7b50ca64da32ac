"use client";
import { useForm } from "react-hook-form";
import { toast } from "sonner";
import { apiJson } from "@/components/api-client";
import { useLazyZodResolver } from "@/components/forms/lazy-zod-resolver";
import { useRefreshingMutation } from "@/components/forms/use-refreshing-mutation";
import { Button } from "@/components/ui/button";
import { ErrorLine } from "@/components/ui/error-line";
import { SelectField, TextField } from "@/components/ui/field";
import { CARE_TASK_KINDS, CARE_TASK_LABELS, CLAIM_CATEGORIES, FINISH_CLASS_LABELS, FINISH_CLASSES, PIECE_KIND_LABELS, PIECE_KINDS, type ClaimCategory } from "@/lib/care/vocabulary";
import { templateFormValues, templateInputOf, type TemplateFormValues } from "@/lib/validation/plan-template-form";
import type { PlanTemplateInput } from "@/lib/plans/validation";

const box = "inline-flex min-h-11 items-center gap-2 mr-4";
const legend = "text-sm font-medium text-ink";
const textarea = "block w-full rounded-lg border border-line bg-white px-3 py-2 text-base focus:border-resin aria-[invalid=true]:border-danger";

/**
 * A plan template: a new plan (POST /api/plans) or a change to one (PUT /api/plans/[id], which saves
 * the next version; plans already running keep theirs). Checked field by field with the schema of
 * lib/plans/template-form, loaded while the form is filled in; the server checks again.
 */
export function PlanTemplateForm({
  template,
  currency,
  exponent,
  taxNote,
  categoryLabels,
}: {
  /** The version to change; none for a new plan. */
  template?: PlanTemplateInput & { id: string; version: number };
  currency: string;
  exponent: number;
  /** How the studio's tax settings add tax to the price, in words. */
  taxNote: string;
  categoryLabels: Record<ClaimCategory, string>;
}) {
  const form = useForm<TemplateFormValues>({
    resolver: useLazyZodResolver(() => import("@/lib/validation/plan-template-form").then((m) => m.templateFormSchema(exponent))),
    defaultValues: templateFormValues(template ?? null, exponent),
  });
  const errors = form.formState.errors;
  const { run, busy } = useRefreshingMutation(
    (json: ReturnType<typeof templateInputOf>) => (template ? apiJson(`/api/plans/${template.id}`, { method: "PUT", json }) : apiJson("/api/plans", { method: "POST", json })),
    {
      withFieldErrors: true,
      onSuccess: () => {
        if (template) return void toast.success("Saved. Plans already running keep the terms they were bought under.");
        toast.success("Plan added.");
        form.reset(templateFormValues(null, exponent));
      },
      onError: (words) => form.setError("root", { type: "server", message: words }),
    },
  );
  const onSubmit = form.handleSubmit((values) => run(templateInputOf(values, exponent)));
  const saving = busy || form.formState.isSubmitting;
  const id = template?.id ?? "new";
  return (
    <form onSubmit={onSubmit} noValidate className="grid gap-4 sm:grid-cols-2" aria-label={template ? `Change ${template.name}` : "New care plan"}>
      <div className="sm:col-span-2">
        <TextField label="Name" autoComplete="off" error={errors.name?.message} {...form.register("name")} />
      </div>
      <div className="space-y-1.5 sm:col-span-2">
        <label htmlFor={`summary-${id}`} className={legend}>
          What owners read about it
        </label>
        <textarea id={`summary-${id}`} rows={2} className={textarea} aria-invalid={errors.summary ? true : undefined} {...form.register("summary")} />
        <ErrorLine>{errors.summary?.message}</ErrorLine>
      </div>
      <TextField label={`Price (${currency}, before tax)`} inputMode="decimal" autoComplete="off" hint={taxNote} error={errors.price?.message} {...form.register("price")} />
      <SelectField label="Billed" error={errors.interval?.message} {...form.register("interval")}>
        <option value="year">Every year</option>
        <option value="month">Every month</option>
      </SelectField>

      <fieldset className="space-y-1 sm:col-span-2">
        <legend className={legend}>Care tasks the studio does (the owner gets no reminders for them)</legend>
        {CARE_TASK_KINDS.map((t) => (
          <label key={t} className={box}>
            <input type="checkbox" value={t} {...form.register("tasks")} /> {CARE_TASK_LABELS[t]}
          </label>
        ))}
      </fieldset>
      <TextField label="Studio visits a year" inputMode="numeric" error={errors.visitsPerYear?.message} {...form.register("visitsPerYear")} />
      <TextField label="Owner pays of each visit (%)" inputMode="numeric" hint="0: visits are included at no charge." error={errors.visitSharePct?.message} {...form.register("visitSharePct")} />
      <TextField label="Discount on paid repairs (%)" inputMode="numeric" error={errors.repairDiscountPct?.message} {...form.register("repairDiscountPct")} />

      <fieldset className="space-y-2 sm:col-span-2">
        <legend className={legend}>Longer warranty while the plan runs (extra months; empty for none)</legend>
        <div className="grid gap-3 sm:grid-cols-2">
          {CLAIM_CATEGORIES.map((c) => (
            <TextField key={c} label={categoryLabels[c]} inputMode="numeric" error={errors.extraMonths?.[c]?.message} {...form.register(`extraMonths.${c}`)} />
          ))}
        </div>
      </fieldset>

      <fieldset className="space-y-1 sm:col-span-2">
        <legend className={legend}>Fits these finishes (none ticked: any)</legend>
        {FINISH_CLASSES.map((f) => (
          <label key={f} className={box}>
            <input type="checkbox" value={f} {...form.register("finishClasses")} /> {FINISH_CLASS_LABELS[f]}
          </label>
        ))}
      </fieldset>
      <fieldset className="space-y-1 sm:col-span-2">
        <legend className={legend}>Fits these pieces (none ticked: any)</legend>
        {PIECE_KINDS.map((k) => (
          <label key={k} className={box}>
            <input type="checkbox" value={k} {...form.register("pieceKinds")} /> {PIECE_KIND_LABELS[k]}
          </label>
        ))}
      </fieldset>
      <TextField label="Smallest top (m²)" inputMode="decimal" hint="Empty: no lower bound." error={errors.minTopArea?.message} {...form.register("minTopArea")} />
      <TextField label="Largest top (m²)" inputMode="decimal" hint="Empty: no upper bound." error={errors.maxTopArea?.message} {...form.register("maxTopArea")} />

      <SelectField label="Money back when an owner cancels" error={errors.refundRule?.message} {...form.register("refundRule")}>
        <option value="none">None; the plan runs to the end of the period</option>
        <option value="unused_share">The unused part of the period</option>
      </SelectField>
      <div className="space-y-1">
        <label className={box}>
          <input type="checkbox" {...form.register("transfers")} /> The plan moves with the piece to a new owner
        </label>
        <label className={box}>
          <input type="checkbox" {...form.register("offered")} /> Offered to owners
        </label>
      </div>

      <div className="space-y-2 sm:col-span-2">
        <Button type="submit" disabled={saving}>
          {saving ? "Saving…" : template ? "Save as a new version" : "Add the plan"}
        </Button>
        <ErrorLine>{errors.root?.message}</ErrorLine>
      </div>
    </form>
  );
}
