"use client";

import { useRouter } from "next/navigation";
import { useState } from "react";
import { Controller, useFieldArray, type FieldValues, type UseFormRegister, type UseFormSetValue } from "react-hook-form";
import { toast } from "sonner";
import { BuyerFields } from "@/components/clients/buyer-fields";
import { useActionForm } from "@/components/forms/use-action-form";
import { Button } from "@/components/ui/button";
import { ErrorLine } from "@/components/ui/error-line";
import { SelectField, TextField } from "@/components/ui/field";
import { Notice } from "@/components/ui/notice";
import { SpriteIcon } from "@/components/ui/sprite-icon";
import { PIECE_KINDS, PIECE_KIND_LABELS, RESIN_KINDS, RESIN_LABELS, SHAPE_KINDS, SUN_EXPOSURES, SUN_LABELS, USES, USE_LABELS } from "@/lib/care/vocabulary";
import type { CreatePieceInput } from "@/lib/validation/pieces";
import { callApi } from "@/components/api-client";
import { emptyToNull } from "@/components/forms/field-values";
import { LayerFields, type MemberOption, type ProductOption } from "./layer-fields";
import { SpeciesPicker } from "./species-picker";
import { UnitNumberField, UnitToggle, type UnitSystem } from "./unit-fields";

const SHAPE_LABELS = { rectangle: "Rectangle", round: "Round", oval: "Oval", measured: "Irregular (measured area)" } as const;

type Created = { piece: { id: string; title: string }; registrationCode: string; handover?: { sent: boolean; reason: string | null } };

function Section({ title, children, aside }: { title: string; children: React.ReactNode; aside?: React.ReactNode }) {
  return (
    <section className="space-y-4 rounded-xl border border-line bg-card p-5">
      <div className="flex flex-wrap items-center justify-between gap-2">
        <h2 className="font-display text-xl font-semibold">{title}</h2>
        {aside}
      </div>
      {children}
    </section>
  );
}

