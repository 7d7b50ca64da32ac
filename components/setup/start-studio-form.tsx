"use client";

import { useEffect, useSyncExternalStore } from "react";
import { useActionForm } from "@/components/forms/use-action-form";
import { Button } from "@/components/ui/button";
import { SelectField, TextField } from "@/components/ui/field";
import { Notice } from "@/components/ui/notice";
import { listedZone, ZoneSelect } from "@/components/ui/zone-select";
import { CURRENCIES } from "@/lib/care/quote";
import type { StartStudioInput } from "@/lib/studio/create-schema";
import type { ActionResult } from "@/lib/validation/action";
import { runtimeTimeZone, type ZoneChoices } from "@/lib/format";

const noSubscribe = () => () => {};

/** Name, time zone (guessed from this browser until changed), currency and measurements of a new studio. */
export function StartStudioForm({
  action,
  invite,
  timeZones,
}: {
  action: (v: StartStudioInput) => Promise<ActionResult<unknown>>;
  invite?: string;
  timeZones: ZoneChoices;
}) {
  const { form, onSubmit, formError } = useActionForm({
    schema: () => import("@/lib/studio/create-schema").then((m) => m.startStudioSchema),
    action,
    defaultValues: {
      name: "",
      timeZone: "UTC",
      currency: "USD",
      unitSystem: "metric",
      invite,
    },
  });
  const { register, formState, setValue, getFieldState } = form;
  const e = formState.errors;

  // Read after hydration (null on the server), so the guessed zone is an option before it is chosen.
  const guessed = listedZone(timeZones, useSyncExternalStore(noSubscribe, runtimeTimeZone, () => null));
  useEffect(() => {
    if (guessed && !getFieldState("timeZone").isDirty) setValue("timeZone", guessed);
  }, [guessed, getFieldState, setValue]);

  return (
    <form onSubmit={onSubmit} noValidate className="space-y-4">
      {formError ? (
        <Notice tone="error" title="Couldn't start the studio">
          {formError}
        </Notice>
      ) : null}
      <TextField label="Studio name" autoComplete="organization" {...register("name")} error={e.name?.message} />
      <ZoneSelect
        label="Time zone"
        choices={timeZones}
        browserZone={guessed}
        {...register("timeZone")}
        error={e.timeZone?.message}
        hint="Taken from this device; change it if the workshop is elsewhere. Dates and visit hours follow it."
      />
      <SelectField label="Currency" {...register("currency")} error={e.currency?.message} hint="Quotes and payments use it.">
        {CURRENCIES.map((c) => (
          <option key={c} value={c}>
            {c}
          </option>
        ))}
      </SelectField>
      <SelectField label="Measurements" {...register("unitSystem")} error={e.unitSystem?.message}>
        <option value="metric">Metric (mm, m², mL)</option>
        <option value="imperial">Imperial (in, ft², US fl oz)</option>
      </SelectField>
      <input type="hidden" {...register("invite")} />
      <Button type="submit" className="w-full" disabled={formState.isSubmitting}>
        {formState.isSubmitting ? "Starting your studio…" : "Start the studio"}
      </Button>
    </form>
  );
}
