"use client";

import type { FieldErrors, FieldValues, UseFormRegister, UseFormSetValue } from "react-hook-form";
import { SelectField, TextField } from "@/components/ui/field";
import { FINISH_CLASSES, FINISH_CLASS_LABELS, SURFACE_LABELS, SURFACES, type FinishClass } from "@/lib/care/vocabulary";
import { emptyToNull, numberOrNull } from "@/components/forms/field-values";

export type ProductOption = { id: string; name: string; finishClass: FinishClass };
export type MemberOption = { id: string; name: string };


type Errs = Partial<Record<"surface" | "finishClass" | "productId" | "productLabel" | "coats" | "appliedOn" | "appliedById" | "batchLot" | "notes", { message?: string }>>;

/** The fields of one finish layer; `prefix` is "" for a single-layer form or "layers.N." inside the piece form. */
export function LayerFields({
  prefix,
  register,
  setValue,
  errors,
  products,
  members,
  legend,
}: {
  prefix: string;
  register: UseFormRegister<FieldValues>;
  setValue: UseFormSetValue<FieldValues>;
  errors?: FieldErrors | Errs;
  products: ProductOption[];
  members: MemberOption[];
  legend?: string;
}) {
  const e = (errors ?? {}) as Errs;
  const n = (f: string) => `${prefix}${f}`;
  return (
    <fieldset className="grid gap-3 sm:grid-cols-2 lg:grid-cols-4">
      {legend ? <legend className="mb-2 text-sm font-semibold">{legend}</legend> : null}
      <SelectField label="Surface" {...register(n("surface"))} error={e.surface?.message}>
        {SURFACES.map((s) => (
          <option key={s} value={s}>
            {SURFACE_LABELS[s]}
          </option>
        ))}
      </SelectField>
      <SelectField
        label="Finish product"
        {...register(n("productId"), {
          setValueAs: emptyToNull,
          onChange: (ev) => {
            const p = products.find((x) => x.id === ev.target.value);
            if (p) setValue(n("finishClass"), p.finishClass, { shouldValidate: true });
          },
        })}
        error={e.productId?.message}
        hint="From the catalog, or leave empty and type a label."
      >
        <option value="">Not in the catalog</option>
        {products.map((p) => (
          <option key={p.id} value={p.id}>
            {p.name}
          </option>
        ))}
      </SelectField>
      <SelectField label="Finish class" {...register(n("finishClass"))} error={e.finishClass?.message}>
        {FINISH_CLASSES.map((c) => (
          <option key={c} value={c}>
            {FINISH_CLASS_LABELS[c]}
          </option>
        ))}
      </SelectField>
      <TextField label="Product label" {...register(n("productLabel"))} error={e.productLabel?.message} placeholder="e.g. satin hardwax oil" />
      <TextField label="Coats" inputMode="numeric" {...register(n("coats"), { setValueAs: numberOrNull })} error={e.coats?.message} />
      <TextField label="Date applied" type="date" {...register(n("appliedOn"))} error={e.appliedOn?.message} />
      <SelectField label="Applied by" {...register(n("appliedById"), { setValueAs: emptyToNull })} error={e.appliedById?.message}>
        <option value="">Not recorded</option>
        {members.map((m) => (
          <option key={m.id} value={m.id}>
            {m.name}
          </option>
        ))}
      </SelectField>
      <TextField label="Batch / lot" {...register(n("batchLot"))} error={e.batchLot?.message} />
      <div className="sm:col-span-2 lg:col-span-4">
        <TextField label="Layer notes" {...register(n("notes"))} error={e.notes?.message} />
      </div>
    </fieldset>
  );
}
