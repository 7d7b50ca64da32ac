"use client";

import { useRouter } from "next/navigation";
import { useState } from "react";
import type { FieldValues, UseFormRegister, UseFormSetValue } from "react-hook-form";
import { toast } from "sonner";
import { useActionForm } from "@/components/forms/use-action-form";
import { Button } from "@/components/ui/button";
import { cn } from "@/components/ui/cn";
import { Notice } from "@/components/ui/notice";
import { SpriteIcon } from "@/components/ui/sprite-icon";
import { FINISH_CLASS_LABELS, SURFACE_LABELS, SURFACES, type FinishClass, type Surface } from "@/lib/care/vocabulary";
import type { LayerInput } from "@/lib/validation/pieces";
import { apiJson, callApi, type ApiInit } from "@/components/api-client";
import { useRefreshingMutation } from "@/components/forms/use-refreshing-mutation";
import { formatDate } from "@/lib/format";
import { LayerFields, type MemberOption, type ProductOption } from "./layer-fields";

export type StackLayer = {
  id: string;
  surface: Surface;
  position: number;
  finishClass: FinishClass;
  productId: string | null;
  productLabel: string;
  productName: string | null;
  coats: number;
  appliedOn: string;
  appliedById: string | null;
  appliedByName: string | null;
  batchLot: string;
  notes: string;
};

// Each class gets a band style (colour and a pattern), and always its name in words.
const BAND: Record<FinishClass, string> = {
  hardwax_oil: "bg-[#e9c88f] [background-image:repeating-linear-gradient(90deg,transparent_0_10px,rgba(120,80,20,.12)_10px_12px)]",
  ceramic_topcoat: "bg-[#d7e6e6] [background-image:radial-gradient(rgba(15,94,94,.25)_1px,transparent_1px)] [background-size:6px_6px]",
  paste_wax: "bg-[#f3e7c9] [background-image:repeating-linear-gradient(45deg,transparent_0_6px,rgba(140,110,40,.15)_6px_8px)]",
  film_finish: "bg-[#eef0f2] [background-image:linear-gradient(180deg,rgba(255,255,255,.9),rgba(200,205,210,.5))]",
  epoxy_surface: "bg-[#bfe0e3] [background-image:linear-gradient(120deg,rgba(255,255,255,.6),transparent_60%)]",
  charred_oiled: "bg-[#3b3430] text-white [background-image:repeating-linear-gradient(0deg,transparent_0_4px,rgba(255,255,255,.06)_4px_5px)]",
};

/** Adds a layer to `surface`, or edits `layer` when one is given. */
function LayerForm({ pieceId, products, members, onDone, ...target }: { pieceId: string; products: ProductOption[]; members: MemberOption[]; onDone: () => void } & ({ layer: StackLayer } | { layer?: undefined; surface: Surface; today: string })) {
  const router = useRouter();
  const layer = target.layer;
  const { form, onSubmit, formError } = useActionForm({
    schema: () => import("@/lib/validation/pieces").then((m) => m.layerSchema),
    action: (v: LayerInput) => (layer ? callApi(`/api/pieces/${pieceId}/layers/${layer.id}`, { method: "PATCH", json: v }) : callApi(`/api/pieces/${pieceId}/layers`, { method: "POST", json: v })),
    defaultValues: layer
      ? { surface: layer.surface, finishClass: layer.finishClass, productId: layer.productId, productLabel: layer.productLabel, coats: layer.coats, appliedOn: layer.appliedOn, appliedById: layer.appliedById, batchLot: layer.batchLot, notes: layer.notes }
      : { surface: target.surface, finishClass: "hardwax_oil", productId: null, productLabel: "", coats: 1, appliedOn: target.today, appliedById: null, batchLot: "", notes: "" },
    successMessage: layer ? "Finish layer saved." : "Finish layer added; the care schedule is recomputed.",
    onSuccess: () => {
      onDone();
      router.refresh();
    },
  });
  const submitting = form.formState.isSubmitting;
  return (
    <form onSubmit={onSubmit} noValidate className="space-y-3 rounded-lg border border-resin/40 bg-paper p-4" aria-label={layer ? "Edit finish layer" : "Add a finish layer"}>
      {formError ? <Notice tone="error">{formError}</Notice> : null}
      <LayerFields prefix="" register={form.register as unknown as UseFormRegister<FieldValues>} setValue={form.setValue as unknown as UseFormSetValue<FieldValues>} errors={form.formState.errors} products={products} members={members} />
      <div className="flex gap-2">
        <Button type="submit" disabled={submitting}>
          {layer ? "Save layer" : submitting ? "Adding…" : "Add layer"}
        </Button>
        <Button variant="secondary" onClick={onDone}>
          Cancel
        </Button>
      </div>
    </form>
  );
}