/** The piece record form: one zod schema with POST/PATCH /api/pieces; lengths stored in mm, shown in either unit system. */
export function PieceForm({
  mode,
  pieceId,
  initial,
  unitSystem,
  products,
  members,
  today,
  buyer = null,
}: {
  mode: "create" | "edit";
  pieceId?: string;
  initial?: Partial<CreatePieceInput>;
  unitSystem: UnitSystem;
  products: ProductOption[];
  members: MemberOption[];
  today: string;
  /** A new piece opened from a client's page: that client is the buyer, already picked. */
  buyer?: { id: string; name: string; email: string } | null;
}) {
  const router = useRouter();
  const [system, setSystem] = useState<UnitSystem>(unitSystem);
  const { form, onSubmit, formError } = useActionForm({
    // lib/validation/clients imports lib/validation/pieces: one chunk either way.
    schema: () => import("@/lib/validation/clients").then((m) => (mode === "create" ? m.deliverPieceSchema : m.pieceEditSchema)),
    action: (values) => (mode === "create" ? callApi<Created>("/api/pieces", { method: "POST", json: values }) : callApi<Created>(`/api/pieces/${pieceId}`, { method: "PATCH", json: values })),
    defaultValues: {
      kind: "dining_table",
      shapeKind: "rectangle",
      resinKind: "none",
      use: "heavy",
      sun: "none",
      deliveredOn: today,
      title: "",
      baseMaterial: "",
      baseFinish: "",
      deliveryAddress: "",
      internalNotes: "",
      ...(mode === "create" ? { layers: [], buyer: buyer ? "existing" : "none", buyerClientId: buyer?.id ?? "", buyerName: "", buyerEmail: "", buyerPhone: "", buyerServiceMail: false, sendHandover: true } : {}),
      ...initial,
    } as never,
    onSuccess: (data) => {
      if (mode === "create") {
        toast.success(`Piece recorded. Registration code ${data.registrationCode} — print its drawer card.${data.handover?.sent ? " The hand-over mail is on its way to the buyer." : ""}`);
        if (data.handover?.reason) toast.info(`No hand-over mail: ${data.handover.reason}`);
        router.push(`/studio/pieces/${data.piece.id}`);
      } else {
        toast.success("Piece record saved.");
        router.push(`/studio/pieces/${pieceId}`);
        router.refresh();
      }
    },
  });
  const { register, control, watch, formState, setValue } = form;
  const errors = formState.errors as Record<string, { message?: string } | undefined> & { layers?: Record<number, Record<string, { message?: string }>> };
  const layers = useFieldArray({ control, name: "layers" as never });
  const shape = watch("shapeKind" as never) as unknown as string;
  const resin = watch("resinKind" as never) as unknown as string;
  const reg = register as unknown as UseFormRegister<FieldValues>;

  return (
    <form onSubmit={onSubmit} noValidate className="space-y-6">
      {formError ? <Notice tone="error">{formError}</Notice> : null}
      <Section title="The piece">
        <div className="grid gap-4 sm:grid-cols-2">
          <TextField label="Title" {...reg("title")} error={errors.title?.message} placeholder="e.g. Walnut river dining table" />
          <SelectField label="Kind" {...reg("kind")} error={errors.kind?.message}>
            {PIECE_KINDS.map((k) => (
              <option key={k} value={k}>
                {PIECE_KIND_LABELS[k]}
              </option>
            ))}
          </SelectField>
        </div>
      </Section>

      <Section title="Shape and size" aside={<UnitToggle system={system} onChange={setSystem} />}>
        <div className="grid gap-4 sm:grid-cols-2 lg:grid-cols-4">
          <SelectField label="Shape of the top" {...reg("shapeKind")} error={errors.shapeKind?.message}>
            {SHAPE_KINDS.map((s) => (
              <option key={s} value={s}>
                {SHAPE_LABELS[s]}
              </option>
            ))}
          </SelectField>
          {shape === "rectangle" || shape === "oval" ? (
            <>
              <Controller control={control} name={"lengthMm" as never} render={({ field }) => <UnitNumberField ref={field.ref} label="Length" kind="length" system={system} value={field.value} onChange={field.onChange} onBlur={field.onBlur} error={errors.lengthMm?.message} />} />
              <Controller control={control} name={"widthMm" as never} render={({ field }) => <UnitNumberField ref={field.ref} label="Width" kind="length" system={system} value={field.value} onChange={field.onChange} onBlur={field.onBlur} error={errors.widthMm?.message} />} />
            </>
          ) : shape === "round" ? (
            <Controller control={control} name={"diameterMm" as never} render={({ field }) => <UnitNumberField ref={field.ref} label="Diameter" kind="length" system={system} value={field.value} onChange={field.onChange} onBlur={field.onBlur} error={errors.diameterMm?.message} />} />
          ) : (
            <Controller
              control={control}
              name={"measuredAreaM2" as never}
              render={({ field }) => <UnitNumberField ref={field.ref} label="Measured area" kind="area" system={system} value={field.value} onChange={field.onChange} onBlur={field.onBlur} error={errors.measuredAreaM2?.message} hint="One face of the top, as measured." />}
            />
          )}
          <Controller control={control} name={"thicknessMm" as never} render={({ field }) => <UnitNumberField ref={field.ref} label="Thickness" kind="length" system={system} value={field.value} onChange={field.onChange} onBlur={field.onBlur} error={errors.thicknessMm?.message} />} />
        </div>
      </Section>

      <Section title="Wood and resin">
        <div className="grid gap-4 sm:grid-cols-2">
          <Controller control={control} name={"primarySpeciesId" as never} render={({ field }) => <SpeciesPicker ref={field.ref} label="Primary species" value={field.value} onChange={field.onChange} onBlur={field.onBlur} error={errors.primarySpeciesId?.message} />} />
          <Controller
            control={control}
            name={"secondarySpeciesId" as never}
            render={({ field }) => <SpeciesPicker ref={field.ref} label="Secondary species" optional value={field.value} onChange={field.onChange} onBlur={field.onBlur} error={errors.secondarySpeciesId?.message} />}
          />
          <SelectField label="Resin" {...reg("resinKind")} error={errors.resinKind?.message}>
            {RESIN_KINDS.map((r) => (
              <option key={r} value={r}>
                {RESIN_LABELS[r]}
              </option>
            ))}
          </SelectField>
          {resin !== "none" ? (
            <>
              <TextField label="Pour date" type="date" {...reg("resinPouredOn", { setValueAs: emptyToNull })} error={errors.resinPouredOn?.message} />
              <Controller control={control} name={"resinVolumeMl" as never} render={({ field }) => <UnitNumberField ref={field.ref} label="Resin volume" kind="volume" system={system} value={field.value} onChange={field.onChange} onBlur={field.onBlur} error={errors.resinVolumeMl?.message} />} />
              <TextField label="Tint" {...reg("resinTint", { setValueAs: emptyToNull })} error={errors.resinTint?.message} placeholder="e.g. clear, ocean blue" />
            </>
          ) : null}
        </div>
      </Section>

      <Section title="Base, use and delivery">
        <div className="grid gap-4 sm:grid-cols-2">
          <TextField label="Base material" {...reg("baseMaterial")} error={errors.baseMaterial?.message} placeholder="e.g. blackened steel trestle" />
          <TextField label="Base finish" {...reg("baseFinish")} error={errors.baseFinish?.message} placeholder="e.g. powder coat" />
          <SelectField label="Use" {...reg("use")} error={errors.use?.message}>
            {USES.map((u) => (
              <option key={u} value={u}>
                {USE_LABELS[u]}
              </option>
            ))}
          </SelectField>
          <SelectField label="Sun" {...reg("sun")} error={errors.sun?.message}>
            {SUN_EXPOSURES.map((s) => (
              <option key={s} value={s}>
                {SUN_LABELS[s]}
              </option>
            ))}
          </SelectField>
          <TextField label="Delivery date" type="date" {...reg("deliveredOn")} error={errors.deliveredOn?.message} />
          <TextField label="Delivery address" {...reg("deliveryAddress")} error={errors.deliveryAddress?.message} />
        </div>
        <div className="space-y-1.5">
          <label htmlFor="internal-notes" className="block text-sm font-medium">
            Internal notes <span className="font-normal text-muted">(staff only)</span>
          </label>
          <textarea id="internal-notes" rows={3} {...reg("internalNotes")} className="block w-full rounded-lg border border-line bg-white px-3 py-2 text-base focus:border-resin" />
          <ErrorLine>{errors.internalNotes?.message}</ErrorLine>
        </div>
      </Section>

      {mode === "create" ? (
        <Section
          title="Finish stack"
          aside={
            <Button
              variant="secondary"
              onClick={() => layers.append({ surface: "top", finishClass: "hardwax_oil", productId: null, productLabel: "", coats: 1, appliedOn: (watch("deliveredOn" as never) as unknown as string) || today, appliedById: null, batchLot: "", notes: "" } as never)}
            >
              <SpriteIcon name="plus" className="size-4" /> Add a layer
            </Button>
          }
        >
          {layers.fields.length === 0 ? <p className="text-sm text-muted">Add the layers as they were applied, first (closest to the wood) to last. You can also add them later on the piece page.</p> : null}
          <ol className="space-y-4">
            {layers.fields.map((f, i) => (
              <li key={f.id} className="rounded-lg border border-line bg-paper p-4">
                <div className="mb-2 flex items-center justify-between">
                  <p className="text-sm font-semibold">Layer {i + 1}</p>
                  <Button variant="ghost" onClick={() => layers.remove(i)} aria-label={`Remove layer ${i + 1}`}>
                    <SpriteIcon name="trash" className="size-4" /> Remove
                  </Button>
                </div>
                <LayerFields prefix={`layers.${i}.`} register={reg} setValue={setValue as unknown as UseFormSetValue<FieldValues>} errors={errors.layers?.[i]} products={products} members={members} />
              </li>
            ))}
          </ol>
        </Section>
      ) : null}

      {mode === "create" ? (
        <Section title="Buyer">
          <BuyerFields picked={buyer} register={reg} setValue={setValue as unknown as UseFormSetValue<FieldValues>} watch={(name) => watch(name as never)} errors={errors} />
        </Section>
      ) : null}

      <div className="flex flex-wrap gap-2">
        <Button type="submit" disabled={formState.isSubmitting}>
          {formState.isSubmitting ? "Saving…" : mode === "create" ? "Record piece" : "Save changes"}
        </Button>
        <Button variant="secondary" onClick={() => router.back()}>
          Cancel
        </Button>
      </div>
    </form>
  );
}
