"use client";

import { useEffect, useSyncExternalStore } from "react";
import { Button } from "@/components/ui/button";
import { Notice } from "@/components/ui/notice";
import { listedZone, ZoneSelect } from "@/components/ui/zone-select";
import { useActionForm } from "@/components/forms/use-action-form";
import type { ActionResult } from "@/lib/validation/action";
import type { PreferencesInput } from "@/lib/validation/owner";
import { runtimeTimeZone, type ZoneChoices } from "@/lib/format";

const noSubscribe = () => () => {};

export function PreferencesForm({
  action,
  defaults,
  zones,
  zoneNeverSet,
}: {
  action: (v: PreferencesInput) => Promise<ActionResult<unknown>>;
  defaults: PreferencesInput;
  /** The zones in words, named by the page (lib/format zoneChoices). */
  zones: ZoneChoices;
  /** The account still has the default zone: offer the browser's. */
  zoneNeverSet: boolean;
}) {
  const { form, onSubmit, formError } = useActionForm({ schema: () => import("@/lib/validation/owner").then((m) => m.preferencesSchema), action, defaultValues: defaults, successMessage: "Preferences saved." });
  const { register, formState, setValue } = form;
  // The browser's zone under the id the server's list uses (Asia/Kolkata → Asia/Calcutta), so it is offered once.
  const browserZone = listedZone(zones, useSyncExternalStore(noSubscribe, runtimeTimeZone, () => null));
  useEffect(() => {
    if (zoneNeverSet && browserZone && browserZone !== defaults.timeZone) {
      setValue("timeZone", browserZone, { shouldDirty: true });
    }
  }, [zoneNeverSet, browserZone, defaults.timeZone, setValue]);
  const fromBrowser = zoneNeverSet && browserZone !== null && browserZone !== defaults.timeZone && form.watch("timeZone") === browserZone;

  return (
    <form onSubmit={onSubmit} noValidate className="space-y-6">
      {formError ? (
        <Notice tone="error" title="Not saved yet">
          {formError}
        </Notice>
      ) : null}
      <fieldset className="space-y-2">
        <legend className="text-sm font-medium">Care reminder e-mails</legend>
        <label className="flex min-h-11 items-start gap-3 rounded-lg border border-line bg-white p-3">
          <input type="checkbox" className="mt-0.5 size-5 shrink-0 accent-[#0f5e5e]" {...register("remindersEnabled")} />
          <span className="text-sm">
            <span className="block font-semibold">Send me care reminders</span>
            <span className="text-muted">Two weeks before a care task is due, on the day, and a month after. Mail about your claims and visits always comes.</span>
          </span>
        </label>
      </fieldset>
      <ZoneSelect
        label="Time zone"
        choices={zones}
        browserZone={zoneNeverSet ? browserZone : null}
        {...register("timeZone")}
        error={formState.errors.timeZone?.message}
        hint={fromBrowser ? "Filled in from this device — save to keep it." : "Dates and reminder times follow this zone."}
      />
      <fieldset className="space-y-2">
        <legend className="text-sm font-medium">Units</legend>
        <div className="grid grid-cols-2 gap-2">
          {(["metric", "imperial"] as const).map((u) => (
            <label key={u} className="flex min-h-11 items-center gap-2 rounded-lg border border-line bg-white px-3 text-sm has-[:checked]:border-resin has-[:checked]:bg-resin-soft">
              <input type="radio" value={u} className="size-5 accent-[#0f5e5e]" {...register("unitSystem")} />
              {u === "metric" ? "Metric (mm, m², mL)" : "Imperial (in, ft², fl oz)"}
            </label>
          ))}
        </div>
        {formState.errors.unitSystem ? <p role="alert" className="text-sm font-medium text-danger">{formState.errors.unitSystem.message}</p> : null}
      </fieldset>
      <Button type="submit" className="w-full sm:w-auto" disabled={formState.isSubmitting}>
        {formState.isSubmitting ? "Saving…" : "Save preferences"}
      </Button>
    </form>
  );
}