/** The finish stack of each surface, drawn as layers (first applied at the bottom, on the wood). */
export function FinishStackEditor({ pieceId, layers, products, members, today }: { pieceId: string; layers: StackLayer[]; products: ProductOption[]; members: MemberOption[]; today: string }) {
  const [adding, setAdding] = useState<Surface | null>(null);
  const [editing, setEditing] = useState<string | null>(null);
  const [confirming, setConfirming] = useState<string | null>(null);
  const { run, busy } = useRefreshingMutation(({ url, init }: { url: string; init: ApiInit; done: string }) => apiJson(url, init), {
    onSuccess: (_, { done }) => toast.success(done),
    onError: (words) => toast.error(words),
  });
  const layerUrl = (l: StackLayer) => `/api/pieces/${pieceId}/layers/${l.id}`;

  return (
    <div className="space-y-6">
      {SURFACES.map((surface) => {
        const stack = layers.filter((l) => l.surface === surface).sort((a, b) => a.position - b.position);
        if (stack.length === 0 && surface === "edges" && adding !== "edges") return null;
        return (
          <div key={surface} className="space-y-2">
            <div className="flex items-center justify-between">
              <h3 className="font-semibold">{SURFACE_LABELS[surface]}</h3>
              <Button variant="ghost" onClick={() => setAdding(surface)} disabled={adding === surface}>
                <SpriteIcon name="plus" className="size-4" /> Add layer to the {surface}
              </Button>
            </div>
            {adding === surface ? <LayerForm pieceId={pieceId} products={products} members={members} today={today} surface={surface} onDone={() => setAdding(null)} /> : null}
            {stack.length === 0 ? <p className="text-sm text-muted">No layers recorded on the {surface}.</p> : null}
            <ol reversed aria-label={`${SURFACE_LABELS[surface]} finish stack, outermost first`} className="overflow-hidden rounded-lg border border-line">
              {[...stack].reverse().map((l) => (
                <li key={l.id} className="border-b border-line last:border-b-0">
                  <div className={cn("flex flex-wrap items-center gap-x-4 gap-y-2 px-3 py-2", BAND[l.finishClass])}>
                    <div className="min-w-0 flex-1 basis-56">
                      <p className="font-semibold">
                        {FINISH_CLASS_LABELS[l.finishClass]}
                        <span className="font-normal"> · {l.productName ?? (l.productLabel || "unlabelled product")}</span>
                      </p>
                      <p className="text-sm opacity-80">
                        {l.coats} coat{l.coats === 1 ? "" : "s"} · {formatDate(l.appliedOn, { short: true })}
                        {l.appliedByName ? ` · ${l.appliedByName}` : ""}
                        {l.batchLot ? ` · lot ${l.batchLot}` : ""}
                        {l.notes ? ` · ${l.notes}` : ""}
                      </p>
                    </div>
                    <div className="flex flex-wrap gap-1">
                      <button type="button" disabled={busy || l.position === stack.length - 1} onClick={() => run({ url: layerUrl(l), init: { method: "PATCH", json: { position: l.position + 1 } }, done: "Layer moved outward." })} className="inline-flex size-11 items-center justify-center rounded-md bg-white/70 text-ink hover:bg-white disabled:opacity-40" aria-label={`Move ${FINISH_CLASS_LABELS[l.finishClass]} layer outward`}>
                        <SpriteIcon name="arrow-up" className="size-4" />
                      </button>
                      <button type="button" disabled={busy || l.position === 0} onClick={() => run({ url: layerUrl(l), init: { method: "PATCH", json: { position: l.position - 1 } }, done: "Layer moved toward the wood." })} className="inline-flex size-11 items-center justify-center rounded-md bg-white/70 text-ink hover:bg-white disabled:opacity-40" aria-label={`Move ${FINISH_CLASS_LABELS[l.finishClass]} layer toward the wood`}>
                        <SpriteIcon name="arrow-down" className="size-4" />
                      </button>
                      <button type="button" onClick={() => setEditing(editing === l.id ? null : l.id)} className="inline-flex size-11 items-center justify-center rounded-md bg-white/70 text-ink hover:bg-white" aria-label={`Edit ${FINISH_CLASS_LABELS[l.finishClass]} layer`}>
                        <SpriteIcon name="pencil" className="size-4" />
                      </button>
                      <button type="button" onClick={() => setConfirming(l.id)} className="inline-flex size-11 items-center justify-center rounded-md bg-white/70 text-danger hover:bg-white" aria-label={`Remove ${FINISH_CLASS_LABELS[l.finishClass]} layer`}>
                        <SpriteIcon name="trash" className="size-4" />
                      </button>
                    </div>
                  </div>
                  {confirming === l.id ? (
                    <div role="alertdialog" aria-label="Remove this layer?" className="flex flex-wrap items-center gap-2 bg-danger-soft px-3 py-2 text-sm">
                      <span className="font-semibold">Remove this layer? The care schedule will be recomputed; the audit log keeps a record.</span>
                      <Button variant="danger" disabled={busy} onClick={() => (setConfirming(null), run({ url: layerUrl(l), init: { method: "DELETE" }, done: "Finish layer removed." }))}>
                        Remove layer
                      </Button>
                      <Button variant="secondary" onClick={() => setConfirming(null)}>
                        Keep it
                      </Button>
                    </div>
                  ) : null}
                  {editing === l.id ? (
                    <div className="p-3">
                      <LayerForm pieceId={pieceId} layer={l} products={products} members={members} onDone={() => setEditing(null)} />
                    </div>
                  ) : null}
                </li>
              ))}
              {stack.length ? (
                <li aria-label="The wood" className="bg-[#a47148] px-3 py-1.5 text-xs font-semibold uppercase tracking-wide text-white [background-image:repeating-linear-gradient(100deg,transparent_0_14px,rgba(0,0,0,.12)_14px_16px)]">
                  Wood
                </li>
              ) : null}
            </ol>
          </div>
        );
      })}
    </div>
  );
}
