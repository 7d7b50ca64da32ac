"use client";

import { useRouter } from "next/navigation";
import { useId, useState } from "react";
import { toast } from "sonner";
import { Button } from "@/components/ui/button";
import { SelectField, TextField } from "@/components/ui/field";
import { Notice } from "@/components/ui/notice";
import { SpriteIcon } from "@/components/ui/sprite-icon";
import { useActionForm } from "@/components/forms/use-action-form";
import { formatDate } from "@/lib/format";
import type { TaskView } from "@/lib/owner/pieces";
import type { CareLogInput } from "@/lib/validation/owner";
import { callApi } from "@/components/api-client";
import { DeleteEntryButton } from "./delete-entry-button";
import { ErrorLine } from "@/components/ui/error-line";
import { photoProblem } from "@/components/claims/photo-queue";

type Result = { task: TaskView | null };

export function CareLogForm({
  pieceId,
  tasks,
  today,
  defaults,
  entryId,
}: {
  pieceId: string;
  tasks: TaskView[];
  today: string;
  defaults: CareLogInput;
  /** Set when correcting an existing entry. */
  entryId?: string;
}) {
  const router = useRouter();
  const [photo, setPhoto] = useState<File | null>(null);
  const [photoError, setPhotoError] = useState<string | null>(null);
  const photoId = useId();
  const { form, onSubmit, formError } = useActionForm({
    schema: () => import("@/lib/validation/owner").then((m) => m.careLogSchema),
    defaultValues: defaults,
    action: async (values) => {
      if (entryId) {
        return callApi<Result>(`/api/me/pieces/${pieceId}/care-log/${entryId}`, { method: "PATCH", json: values });
      }
      const body = new FormData();
      for (const [k, v] of Object.entries(values)) if (v !== undefined) body.set(k, String(v));
      if (photo) body.set("photo", photo);
      return callApi<Result>(`/api/me/pieces/${pieceId}/care-log`, { method: "POST", body });
    },
    onSuccess: (data) => {
      const t = data.task;
      toast.success(entryId ? "Entry corrected." : "Logged — thank you.", {
        description: t ? `Next ${t.label.toLowerCase()} (${t.surfaceLabel.toLowerCase()}): ${formatDate(t.dueOn)}. ${t.reasons[0] ?? ""}` : undefined,
        duration: 8000,
      });
      router.push(`/pieces/${pieceId}#schedule`);
      router.refresh();
    },
  });
  const { register, formState, watch, setValue } = form;
  const taskKind = watch("taskKind");
  const surface = watch("surface");
  const choice = `${taskKind}|${surface}`;
  const options = tasks.map((t) => ({ value: `${t.kind}|${t.surface}`, label: `${t.label} — ${t.surfaceLabel.toLowerCase()}` }));
  if (!options.some((o) => o.value === choice)) options.unshift({ value: choice, label: "Choose a care task" });

  return (
    <form onSubmit={onSubmit} noValidate className="space-y-5">
      {formError ? (
        <Notice tone="error" title="Not saved yet">
          {formError}
        </Notice>
      ) : null}
      <SelectField
        label="What did you do?"
        value={choice}
        onChange={(e) => {
          const [k, s] = e.target.value.split("|") as [CareLogInput["taskKind"], CareLogInput["surface"]];
          setValue("taskKind", k, { shouldValidate: true });
          setValue("surface", s, { shouldValidate: true });
        }}
        error={formState.errors.taskKind?.message ?? formState.errors.surface?.message}
      >
        {options.map((o) => (
          <option key={o.value} value={o.value}>
            {o.label}
          </option>
        ))}
      </SelectField>
      <TextField label="When" type="date" max={today} {...register("doneOn")} error={formState.errors.doneOn?.message} hint="The day you did it; today or earlier." />
      <TextField
        label="Product used (optional)"
        autoComplete="off"
        placeholder="e.g. the studio's hardwax oil"
        {...register("productUsed")}
        error={formState.errors.productUsed?.message}
      />
      <div className="space-y-1.5">
        <label htmlFor="care-notes" className="block text-sm font-medium">
          What was done (optional)
        </label>
        <textarea
          id="care-notes"
          rows={4}
          className="block w-full rounded-lg border border-line bg-white px-3 py-2 text-base text-ink focus:border-resin aria-[invalid=true]:border-danger"
          aria-invalid={formState.errors.notes ? true : undefined}
          aria-describedby={formState.errors.notes ? "care-notes-error" : undefined}
          placeholder="e.g. cleaned, one thin coat, wiped off after 15 minutes"
          {...register("notes")}
        />
        {formState.errors.notes ? (
          <p id="care-notes-error" role="alert" className="text-sm font-medium text-danger">
            {formState.errors.notes.message}
          </p>
        ) : null}
      </div>
      {entryId ? null : (
        <div className="space-y-1.5">
          <label htmlFor={photoId} className="block text-sm font-medium">
            Photo (optional)
          </label>
          <label
            htmlFor={photoId}
            className="flex min-h-11 cursor-pointer items-center gap-2 rounded-lg border border-dashed border-line bg-white px-3 py-2 text-sm text-ink hover:border-resin"
          >
            <SpriteIcon name="camera" className="size-4 shrink-0" />
            {/* A chosen file's name may be long and is cut; the instruction wraps, so a phone reads which photos it takes. */}
            <span className={photo ? "min-w-0 truncate" : "min-w-0"}>{photo ? photo.name : "Take or choose a photo (JPEG, PNG or WebP, up to 15 MB)"}</span>
          </label>
          <input
            id={photoId}
            type="file"
            accept="image/jpeg,image/png,image/webp"
            className="sr-only"
            aria-describedby={photoError ? `${photoId}-error` : undefined}
            onChange={(e) => {
              const file = e.target.files?.[0] ?? null;
              e.target.value = "";
              // Checked as it is picked (the server checks again): a 20 MB photo was sent whole before being refused.
              const problem = file ? photoProblem(file) : null;
              setPhotoError(problem);
              setPhoto(problem ? null : file);
            }}
          />
          <ErrorLine id={`${photoId}-error`}>{photoError}</ErrorLine>
          {photo ? (
            // Once picked, a photo could only be swapped for another: a refused one kept the entry from being logged without it.
            <Button variant="ghost" className="px-2 text-sm" onClick={() => setPhoto(null)} disabled={formState.isSubmitting}>
              <SpriteIcon name="trash" className="size-4" />
              Remove the photo
            </Button>
          ) : null}
        </div>
      )}
      <input type="hidden" {...register("taskKind")} />
      <input type="hidden" {...register("surface")} />
      <div className="flex flex-col gap-3 sm:flex-row">
        <Button type="submit" className="w-full sm:w-auto" disabled={formState.isSubmitting}>
          {formState.isSubmitting ? (photo ? "Uploading the photo…" : "Saving…") : entryId ? "Save the correction" : "Log it"}
        </Button>
        {entryId ? <DeleteEntryButton pieceId={pieceId} entryId={entryId} /> : null}
      </div>
    </form>
  );
}
