"use client";

import { useEffect, useSyncExternalStore } from "react";
import { useActionForm } from "@/components/forms/use-action-form";
import { Button } from "@/components/ui/button";
import { SelectField, TextField } from "@/components/ui/field";
import { Notice } from "@/components/ui/notice";
import { listedZone, ZoneSelect } from "@/components/ui/zone-select";
import type { ActionResult } from "@/lib/validation/action";
import { CURRENCIES } from "@/lib/care/quote";
import type { ProfileInput } from "@/lib/validation/settings";
import { runtimeTimeZone, type ZoneChoices } from "@/lib/format";

const noSubscribe = () => () => {};

/**
 * The studio's profile and rates (settings and the set-up's first step). With `guessTimeZone`, a studio
 * still on UTC gets the browser's zone filled in (editable) until it is saved.
 */
export function ProfileForm({
  values,
  timeZones,
  action,
  guessTimeZone = false,
  submitLabel = "Save profile and rates",
}: {
  values: ProfileInput;
  timeZones: ZoneChoices;
  action: (v: ProfileInput) => Promise<ActionResult<unknown>>;
  guessTimeZone?: boolean;
  submitLabel?: string;
}) {
  const { form, onSubmit, formError } = useActionForm({
    schema: () => import("@/lib/validation/settings").then((m) => m.profileSchema),
    action,
    defaultValues: values,
    onSuccess: () => form.reset(form.getValues()),
  });
  const { register, formState, watch, setValue } = form;
  // Read after hydration (null on the server), so the guessed zone is an option before it is chosen.
  const guessed = listedZone(timeZones, useSyncExternalStore(noSubscribe, runtimeTimeZone, () => null));
  useEffect(() => {
    if (!guessTimeZone || values.timeZone !== "UTC") return;
    if (guessed && guessed !== "UTC") setValue("timeZone", guessed, { shouldDirty: true });
  }, [guessTimeZone, values.timeZone, guessed, setValue]);
  const e = formState.errors;
  const currency = watch("currency");
  return (
    <form onSubmit={onSubmit} noValidate className="space-y-6">
      {formError ? <Notice tone="error">{formError}</Notice> : null}
      <fieldset className="grid gap-4 sm:grid-cols-2">
        <legend className="mb-2 font-semibold">The studio</legend>
        <TextField label="Studio name" autoComplete="organization" {...register("name")} error={e.name?.message} />
        <TextField label="Studio e-mail" type="email" autoComplete="email" {...register("email")} error={e.email?.message} hint="Shown to owners in e-mails; leave empty to use none." />
        <div className="sm:col-span-2">
          <TextField label="Address" autoComplete="street-address" {...register("address")} error={e.address?.message} />
        </div>
        <TextField label="Phone" type="tel" autoComplete="tel" {...register("phone")} error={e.phone?.message} hint="Printed on receipts; optional." />
        <ZoneSelect label="Time zone" choices={timeZones} browserZone={guessTimeZone ? guessed : null} {...register("timeZone")} error={e.timeZone?.message} hint="Dates, the overview's months and visit hours follow it." />
        <SelectField label="Measurements" {...register("unitSystem")} error={e.unitSystem?.message}>
          <option value="metric">Metric (mm, m², mL)</option>
          <option value="imperial">Imperial (in, ft², US fl oz)</option>
        </SelectField>
      </fieldset>
      <fieldset className="grid gap-4 sm:grid-cols-2">
        <legend className="mb-2 font-semibold">Money</legend>
        <SelectField label="Currency" {...register("currency")} error={e.currency?.message} hint="New quotes use it; quotes and payments already made keep theirs.">
          {CURRENCIES.map((c) => (
            <option key={c} value={c}>
              {c}
            </option>
          ))}
        </SelectField>
        <TextField label="Tax rate (%)" inputMode="decimal" {...register("taxRatePct")} error={e.taxRatePct?.message} hint="Added to quotes, e.g. 8.5" />
        <TextField label={`Labour rate per hour (${currency})`} inputMode="decimal" {...register("labourRate")} error={e.labourRate?.message} />
        <TextField label={`Travel fee per visit (${currency})`} inputMode="decimal" {...register("travelFee")} error={e.travelFee?.message} />
      </fieldset>
      <Button type="submit" disabled={formState.isSubmitting}>
        {formState.isSubmitting ? "Saving…" : submitLabel}
      </Button>
    </form>
  );
}
