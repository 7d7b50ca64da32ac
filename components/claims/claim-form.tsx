"use client";

import { useEffect, useRef, useState, type FormEvent } from "react";
import { useForm, useWatch, type FieldPath } from "react-hook-form";
import { toast } from "sonner";
import type { z } from "zod";
import { Button, ButtonLink } from "@/components/ui/button";
import { ErrorLine } from "@/components/ui/error-line";
import { SelectField, TextField } from "@/components/ui/field";
import { Notice } from "@/components/ui/notice";
import { SpriteIcon } from "@/components/ui/sprite-icon";
import { CLAIM_CATEGORIES } from "@/lib/care/vocabulary";
import { CLAIM_CATEGORY_LABELS } from "@/lib/claims/labels";
import type { createClaimSchema, CreateClaimInput } from "@/lib/validation/claims";
import { useLazyZodResolver } from "@/components/forms/lazy-zod-resolver";
import { useRefreshingMutation } from "@/components/forms/use-refreshing-mutation";
import { apiJson, isApiError } from "@/components/api-client";
import { clearDraftPhotos, PhotoPicker, PhotoQueueList, stillToUpload, usePhotoQueue } from "./photo-queue";

type Values = z.input<typeof createClaimSchema>;
type Sent = { id: string; uploaded: boolean };
type Draft = { values?: Values; claimId?: string };

const QUESTIONS: { name: keyof Values["answers"] & string; label: string }[] = [
  { name: "heat", label: "Was anything hot near the damage — cookware, a heater, a fireplace?" },
  { name: "chemicals", label: "Did a spill, cleaner, solvent or alcohol touch the surface?" },
  { name: "impact", label: "Was the piece knocked, dropped or hit?" },
  { name: "usedOutdoors", label: "Has the piece been used or stored outdoors?" },
  { name: "directSun", label: "Does direct sun fall on it for part of the day?" },
];

const num = { setValueAs: (v: unknown) => (v === "" || v == null ? null : Number(v)) };
// The four readings are checked together ("all four or none"): once the form has been sent, a change to one
// checks the others again, so their errors go as soon as the set is whole (or empty) again.
const READINGS = ["answers.room.driestTemp", "answers.room.driestRh", "answers.room.dampestTemp", "answers.room.dampestRh"] as const;
const reading = (name: (typeof READINGS)[number]) => ({ ...num, deps: READINGS.filter((r) => r !== name) });

