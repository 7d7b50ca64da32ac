"use client";

import { useRouter } from "next/navigation";
import { useState } from "react";
import { toast } from "sonner";
import { apiJson, isApiError, uploadForm } from "@/components/api-client";
import { useActionForm } from "@/components/forms/use-action-form";
import { useRefreshingMutation } from "@/components/forms/use-refreshing-mutation";
import { Button } from "@/components/ui/button";
import { Notice } from "@/components/ui/notice";
import type { AccentInput } from "@/lib/studio/setup-schema";
import type { ActionResult } from "@/lib/validation/action";

type Accent = { name: string; label: string; hex: string };

/** The brand step: a logo (uploaded, re-encoded on the server like piece photos) and one accent from our set. */
export function BrandForm({ studioName, logoUrl, accent, accents, action }: { studioName: string; logoUrl: string | null; accent: string; accents: Accent[]; action: (v: AccentInput) => Promise<ActionResult<unknown>> }) {
  const router = useRouter();
  const [progress, setProgress] = useState<number | null>(null);
  const [logoError, setLogoError] = useState<string | null>(null);
  const { form, onSubmit, formError } = useActionForm({ schema: () => import("@/lib/studio/setup-schema").then((m) => m.accentSchema), action, defaultValues: { accent }, onSuccess: () => router.refresh() });
  const chosen = accents.find((a) => a.name === form.watch("accent")) ?? accents[0]!;

  async function upload(file: File) {
    setLogoError(null);
    const body = new FormData();
    body.append("file", file);
    try {
      await uploadForm("/api/studio/logo", body, setProgress);
      toast.success("Logo saved.");
      router.refresh();
    } catch (e) {
      setLogoError(isApiError(e) ? e.message : "The logo could not be uploaded. Try again.");
    } finally {
      setProgress(null);
    }
  }

  const removeLogo = useRefreshingMutation(() => apiJson("/api/studio/logo", { method: "DELETE" }), {
    onSuccess: () => toast.success("Logo removed; your studio's name shows alone."),
    onError: (words) => setLogoError(words),
  });

  return (
    <div className="space-y-6">
      <section aria-labelledby="logo-h" className="space-y-3">
        <h3 id="logo-h" className="font-semibold">
          Logo
        </h3>
        {logoUrl ? (
          // eslint-disable-next-line @next/next/no-img-element -- a small stored JPEG from our own route
          <img src={logoUrl} alt={`${studioName} logo`} className="h-16 w-auto rounded border border-line bg-white p-1" />
        ) : (
          <p className="text-sm text-muted">No logo yet: your studio&apos;s name is shown on its own.</p>
        )}
        <div className="flex flex-wrap items-center gap-3">
          <label className="inline-flex min-h-11 cursor-pointer items-center rounded-lg border border-line bg-card px-4 text-sm font-semibold hover:border-resin hover:text-resin focus-within:outline focus-within:outline-3 focus-within:outline-resin">
            {logoUrl ? "Choose another logo" : "Choose a logo"}
            <input
              type="file"
              accept="image/png,image/jpeg,image/webp"
              className="sr-only"
              aria-describedby="logo-hint"
              onChange={(e) => {
                const f = e.target.files?.[0];
                if (f) void upload(f);
                e.target.value = "";
              }}
            />
          </label>
          {logoUrl ? (
            <Button variant="ghost" disabled={removeLogo.busy} onClick={() => removeLogo.run(undefined)}>
              Remove the logo
            </Button>
          ) : null}
        </div>
        <p id="logo-hint" className="text-sm text-muted">
          A PNG, JPEG or WebP file. It is resized to at most 480 pixels and placed on white, like piece photos.
        </p>
        {progress !== null ? <p role="status" className="text-sm">Uploading… {Math.round(progress * 100)} %</p> : null}
        {logoError ? <Notice tone="error">{logoError}</Notice> : null}
      </section>

      <form onSubmit={onSubmit} noValidate className="space-y-3">
        {formError ? <Notice tone="error">{formError}</Notice> : null}
        <fieldset className="space-y-3">
          <legend className="font-semibold">Colour</legend>
          <p className="text-sm text-muted">Used for your name and buttons on e-mails and owners&apos; pages. Each colour keeps text readable on it and around it.</p>
          <div className="grid gap-2 sm:grid-cols-2">
            {accents.map((a) => (
              <label key={a.name} className="flex min-h-11 cursor-pointer items-center gap-3 rounded-lg border border-line bg-white px-3 has-[:checked]:border-ink">
                <input type="radio" value={a.name} {...form.register("accent")} className="size-4" />
                <span aria-hidden className="size-6 rounded" style={{ backgroundColor: a.hex }} />
                <span>{a.label}</span>
              </label>
            ))}
          </div>
        </fieldset>
        <p className="rounded-lg px-3 py-2 text-sm font-semibold text-white" style={{ backgroundColor: chosen.hex }}>
          {studioName}: how white text reads on {chosen.label.toLowerCase()}
        </p>
        <Button type="submit" disabled={form.formState.isSubmitting}>
          {form.formState.isSubmitting ? "Saving…" : "Save the colour"}
        </Button>
      </form>
    </div>
  );
}
