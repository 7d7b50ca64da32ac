"use client";

import { useFieldArray } from "react-hook-form";
import { useActionForm } from "@/components/forms/use-action-form";
import { Button } from "@/components/ui/button";
import { ErrorLine } from "@/components/ui/error-line";
import { SelectField, TextField } from "@/components/ui/field";
import { Notice } from "@/components/ui/notice";
import type { ActionResult } from "@/lib/validation/action";
import { SURFACE_LABELS, SURFACES } from "@/lib/care/vocabulary";
import { LINE_KIND_LABELS, LINE_KINDS, LINE_UNIT_LABELS, LINE_UNITS } from "@/lib/repairs/lines";
import type { RepairSettingsInput } from "@/lib/validation/repair-settings";

const ROUNDING_WORDS = { cent: "To the cent (exact)", whole: "To whole amounts", five: "To the nearest 5", ten: "To the nearest 10" } as const;
const TAX_MODE_WORDS = { none: "No tax", single: "One rate for everything", per_kind: "A rate per kind of line" } as const;

export function RepairSettingsForm({
  values,
  singleRatePct,
  currency,
  action,
}: {
  values: RepairSettingsInput;
  singleRatePct: string;
  currency: string;
  action: (v: RepairSettingsInput) => Promise<ActionResult<unknown>>;
}) {
  const { form, onSubmit, formError } = useActionForm({ schema: () => import("@/lib/validation/repair-settings").then((m) => m.repairSettingsSchema), action, defaultValues: values, onSuccess: () => form.reset(form.getValues()) });
  const { register, formState, control, watch } = form;
  const list = useFieldArray({ control, name: "priceList" });
  const e = formState.errors;
  const mode = watch("taxMode");
  return (
    <form onSubmit={onSubmit} noValidate className="space-y-6">
      {formError ? <Notice tone="error">{formError}</Notice> : null}
      <fieldset className="space-y-3">
        <legend className="font-semibold">Rounding</legend>
        <SelectField label="Round each quote line" hint="One rule for every quote; it is printed on the quote." {...register("roundingRule")} error={e.roundingRule?.message}>
          {(Object.keys(ROUNDING_WORDS) as (keyof typeof ROUNDING_WORDS)[]).map((r) => (
            <option key={r} value={r}>
              {ROUNDING_WORDS[r]}
            </option>
          ))}
        </SelectField>
      </fieldset>

      <fieldset className="space-y-3">
        <legend className="font-semibold">Tax</legend>
        <SelectField label="How tax is charged" {...register("taxMode")} error={e.taxMode?.message}>
          {(Object.keys(TAX_MODE_WORDS) as (keyof typeof TAX_MODE_WORDS)[]).map((m) => (
            <option key={m} value={m}>
              {TAX_MODE_WORDS[m]}
            </option>
          ))}
        </SelectField>
        {mode === "single" ? <p className="text-sm text-muted">The one rate is {singleRatePct} %, set under Profile and rates.</p> : null}
        {mode === "per_kind" ? (
          <div className="grid gap-3 sm:grid-cols-2">
            {LINE_KINDS.map((k) => (
              <TextField key={k} label={`${LINE_KIND_LABELS[k]} (%)`} inputMode="decimal" {...register(`taxRates.${k}`)} error={e.taxRates?.[k]?.message} />
            ))}
          </div>
        ) : null}
        <label className="flex min-h-11 items-center gap-2 rounded-lg border border-line bg-white px-3">
          <input type="checkbox" {...register("taxInclusive")} className="size-4" />
          Prices include tax (the tax is shown as the part of the price it is)
        </label>
        <TextField label="Tax number" hint="Printed on quotes and receipts. Leave empty if you have none." {...register("taxNumber")} error={e.taxNumber?.message} />
      </fieldset>

      <fieldset className="space-y-3">
        <legend className="font-semibold">Repair price list</legend>
        <p className="text-sm text-muted">Default prices in {currency}. Leave the price of an hourly task empty to charge your labour rate. “Size from” is the surface a quote reads the size of for a task priced per area.</p>
        <ErrorLine>{e.priceList?.message}</ErrorLine>
        <ol className="space-y-3">
          {list.fields.map((f, i) => (
            // Two rows from sm up, the task's name and Remove above its four settings: in one row of six the
            // kind select cut "Delivery and travel" and "Other work" short at 1280 px.
            <li key={f.id} className="grid gap-3 rounded-lg border border-line bg-white p-3 sm:grid-cols-[1.6fr_0.8fr_0.9fr_1fr] sm:items-end">
              <input type="hidden" {...register(`priceList.${i}.key`)} />
              <div className="sm:col-span-3">
                <TextField label="Task" {...register(`priceList.${i}.label`)} error={e.priceList?.[i]?.label?.message} />
              </div>
              <Button type="button" variant="secondary" className="order-last sm:order-none sm:justify-self-end" onClick={() => list.remove(i)} aria-label={`Remove ${f.label || `task ${i + 1}`}`}>
                Remove
              </Button>
              <SelectField label="Kind (for tax)" {...register(`priceList.${i}.kind`)}>
                {LINE_KINDS.map((k) => (
                  <option key={k} value={k}>
                    {LINE_KIND_LABELS[k]}
                  </option>
                ))}
              </SelectField>
              <SelectField label="Unit" {...register(`priceList.${i}.unit`)}>
                {LINE_UNITS.map((u) => (
                  <option key={u} value={u}>
                    {LINE_UNIT_LABELS[u]}
                  </option>
                ))}
              </SelectField>
              <SelectField label="Size from" {...register(`priceList.${i}.surface`)}>
                {SURFACES.map((x) => (
                  <option key={x} value={x}>
                    {SURFACE_LABELS[x]}
                  </option>
                ))}
              </SelectField>
              <TextField label={`Price (${currency})`} inputMode="decimal" {...register(`priceList.${i}.price`)} error={e.priceList?.[i]?.price?.message} />
            </li>
          ))}
        </ol>
        <Button type="button" variant="secondary" onClick={() => list.append({ key: "", label: "", kind: "labour", unit: "h", surface: "top", price: "" })}>
          Add a task
        </Button>
      </fieldset>

      <Button type="submit" disabled={formState.isSubmitting}>
        {formState.isSubmitting ? "Saving…" : "Save repair prices and tax"}
      </Button>
    </form>
  );
}
