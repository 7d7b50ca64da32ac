"use client";

import { useRouter } from "next/navigation";
import { useId, useState } from "react";
import { Controller, useFieldArray } from "react-hook-form";
import { toast } from "sonner";
import { useActionForm } from "@/components/forms/use-action-form";
import { apiJson, callApi } from "@/components/api-client";
import { useRefreshingMutation } from "@/components/forms/use-refreshing-mutation";
import { numberOrNull } from "@/components/forms/field-values";
import { Button } from "@/components/ui/button";
import { ErrorLine } from "@/components/ui/error-line";
import { SelectField, TextField } from "@/components/ui/field";
import { Notice } from "@/components/ui/notice";
import { SpriteIcon } from "@/components/ui/sprite-icon";
import { DEFAULT_CURE_TIMES } from "@/lib/care/cure";
import { DEFAULT_WEAR_INTERVALS } from "@/lib/care/intervals";
import { FINISH_CLASSES, FINISH_CLASS_LABELS, type FinishClass } from "@/lib/care/vocabulary";
import { currencyDigits, formatCoverage, formatMoney, formatVolume, type UnitSystem } from "@/lib/format";
import { catalogFormFieldErrors, catalogFormToProduct, catalogProductToForm, type CatalogFormValues } from "@/lib/validation/catalog-form";

export type CatalogRow = {
  id: string;
  name: string;
  finishClass: FinishClass;
  coverageM2PerL: number;
  containers: { ml: number; priceMinor: number }[];
  intervalHeavyMonths: number | null;
  intervalModerateMonths: number | null;
  intervalLightMonths: number | null;
  safetyNotes: string;
  cureLightUseHours: number | null;
  cureFullDays: number | null;
  archivedAt: string | Date | null;
  defaults: { heavy: number; moderate: number; light: number };
  cureDefaults: { lightUseHours: number; fullCureDays: number };
};

/** A price typed in the currency's major unit, kept in minor units. */
function MoneyField({ label, currency, value, onChange, error, ref }: { label: string; currency: string; value: number | null | undefined; onChange: (v: number | null) => void; error?: string; ref?: React.Ref<HTMLInputElement> }) {
  const exp = currencyDigits(currency);
  const id = useId();
  const [text, setText] = useState(value == null ? "" : (value / 10 ** exp).toFixed(exp));
  return (
    <div className="space-y-1.5">
      <label htmlFor={id} className="block text-sm font-medium">
        {label} <span className="font-normal text-muted">({currency})</span>
      </label>
      <input
        ref={ref}
        id={id}
        inputMode="decimal"
        value={text}
        aria-invalid={error ? true : undefined}
        onChange={(e) => {
          setText(e.target.value);
          const n = Number(e.target.value.replace(",", "."));
          onChange(e.target.value.trim() === "" ? null : Math.round(n * 10 ** exp));
        }}
        className="block min-h-11 w-full rounded-lg border border-line bg-white px-3 py-2 text-base focus:border-resin aria-[invalid=true]:border-danger"
      />
      <ErrorLine>{error}</ErrorLine>
    </div>
  );
}

