"use client";

import { useActionForm } from "@/components/forms/use-action-form";
import { Button } from "@/components/ui/button";
import { SelectField, TextField } from "@/components/ui/field";
import { Notice } from "@/components/ui/notice";
import type { ActionResult } from "@/lib/validation/action";
import { SLOT_STEPS } from "@/lib/care/vocabulary";
import type { VisitRulesInput } from "@/lib/validation/settings";

export function VisitRulesForm({ values, action }: { values: VisitRulesInput; action: (v: VisitRulesInput) => Promise<ActionResult<unknown>> }) {
  const { form, onSubmit, formError } = useActionForm({ schema: () => import("@/lib/validation/settings").then((m) => m.visitRulesSchema), action, defaultValues: values, onSuccess: () => form.reset(form.getValues()) });
  const { register, formState } = form;
  const e = formState.errors;
  return (
    <form onSubmit={onSubmit} noValidate className="space-y-5">
      {formError ? <Notice tone="error">{formError}</Notice> : null}
      <div className="grid gap-4 sm:grid-cols-2">
        <TextField
          label="Booking notice for owners (hours)"
          hint="An owner can't pick a slot that starts sooner than this. Staff booking for an owner can pick any free slot."
          type="number"
          inputMode="numeric"
          min={0}
          max={336}
          {...register("leadTimeHours", { valueAsNumber: true })}
          error={e.leadTimeHours?.message}
        />
        <TextField
          label="Owners can move or cancel until (hours before)"
          hint="After that, the owner asks the studio; staff can still move or cancel until the visit starts."
          type="number"
          inputMode="numeric"
          min={0}
          max={168}
          {...register("ownerChangeCutoffHours", { valueAsNumber: true })}
          error={e.ownerChangeCutoffHours?.message}
        />
        <TextField
          label="Travel buffer between visits (minutes)"
          hint="Kept clear before and after each of a technician's visits."
          type="number"
          inputMode="numeric"
          min={0}
          max={240}
          {...register("travelBufferMin", { valueAsNumber: true })}
          error={e.travelBufferMin?.message}
        />
        <SelectField label="Offer start times every" {...register("slotStepMin", { valueAsNumber: true })} error={e.slotStepMin?.message}>
          {SLOT_STEPS.map((m) => (
            <option key={m} value={m}>
              {m} minutes
            </option>
          ))}
        </SelectField>
      </div>
      <Button type="submit" disabled={formState.isSubmitting}>
        {formState.isSubmitting ? "Saving…" : "Save visit rules"}
      </Button>
    </form>
  );
}
