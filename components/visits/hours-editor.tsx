"use client";

import { useState } from "react";
import { useFieldArray, useForm } from "react-hook-form";
import { toast } from "sonner";
import { Button } from "@/components/ui/button";
import { SelectField, TextField } from "@/components/ui/field";
import { Notice } from "@/components/ui/notice";
import { SpriteIcon } from "@/components/ui/sprite-icon";
import type { technicianHoursSchema, TechnicianHoursInput } from "@/lib/validation/visits";
import { useLazyZodResolver } from "@/components/forms/lazy-zod-resolver";
import { apiJson, isApiError } from "@/components/api-client";

const WEEKDAYS = ["Monday", "Tuesday", "Wednesday", "Thursday", "Friday", "Saturday", "Sunday"];
type Values = { hours: { weekday: number; start: string; end: string }[]; timeOff: { date: string; start?: string | null; end?: string | null; note: string }[] };

/** One technician's weekly hours and time off, saved together (PUT /api/technicians/[id]/hours). */
export function HoursEditor({ technicianId, name, initial, editable }: { technicianId: string; name: string; initial: Values; editable: boolean }) {
  const form = useForm<TechnicianHoursInput, unknown, Values>({
    resolver: useLazyZodResolver<typeof technicianHoursSchema, TechnicianHoursInput, Values>(() => import("@/lib/validation/visits").then((m) => m.technicianHoursSchema)),
    defaultValues: { hours: initial.hours, timeOff: initial.timeOff.map((t) => ({ ...t, start: t.start ?? "", end: t.end ?? "" })) },
    // Checked on pressing the button, then as fields are fixed: an error shown on leaving a field moved the
    // button during the press (the same choice as components/claims/claim-form.tsx).
    mode: "onSubmit",
    reValidateMode: "onChange",
  });
  const hours = useFieldArray({ control: form.control, name: "hours" });
  const off = useFieldArray({ control: form.control, name: "timeOff" });
  const [error, setError] = useState<string | null>(null);
  const e = form.formState.errors;
  const submit = form.handleSubmit(async (v) => {
    setError(null);
    try {
      await apiJson(`/api/technicians/${technicianId}/hours`, { method: "PUT", json: v });
      toast.success(`Hours saved for ${name}.`);
    } catch (err) {
      setError(isApiError(err) ? err.message : "Couldn't save.");
      for (const [field, messages] of Object.entries((isApiError(err) && err.fieldErrors) || {})) if (messages?.[0]) form.setError(field as never, { message: messages[0] });
    }
  });
  return (
    <form onSubmit={submit} noValidate className="space-y-4" aria-label={`Working hours of ${name}`}>
      {error ? <Notice tone="error" title="Not saved">{error} Nothing you typed is lost.</Notice> : null}
      <fieldset className="space-y-2" disabled={!editable}>
        <legend className="text-sm font-semibold">Weekly hours</legend>
        {hours.fields.map((f, i) => (
          <div key={f.id} className="grid grid-cols-[minmax(0,1.3fr)_minmax(0,1fr)_minmax(0,1fr)_auto] items-end gap-2">
            <SelectField label="Day" error={e.hours?.[i]?.weekday?.message} {...form.register(`hours.${i}.weekday`, { valueAsNumber: true })}>
              {WEEKDAYS.map((d, n) => (
                <option key={d} value={n + 1}>{d}</option>
              ))}
            </SelectField>
            <TextField label="From" type="time" step={1800} error={e.hours?.[i]?.start?.message} {...form.register(`hours.${i}.start`)} />
            <TextField label="To" type="time" step={1800} error={e.hours?.[i]?.end?.message} {...form.register(`hours.${i}.end`)} />
            <Button variant="ghost" aria-label={`Remove range ${i + 1}`} onClick={() => hours.remove(i)}>
              <SpriteIcon name="trash" className="size-4" />
            </Button>
          </div>
        ))}
        <Button variant="secondary" onClick={() => hours.append({ weekday: 1, start: "09:00", end: "17:00" })}>
          <SpriteIcon name="plus" className="size-4" /> Add hours
        </Button>
      </fieldset>
      <fieldset className="space-y-2" disabled={!editable}>
        <legend className="text-sm font-semibold">Days off and exceptions</legend>
        <p className="text-sm text-muted">Leave the times empty for the whole day.</p>
        {off.fields.map((f, i) => (
          <div key={f.id} className="grid grid-cols-2 items-end gap-2 sm:grid-cols-[1fr_1fr_1fr_2fr_auto]">
            <TextField label="Date" type="date" error={e.timeOff?.[i]?.date?.message} {...form.register(`timeOff.${i}.date`)} />
            <TextField label="From" type="time" error={e.timeOff?.[i]?.start?.message} {...form.register(`timeOff.${i}.start`, { setValueAs: (v) => (v === "" ? null : v) })} />
            <TextField label="To" type="time" error={e.timeOff?.[i]?.end?.message} {...form.register(`timeOff.${i}.end`, { setValueAs: (v) => (v === "" ? null : v) })} />
            <TextField label="Note" error={e.timeOff?.[i]?.note?.message} {...form.register(`timeOff.${i}.note`)} />
            <Button variant="ghost" aria-label={`Remove day off ${i + 1}`} onClick={() => off.remove(i)}>
              <SpriteIcon name="trash" className="size-4" />
            </Button>
          </div>
        ))}
        <Button variant="secondary" onClick={() => off.append({ date: "", start: null, end: null, note: "" })}>
          <SpriteIcon name="plus" className="size-4" /> Add a day off
        </Button>
      </fieldset>
      {editable ? (
        <Button type="submit" disabled={form.formState.isSubmitting}>
          {form.formState.isSubmitting ? "Saving…" : "Save hours"}
        </Button>
      ) : null}
    </form>
  );
}