function ProductForm({ product, currency, units, onDone }: { product?: CatalogRow; currency: string; units: UnitSystem; onDone: () => void }) {
  const router = useRouter();
  const { form, onSubmit, formError } = useActionForm({
    schema: () => import("@/lib/validation/catalog-form").then((m) => m.catalogFormSchema(units)),
    // Coverage and sizes are typed in the studio's units; the API takes the stored metric (lib/validation/catalog-form.ts).
    action: async (v: CatalogFormValues) => {
      const json = catalogFormToProduct(v, units, product);
      const r = await (product ? callApi(`/api/catalog/${product.id}`, { method: "PATCH", json }) : callApi("/api/catalog", { method: "POST", json }));
      return r.ok ? r : { ...r, fieldErrors: catalogFormFieldErrors(r.fieldErrors) };
    },
    defaultValues: product
      ? {
          name: product.name,
          finishClass: product.finishClass,
          ...catalogProductToForm(product, units),
          intervalHeavyMonths: product.intervalHeavyMonths ?? product.defaults.heavy,
          intervalModerateMonths: product.intervalModerateMonths ?? product.defaults.moderate,
          intervalLightMonths: product.intervalLightMonths ?? product.defaults.light,
          safetyNotes: product.safetyNotes,
          cureLightUseHours: product.cureLightUseHours,
          cureFullDays: product.cureFullDays,
        }
      : { name: "", finishClass: "hardwax_oil", containers: [], safetyNotes: "", intervalHeavyMonths: null, intervalModerateMonths: null, intervalLightMonths: null, cureLightUseHours: null, cureFullDays: null },
    successMessage: product ? "Finish product saved." : "Finish product added to the catalog.",
    onSuccess: () => {
      onDone();
      router.refresh();
    },
  });
  const { register, control, formState, watch } = form;
  const e = formState.errors;
  const containers = useFieldArray({ control, name: "containers" });
  const cls = watch("finishClass") as FinishClass;
  const d = DEFAULT_WEAR_INTERVALS[cls];
  const defaults = d ? [d.heavy, d.moderate, d.light] : [];
  const cure = DEFAULT_CURE_TIMES[cls] ?? DEFAULT_CURE_TIMES.hardwax_oil;
  return (
    <form onSubmit={onSubmit} noValidate className="space-y-4 rounded-xl border border-resin/40 bg-paper p-4" aria-label={product ? `Edit ${product.name}` : "New finish product"}>
      {formError ? <Notice tone="error">{formError}</Notice> : null}
      <div className="grid gap-3 sm:grid-cols-3">
        <TextField label="Name" {...register("name")} error={e.name?.message} placeholder="An invented or generic name" />
        <SelectField label="Finish class" {...register("finishClass")} error={e.finishClass?.message}>
          {FINISH_CLASSES.map((c) => (
            <option key={c} value={c}>
              {FINISH_CLASS_LABELS[c]}
            </option>
          ))}
        </SelectField>
        <TextField
          label={units === "imperial" ? "Coverage per coat (ft²/US gal)" : "Coverage per coat (m²/L)"}
          hint={units === "imperial" ? "As US labels print it, in square feet per US gallon." : undefined}
          inputMode="decimal"
          {...register("coverage", { setValueAs: numberOrNull })} error={e.coverage?.message} />
      </div>
      <fieldset className="space-y-2">
        <legend className="text-sm font-semibold">Wear intervals, months</legend>
        <p className="text-sm text-muted">Defaults for this class (heavy / moderate / light use): {defaults.join(" / ")}. Leave empty or keep a default to follow it.</p>
        <div className="grid gap-3 sm:grid-cols-3">
          <TextField label="Heavy use" inputMode="numeric" placeholder={String(defaults[0] ?? "")} {...register("intervalHeavyMonths", { setValueAs: numberOrNull })} error={e.intervalHeavyMonths?.message} />
          <TextField label="Moderate use" inputMode="numeric" placeholder={String(defaults[1] ?? "")} {...register("intervalModerateMonths", { setValueAs: numberOrNull })} error={e.intervalModerateMonths?.message} />
          <TextField label="Light use" inputMode="numeric" placeholder={String(defaults[2] ?? "")} {...register("intervalLightMonths", { setValueAs: numberOrNull })} error={e.intervalLightMonths?.message} />
        </div>
      </fieldset>
      <fieldset className="space-y-2">
        <legend className="text-sm font-semibold">Cure time, from the product&apos;s label</legend>
        <p className="text-sm text-muted">
          Owners are told how long to keep water and objects off a fresh coat, and when full use is fine. Leave empty to use this class&apos;s usual times ({cure.lightUseHours} hours to light use, {cure.fullCureDays} days to full use).
        </p>
        <div className="grid gap-3 sm:grid-cols-2">
          <TextField label="Hours until light use" inputMode="numeric" placeholder={String(cure.lightUseHours)} {...register("cureLightUseHours", { setValueAs: numberOrNull })} error={e.cureLightUseHours?.message} />
          <TextField label="Days until full use" inputMode="numeric" placeholder={String(cure.fullCureDays)} {...register("cureFullDays", { setValueAs: numberOrNull })} error={e.cureFullDays?.message} />
        </div>
      </fieldset>
      <fieldset className="space-y-2">
        <legend className="text-sm font-semibold">Container sizes and unit prices</legend>
        {containers.fields.map((f, i) => (
          <div key={f.id} className="grid items-end gap-3 sm:grid-cols-[1fr_1fr_auto]">
            <TextField label={units === "imperial" ? "Size (US fl oz)" : "Size (mL)"} inputMode={units === "imperial" ? "decimal" : "numeric"} {...register(`containers.${i}.size`, { setValueAs: numberOrNull })} error={e.containers?.[i]?.size?.message} />
            <Controller control={control} name={`containers.${i}.priceMinor`} render={({ field }) => <MoneyField ref={field.ref} label="Price" currency={currency} value={field.value as number | null | undefined} onChange={field.onChange} error={e.containers?.[i]?.priceMinor?.message} />} />
            <Button variant="ghost" onClick={() => containers.remove(i)} aria-label={`Remove container ${i + 1}`}>
              <SpriteIcon name="trash" className="size-4" /> Remove
            </Button>
          </div>
        ))}
        <Button variant="secondary" onClick={() => containers.append({ size: units === "imperial" ? 8 : 250, priceMinor: 0 })}>
          <SpriteIcon name="plus" className="size-4" /> Add a container size
        </Button>
      </fieldset>
      <TextField label="Safety notes" {...register("safetyNotes")} error={e.safetyNotes?.message} placeholder="e.g. oily rags: dry flat outdoors or in a water-filled metal can" />
      <div className="flex gap-2">
        <Button type="submit" disabled={formState.isSubmitting}>
          {product ? "Save product" : "Add product"}
        </Button>
        <Button variant="secondary" onClick={onDone}>
          Cancel
        </Button>
      </div>
    </form>
  );
}

