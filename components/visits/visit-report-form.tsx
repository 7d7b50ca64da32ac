"use client";

import { useState } from "react";
import { useFieldArray, useForm, useWatch } from "react-hook-form";
import { toast } from "sonner";
import { Button } from "@/components/ui/button";
import { ErrorLine } from "@/components/ui/error-line";
import { SelectField, TextField } from "@/components/ui/field";
import { Notice } from "@/components/ui/notice";
import { SpriteIcon } from "@/components/ui/sprite-icon";
import { FINISH_CLASSES, FINISH_CLASS_LABELS, SURFACE_LABELS, SURFACES, type FinishClass, type Surface } from "@/lib/care/vocabulary";
import type { visitReportSchema, VisitReportInput, VisitReportValues } from "@/lib/validation/visits";
import { useLazyZodResolver } from "@/components/forms/lazy-zod-resolver";
import { apiJson, isApiError, uploadForm } from "@/components/api-client";
import { useRefreshingMutation } from "@/components/forms/use-refreshing-mutation";

type Product = { id: string; name: string; finishClass: FinishClass };
type Photo = { id: string; kind: "before" | "after"; thumbUrl: string };


/** Uploads one before/after photo; `onProgress` gets whole percent. */
async function uploadPhoto(visitId: string, file: File, kind: "before" | "after", onProgress: (pct: number) => void): Promise<Photo> {
  const form = new FormData();
  form.set("file", file);
  form.set("kind", kind);
  const body = await uploadForm<{ id: string; thumbUrl: string }>(`/api/visits/${visitId}/photos`, form, (f) => onProgress(Math.round(f * 100)));
  return { id: body.id, kind, thumbUrl: body.thumbUrl };
}

/** `surface` is the one the layer refreshes where the piece's stack says (lib/visits/technician-day.ts), else null. */
type DefaultLayer = { surface: Surface | null; finishClass: FinishClass; productId: string; coats: number };

/** A surface not yet chosen: the select shows "Choose a surface" and the schema refuses it on filing. */
const NO_SURFACE = "" as Surface;

/**
 * The visit report: what was done, new finish layers (proposed from the quote's products and coats),
 * before/after photos. The owner signs off themselves, from the report mail. Before the visit's start
 * (`early`), staff give a reason to file it anyway; a technician waits until it has started.
 */
