"use client";

import { useActionForm } from "@/components/forms/use-action-form";
import { Button } from "@/components/ui/button";
import { SelectField } from "@/components/ui/field";
import { Notice } from "@/components/ui/notice";
import { REMINDER_STEPS, type ReminderStep } from "@/lib/care/vocabulary";
import type { ActionResult } from "@/lib/validation/action";
import type { ReminderTimingInput } from "@/lib/validation/settings";

const STEP_WORDS: Record<ReminderStep, { label: string; hint: string }> = {
  before_14d: { label: "14 days before the due date", hint: "Time to buy product or book a refresh visit; refresh offers go with the first reminder sent." },
  due_day: { label: "On the due date", hint: "The nudge most owners act on." },
  after_30d: { label: "30 days after, if not logged", hint: "The last one; after it Grainward stops for that task." },
};

export function ReminderTimingForm({ values, action }: { values: ReminderTimingInput; action: (v: ReminderTimingInput) => Promise<ActionResult<unknown>> }) {
  const { form, onSubmit, formError } = useActionForm({ schema: () => import("@/lib/validation/settings").then((m) => m.reminderTimingSchema), action, defaultValues: values, onSuccess: () => form.reset(form.getValues()) });
  const { register, formState, watch } = form;
  const steps = watch("steps") ?? [];
  return (
    <form onSubmit={onSubmit} noValidate className="space-y-5">
      {formError ? <Notice tone="error">{formError}</Notice> : null}
      <div className="max-w-xs">
        <SelectField label="Send at (owner's local time)" {...register("sendHour", { valueAsNumber: true })} error={formState.errors.sendHour?.message}>
          {Array.from({ length: 24 }, (_, h) => (
            <option key={h} value={h}>
              {String(h).padStart(2, "0")}:00
            </option>
          ))}
        </SelectField>
      </div>
      <fieldset className="space-y-2">
        <legend className="mb-1 text-sm font-medium">Which reminders go out</legend>
        {REMINDER_STEPS.map((s) => (
          <label key={s} className="flex min-h-11 items-start gap-3 text-sm">
            <input type="checkbox" className="mt-0.5 size-5 accent-resin" value={s} {...register("steps")} />
            <span>
              <span className="font-medium">{STEP_WORDS[s].label}</span>
              <span className="block text-muted">{STEP_WORDS[s].hint}</span>
            </span>
          </label>
        ))}
      </fieldset>
      {Array.isArray(steps) && steps.length === 0 ? (
        <Notice tone="warn" title="No reminders">
          With every step off, owners get no care reminders and no refresh offers. Mail about their claims and visits still goes out.
        </Notice>
      ) : null}
      <Button type="submit" disabled={formState.isSubmitting}>
        {formState.isSubmitting ? "Saving…" : "Save reminder timing"}
      </Button>
    </form>
  );
}