export function CatalogManager({ products, currency, country, units }: { products: CatalogRow[]; currency: string; country: string; units: UnitSystem }) {
  const [editing, setEditing] = useState<string | "new" | null>(null);
  const [confirm, setConfirm] = useState<string | null>(null);
  const archive = useRefreshingMutation(
    ({ p, archived }: { p: CatalogRow; archived: boolean }) => (archived ? apiJson(`/api/catalog/${p.id}`, { method: "DELETE" }) : apiJson(`/api/catalog/${p.id}`, { method: "PATCH", json: { archived: false } })),
    {
      onSuccess: (_, { p, archived }) => {
        setConfirm(null);
        toast.success(archived ? `${p.name} archived; layers that used it keep its name.` : `${p.name} is back in the pickers.`);
      },
      onError: (words) => {
        setConfirm(null);
        toast.error(words);
      },
    },
  );
  const setArchived = (p: CatalogRow, archived: boolean) => archive.run({ p, archived });
  const months = (v: number | null, d: number) => (v == null ? `${d}` : <strong>{v}</strong>);
  return (
    <div className="space-y-4">
      {editing === "new" ? (
        <ProductForm currency={currency} units={units} onDone={() => setEditing(null)} />
      ) : (
        <Button onClick={() => setEditing("new")}>
          <SpriteIcon name="plus" className="size-4" /> New finish product
        </Button>
      )}
      {products.length === 0 ? <p className="rounded-xl border border-dashed border-line bg-card p-6 text-center text-muted">No finish products yet. Add the products the studio finishes with.</p> : null}
      <ul className="space-y-3">
        {products.map((p) => (
          <li key={p.id} className="rounded-xl border border-line bg-card p-4">
            {editing === p.id ? (
              <ProductForm product={p} currency={currency} units={units} onDone={() => setEditing(null)} />
            ) : (
              <div className="flex flex-wrap items-start justify-between gap-3">
                <div className="min-w-0 space-y-1">
                  <p className="font-semibold">
                    {p.name}
                    {p.archivedAt ? (
                      <span className="ml-2 inline-flex items-center gap-1 text-sm font-normal text-muted">
                        <SpriteIcon name="archive" className="size-4" /> Archived
                      </span>
                    ) : null}
                  </p>
                  <p className="text-sm text-muted">
                    {FINISH_CLASS_LABELS[p.finishClass]} · {formatCoverage(p.coverageM2PerL, units)} per coat
                  </p>
                  <p className="text-sm">
                    Wear intervals (heavy / moderate / light): {months(p.intervalHeavyMonths, p.defaults.heavy)} / {months(p.intervalModerateMonths, p.defaults.moderate)} / {months(p.intervalLightMonths, p.defaults.light)} months
                    {p.intervalHeavyMonths ?? p.intervalModerateMonths ?? p.intervalLightMonths ? <span className="text-muted"> (bold: the studio&apos;s own)</span> : <span className="text-muted"> (defaults)</span>}
                  </p>
                  <p className="text-sm">{p.containers.length ? p.containers.map((c) => `${formatVolume(c.ml, units)} at ${formatMoney(c.priceMinor, currency, country)}`).join(" · ") : <span className="text-muted">No container sizes</span>}</p>
                  <p className="text-sm">
                    Cure: {p.cureLightUseHours ?? p.cureDefaults.lightUseHours} hours to light use, {p.cureFullDays ?? p.cureDefaults.fullCureDays} days to full use
                    <span className="text-muted">{p.cureLightUseHours != null || p.cureFullDays != null ? " (from the label)" : " (usual for the class)"}</span>
                  </p>
                  {p.safetyNotes ? <p className="text-sm text-muted">Safety: {p.safetyNotes}</p> : null}
                </div>
                <div className="flex gap-2">
                  <Button variant="secondary" onClick={() => setEditing(p.id)} aria-label={`Edit ${p.name}`}>
                    <SpriteIcon name="pencil" className="size-4" /> Edit
                  </Button>
                  {p.archivedAt ? (
                    <Button variant="secondary" onClick={() => setArchived(p, false)}>
                      <SpriteIcon name="archive-arrow-up" className="size-4" /> Restore
                    </Button>
                  ) : (
                    <Button variant="secondary" onClick={() => setConfirm(p.id)}>
                      <SpriteIcon name="archive" className="size-4" /> Archive
                    </Button>
                  )}
                </div>
              </div>
            )}
            {confirm === p.id ? (
              <div role="alertdialog" aria-label={`Archive ${p.name}?`} className="mt-3 flex flex-wrap items-center gap-2 rounded-lg bg-danger-soft p-3 text-sm">
                <span className="font-semibold">Archive {p.name}? It leaves the layer pickers; recorded layers keep its name.</span>
                <Button variant="danger" onClick={() => setArchived(p, true)}>
                  Archive
                </Button>
                <Button variant="secondary" onClick={() => setConfirm(null)}>
                  Cancel
                </Button>
              </div>
            ) : null}
          </li>
        ))}
      </ul>
    </div>
  );
}