/** The owner's claim form: phone first, draft kept in this browser until the claim and its photos are sent. */
export function ClaimForm({ pieceId, pieceTitle, today, unit }: { pieceId: string; pieceTitle: string; today: string; unit: "C" | "F" }) {
  const draftKey = `grainward-claim-draft:${pieceId}`;
  const [claimId, setClaimId] = useState<string | null>(null);
  const [photoError, setPhotoError] = useState<string | null>(null);
  const queue = usePhotoQueue(draftKey);
  const form = useForm<Values, unknown, z.output<typeof createClaimSchema>>({
    resolver: useLazyZodResolver<typeof createClaimSchema, Values, z.output<typeof createClaimSchema>>(() => import("@/lib/validation/claims").then((m) => m.createClaimSchema)),
    // Checked when the owner presses Send, then again as they fix a field. Checking on leaving a field put
    // an error line under it during the press of "Send the claim", moving the button from under the finger.
    mode: "onSubmit",
    reValidateMode: "onChange",
    defaultValues: {
      pieceId,
      category: "" as Values["category"],
      noticedOn: today,
      description: "",
      answers: { heat: undefined, chemicals: undefined, impact: undefined, usedOutdoors: undefined, directSun: undefined, room: { unit } } as unknown as Values["answers"],
    },
  });
  const { register, formState } = form;
  const errors = formState.errors;
  // The unit the owner types temperatures in (their preference by default); stored in °C by the schema.
  const roomUnit = useWatch({ control: form.control, name: "answers.room.unit" }) ?? unit;

  // Restore the draft, then keep saving it as the owner types.
  useEffect(() => {
    try {
      const draft = JSON.parse(localStorage.getItem(draftKey) ?? "null") as Draft | null;
      if (draft?.values) form.reset({ ...draft.values, pieceId });
      // Restoring from localStorage can only happen after hydration, hence state set in an effect.
      // eslint-disable-next-line react-hooks/set-state-in-effect
      if (draft?.claimId) setClaimId(draft.claimId);
    } catch {
      /* a damaged draft is dropped */
    }
    return form.subscribe({
      formState: { values: true },
      callback: ({ values }) => {
        const prev = JSON.parse(localStorage.getItem(draftKey) ?? "{}") as Draft;
        localStorage.setItem(draftKey, JSON.stringify({ ...prev, values }));
      },
    });
  }, [draftKey, form, pieceId]);

  // The claim is sent once (its id is kept with the draft), then its photos go up one by one. All up: the
  // draft is forgotten and the page goes to the claim. One failed: the page stays, to retry the photos.
  const send = useRefreshingMutation(
    async (values: z.output<typeof createClaimSchema> | null): Promise<Sent> => {
      let id = claimId;
      if (!id) {
        const { claim } = await apiJson<{ claim: { id: string } }>("/api/claims", { method: "POST", body: JSON.stringify(values) });
        id = claim.id;
        setClaimId(id);
        const prev = JSON.parse(localStorage.getItem(draftKey) ?? "{}") as Draft;
        localStorage.setItem(draftKey, JSON.stringify({ ...prev, claimId: id }));
      }
      if (!(await queue.uploadAll(id))) return { id, uploaded: false };
      localStorage.removeItem(draftKey);
      await clearDraftPhotos(draftKey);
      return { id, uploaded: true };
    },
    {
      refresh: "never",
      goTo: ({ id, uploaded }) => (uploaded ? `/claims/${id}` : null),
      // With photos left behind the page stays and its notice says what is left; a toast said it again at the
      // bottom of a phone's screen, over the "Go to the claim" button.
      onSuccess: ({ uploaded }) => {
        if (uploaded) toast.success("Your claim is with the studio.");
      },
      onError: (_words, e) => {
        for (const [field, msgs] of Object.entries(isApiError(e) ? e.fieldErrors : {})) if (msgs[0]) form.setError(field as FieldPath<Values>, { type: "server", message: msgs[0] });
      },
    },
  );
  const busy = send.busy;

  // One press shows every problem at once: the photos are checked in the same pass as the fields. The first
  // field with an error takes the focus (react-hook-form); with only the photos missing, their button does.
  const photosRef = useRef<HTMLElement>(null);
  const noPhotos = () => {
    if (queue.items.length > 0) return false;
    send.reset();
    setPhotoError("Add at least one photo of the damage.");
    return true;
  };
  const onSubmit = (e: FormEvent<HTMLFormElement>) =>
    form.handleSubmit(
      (values) => {
        if (noPhotos()) photosRef.current?.querySelector<HTMLButtonElement>("button:not([disabled])")?.focus();
        else send.run(values);
      },
      () => void noPhotos(),
    )(e);

  const photos = (
    <section ref={photosRef} className="space-y-3" aria-labelledby="photos-heading">
      <h2 id="photos-heading" className="font-display text-xl font-semibold">
        Photos
      </h2>
      <PhotoPicker
        count={queue.items.filter((i) => i.status !== "refused").length}
        refused={queue.refused}
        disabled={busy}
        onFiles={(f) => {
          setPhotoError(null);
          queue.add(f);
        }}
      />
      <ErrorLine>{photoError}</ErrorLine>
      <PhotoQueueList
        items={queue.items}
        busy={busy}
        onRetry={claimId ? (i) => void queue.uploadOne(i, claimId) : undefined}
        onRemove={(i) => void queue.remove(i, claimId ?? undefined)}
      />
    </section>
  );

  if (claimId) {
    const pending = stillToUpload(queue.items).length;
    const refused = queue.items.filter((i) => i.status === "refused").length;
    // A photo the server refused for good (not an image it can read, too large) can't be uploaded by trying again.
    const left = [
      pending > 0 ? `${pending} photo${pending === 1 ? " is" : "s are"} still to upload.` : "",
      refused > 0 ? `${refused === 1 ? "One file" : `${refused} files`} couldn't be added: see why below.` : "",
    ].filter(Boolean);
    return (
      <div className="space-y-6">
        <Notice tone="ok" title="Your claim was sent">
          {left.length ? left.join(" ") : "All photos are uploaded."} The studio can already read your report.
        </Notice>
        {photos}
        <div className="flex flex-col gap-2 sm:flex-row">
          {pending > 0 ? (
            <Button onClick={() => send.run(null)} disabled={busy}>
              Upload the remaining photos
            </Button>
          ) : null}
          <ButtonLink
            variant="secondary"
            href={`/claims/${claimId}`}
            onClick={() => {
              localStorage.removeItem(draftKey);
              void clearDraftPhotos(draftKey);
            }}
          >
            Go to the claim
          </ButtonLink>
        </div>
      </div>
    );
  }

  return (
    <form onSubmit={onSubmit} noValidate className="space-y-8">
      <input type="hidden" {...register("pieceId")} />
      {send.error ? <Notice tone="error" title="The claim wasn't sent">{send.error}</Notice> : null}
      <section className="space-y-4" aria-labelledby="what-heading">
        <h2 id="what-heading" className="font-display text-xl font-semibold">
          What happened to the {pieceTitle}?
        </h2>
        <SelectField label="Kind of damage" error={errors.category?.message} {...register("category")}>
          <option value="">Choose…</option>
          {CLAIM_CATEGORIES.map((c) => (
            <option key={c} value={c}>
              {CLAIM_CATEGORY_LABELS[c]}
            </option>
          ))}
        </SelectField>
        <TextField label="When did you first notice it?" type="date" max={today} error={errors.noticedOn?.message} {...register("noticedOn")} />
        <div className="space-y-1.5">
          <label htmlFor="claim-description" className="block text-sm font-medium">
            Describe it
          </label>
          <textarea
            id="claim-description"
            rows={5}
            aria-invalid={errors.description ? true : undefined}
            aria-describedby="claim-description-hint"
            className="block w-full rounded-lg border border-line bg-white px-3 py-2 text-base focus:border-resin aria-[invalid=true]:border-danger"
            {...register("description")}
          />
          {errors.description ? (
            <ErrorLine>{errors.description.message}</ErrorLine>
          ) : (
            <p id="claim-description-hint" className="text-sm text-muted">
              Where on the piece, how big, and whether it has changed since you first saw it.
            </p>
          )}
        </div>
      </section>

      <section className="space-y-4" aria-labelledby="questions-heading">
        <div>
          <h2 id="questions-heading" className="font-display text-xl font-semibold">
            A few questions
          </h2>
          <p className="text-sm text-muted">The studio needs these to check your warranty. “Not sure” is a fine answer.</p>
        </div>
        {QUESTIONS.map((q) => {
          const err = errors.answers?.[q.name as "heat"]?.message;
          return (
            <fieldset key={q.name} className="space-y-2" aria-invalid={err ? true : undefined}>
              <legend className="text-sm font-medium">{q.label}</legend>
              <div className="grid grid-cols-3 gap-2">
                {(["yes", "no", "unsure"] as const).map((v) => (
                  <label key={v} className="flex min-h-11 cursor-pointer items-center justify-center gap-2 rounded-lg border border-line bg-white px-2 text-sm has-[:checked]:border-resin has-[:checked]:bg-resin-soft has-[:checked]:font-semibold">
                    <input type="radio" value={v} className="size-4 accent-[var(--color-resin)]" {...register(`answers.${q.name}` as "answers.heat")} />
                    {v === "unsure" ? "Not sure" : v === "yes" ? "Yes" : "No"}
                  </label>
                ))}
              </div>
              <ErrorLine>{err}</ErrorLine>
            </fieldset>
          );
        })}
      </section>

      <section className="space-y-4" aria-labelledby="room-heading">
        <div>
          <h2 id="room-heading" className="font-display text-xl font-semibold">
            The room, if you know it
          </h2>
          <p className="text-sm text-muted">
            Wood moves with the air&apos;s humidity. If you have a hygrometer (a small humidity meter), give the driest and the dampest readings
            you have seen — for example with the heating on in winter, and on a humid summer day. Let it settle for 30–60 minutes away from
            windows, vents and sun before reading; cheap ones are often only accurate to a few % RH. Leave these empty if you don&apos;t know.
          </p>
        </div>
        <fieldset className="flex gap-2">
          <legend className="mb-2 text-sm font-medium">Temperature in</legend>
          {(["C", "F"] as const).map((u) => (
            <label key={u} className="flex min-h-11 min-w-16 cursor-pointer items-center justify-center gap-2 rounded-lg border border-line bg-white px-3 text-sm has-[:checked]:border-resin has-[:checked]:bg-resin-soft">
              <input type="radio" value={u} className="size-4" {...register("answers.room.unit")} />°{u}
            </label>
          ))}
        </fieldset>
        <div className="grid grid-cols-2 gap-3">
          <TextField label={`Driest: temp. (°${roomUnit})`} inputMode="decimal" type="number" step="any" error={errors.answers?.room?.driestTemp?.message} {...register("answers.room.driestTemp", reading("answers.room.driestTemp"))} />
          <TextField label="Driest: % RH" inputMode="decimal" type="number" step="any" error={errors.answers?.room?.driestRh?.message} {...register("answers.room.driestRh", reading("answers.room.driestRh"))} />
          <TextField label={`Dampest: temp. (°${roomUnit})`} inputMode="decimal" type="number" step="any" error={errors.answers?.room?.dampestTemp?.message} {...register("answers.room.dampestTemp", reading("answers.room.dampestTemp"))} />
          <TextField label="Dampest: % RH" inputMode="decimal" type="number" step="any" error={errors.answers?.room?.dampestRh?.message} {...register("answers.room.dampestRh", reading("answers.room.dampestRh"))} />
        </div>
        <TextField
          label="Largest change within one day, % RH (optional)"
          inputMode="decimal"
          type="number"
          step="any"
          error={errors.answers?.room?.dailySwingPct?.message}
          {...register("answers.room.dailySwingPct", num)}
        />
        <TextField
          label={`Largest temperature change within one day, °${roomUnit} (optional)`}
          hint={roomUnit === "F" ? "For example 68 °F in the morning and 77 °F by the evening is a change of 9 °F." : "For example 20 °C in the morning and 25 °C by the evening is a change of 5 °C."}
          inputMode="decimal"
          type="number"
          step="any"
          min={0}
          error={errors.answers?.room?.dailyTempSwing?.message}
          {...register("answers.room.dailyTempSwing", num)}
        />
      </section>

      {photos}

      <div className="space-y-2">
        <Button type="submit" className="w-full sm:w-auto" disabled={busy || !queue.loaded}>
          <SpriteIcon name="send" className="size-5" /> {busy ? "Sending…" : "Send the claim"}
        </Button>
        <p className="text-sm text-muted">Your answers are kept on this device until the claim is sent.</p>
      </div>
    </form>
  );
}

export type { CreateClaimInput };