export function VisitReportForm({
  visitId,
  name,
  products,
  today,
  defaultLayers,
  initialPhotos,
  early,
  addLayerClass = null,
}: {
  visitId: string;
  /** Which visit, for the form's accessible name (a day has several reports). */
  name: string;
  products: Product[];
  today: string;
  defaultLayers: DefaultLayer[];
  initialPhotos: Photo[];
  early: { startsAt: string; asStaff: boolean } | null;
  /** The finish class a layer added by hand starts with when the job brings no product: the piece's outer coat. */
  addLayerClass?: FinishClass | null;
}) {
  const defaultClass = defaultLayers[0]?.finishClass ?? addLayerClass ?? undefined;
  const form = useForm<VisitReportInput, unknown, VisitReportValues>({
    resolver: useLazyZodResolver<typeof visitReportSchema, VisitReportInput, VisitReportValues>(() => import("@/lib/validation/visits").then((m) => m.visitReportSchema)),
    defaultValues: { work: "", earlyReason: "", layers: defaultLayers.map((l) => ({ surface: l.surface ?? NO_SURFACE, finishClass: l.finishClass, productId: l.productId, coats: l.coats, appliedOn: today, productLabel: "", batchLot: "" })) },
    // Checked on pressing the button, then as fields are fixed: an error shown on leaving a field moved the
    // button during the press (the same choice as components/claims/claim-form.tsx).
    mode: "onSubmit",
    reValidateMode: "onChange",
  });
  const layers = useFieldArray({ control: form.control, name: "layers" });
  const layerValues = useWatch({ control: form.control, name: "layers" });
  const [photos, setPhotos] = useState<Photo[]>(initialPhotos);
  const [uploading, setUploading] = useState<{ name: string; pct: number } | null>(null);
  const [formError, setFormError] = useState<string | null>(null);
  const errors = form.formState.errors;

  async function addPhotos(kind: "before" | "after", list: FileList | null) {
    for (const file of Array.from(list ?? [])) {
      setUploading({ name: file.name, pct: 0 });
      try {
        const p = await uploadPhoto(visitId, file, kind, (pct) => setUploading({ name: file.name, pct }));
        setPhotos((x) => [...x, p]);
        toast.success(`${kind === "before" ? "Before" : "After"} photo added.`);
      } catch (e) {
        toast.error(e instanceof Error ? e.message : "Upload failed.");
      }
    }
    setUploading(null);
  }

  const { run, busy } = useRefreshingMutation(
    (values: VisitReportValues) => apiJson(`/api/visits/${visitId}/report`, { method: "POST", json: { ...values, layers: values.layers.map((l) => ({ ...l, productId: l.productId || null })) } }),
    {
      onSuccess: () => toast.success("Report filed. The owner gets a summary by e-mail."),
      onError: (words, e) => {
        setFormError(words);
        for (const [field, messages] of Object.entries(isApiError(e) ? e.fieldErrors : {})) {
          if (messages?.[0]) form.setError(field as never, { type: "server", message: messages[0] });
        }
      },
    },
  );
  const onSubmit = form.handleSubmit((values) => {
    setFormError(null);
    run(values);
  });
  const filing = busy || form.formState.isSubmitting;

  return (
    <form onSubmit={onSubmit} noValidate className="space-y-5" aria-label={`Visit report: ${name}`}>
      {formError ? <Notice tone="error" title="The report was not filed">{formError} Nothing you typed is lost.</Notice> : null}
      <div className="space-y-1.5">
        <label htmlFor={`work-${visitId}`} className="block text-sm font-medium">What was done</label>
        <textarea
          id={`work-${visitId}`}
          rows={4}
          aria-invalid={errors.work ? true : undefined}
          className="block w-full rounded-lg border border-line bg-white px-3 py-2 text-base aria-[invalid=true]:border-danger"
          {...form.register("work")}
        />
        <ErrorLine>{errors.work?.message}</ErrorLine>
      </div>

      <fieldset className="space-y-3">
        <legend className="text-sm font-semibold">New finish layers</legend>
        {layers.fields.length === 0 ? <p className="text-sm text-muted">None — an inspection or cleaning only.</p> : null}
        {layers.fields.map((f, i) => {
          const e = errors.layers?.[i];
          const cls = layerValues?.[i]?.finishClass;
          return (
            <div key={f.id} className="space-y-3 rounded-lg border border-line bg-paper p-3">
              <div className="flex items-center justify-between">
                <p className="text-sm font-semibold">Layer {i + 1}</p>
                <Button variant="ghost" aria-label={`Remove layer ${i + 1}`} onClick={() => layers.remove(i)}>
                  <SpriteIcon name="trash" className="size-4" /> Remove
                </Button>
              </div>
              {/* One column on a phone too: half of a 375 px screen clipped "Choose a surface" to "Choose a s". */}
              <div className="grid grid-cols-1 gap-3 sm:grid-cols-2">
                <SelectField label="Surface" error={e?.surface?.message} {...form.register(`layers.${i}.surface`)}>
                  <option value="">Choose a surface</option>
                  {SURFACES.map((s) => (
                    <option key={s} value={s}>{SURFACE_LABELS[s]}</option>
                  ))}
                </SelectField>
                <TextField label="Coats" type="number" inputMode="numeric" min={1} max={20} error={e?.coats?.message} {...form.register(`layers.${i}.coats`)} />
              </div>
              <SelectField label="Finish class" error={e?.finishClass?.message} {...form.register(`layers.${i}.finishClass`)}>
                {FINISH_CLASSES.map((c) => (
                  <option key={c} value={c}>{FINISH_CLASS_LABELS[c]}</option>
                ))}
              </SelectField>
              <SelectField label="Product" error={e?.productId?.message} {...form.register(`layers.${i}.productId`)}>
                <option value="">Not from the catalog</option>
                {products.filter((p) => p.finishClass === cls).map((p) => (
                  <option key={p.id} value={p.id}>{p.name}</option>
                ))}
              </SelectField>
              {/* One column on a phone: a date field in half of a 375 px screen clips its year. */}
              <div className="grid grid-cols-1 gap-3 sm:grid-cols-2">
                <TextField label="Date applied" type="date" max={today} error={e?.appliedOn?.message} {...form.register(`layers.${i}.appliedOn`)} />
                <TextField label="Batch / lot" error={e?.batchLot?.message} {...form.register(`layers.${i}.batchLot`)} />
              </div>
            </div>
          );
        })}
        <Button variant="secondary" onClick={() => layers.append({ surface: NO_SURFACE, finishClass: defaultClass ?? "hardwax_oil", productId: "", coats: 1, appliedOn: today, productLabel: "", batchLot: "" })}>
          <SpriteIcon name="plus" className="size-4" /> Add a layer
        </Button>
      </fieldset>

      <fieldset className="space-y-3">
        <legend className="text-sm font-semibold">Photos</legend>
        <div className="grid grid-cols-2 gap-2">
          {(["before", "after"] as const).map((kind) => (
            <label key={kind} className="flex min-h-11 cursor-pointer items-center justify-center gap-2 rounded-lg border border-line bg-card px-3 text-sm font-semibold text-resin hover:border-resin">
              <SpriteIcon name="camera" className="size-4" /> {kind === "before" ? "Before photo" : "After photo"}
              <input type="file" accept="image/jpeg,image/png,image/webp" capture="environment" multiple className="sr-only" onChange={(e) => void addPhotos(kind, e.target.files)} disabled={uploading !== null} />
            </label>
          ))}
        </div>
        {uploading ? (
          <div role="status" className="text-sm">
            Uploading {uploading.name}… {uploading.pct} %
            <progress className="mt-1 block h-2 w-full" max={100} value={uploading.pct} />
          </div>
        ) : null}
        {photos.length ? (
          <ul className="grid grid-cols-3 gap-2">
            {photos.map((p) => (
              <li key={p.id} className="relative">
                {/* eslint-disable-next-line @next/next/no-img-element -- authorized, private thumbnails */}
                <img src={p.thumbUrl} alt={`${p.kind} photo`} className="aspect-square w-full rounded-lg object-cover" />
                <span className="absolute bottom-1 left-1 rounded bg-black/60 px-1.5 text-xs text-white">{p.kind}</span>
              </li>
            ))}
          </ul>
        ) : null}
      </fieldset>

      <p className="text-sm text-muted">The owner signs off the work themselves: the report mail gives them a link to confirm it.</p>

      {early ? (
        early.asStaff ? (
          <TextField
            label="Why file it before the visit starts?"
            autoComplete="off"
            hint={`The visit starts ${early.startsAt}. The reason goes in the audit log.`}
            error={errors.earlyReason?.message}
            {...form.register("earlyReason")}
          />
        ) : (
          <Notice tone="info" title="Not started yet">
            The visit starts {early.startsAt}. File the report once it has started; the studio office can file it early.
          </Notice>
        )
      ) : null}

      <Button type="submit" className="w-full" disabled={filing || uploading !== null}>
        {filing ? "Filing the report…" : "File the report and close the job"}
      </Button>
    </form>
  );
}
