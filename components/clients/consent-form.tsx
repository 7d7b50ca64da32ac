"use client";

import { useQueryClient } from "@tanstack/react-query";
import { useForm } from "react-hook-form";
import { toast } from "sonner";
import { apiJson, isApiError } from "@/components/api-client";
import { useRefreshingMutation } from "@/components/forms/use-refreshing-mutation";
import { Button } from "@/components/ui/button";
import { ErrorLine } from "@/components/ui/error-line";
import { SelectField, TextField } from "@/components/ui/field";
import { CONSENT_KIND_NAMES, CONSENT_KINDS, CONSENT_SOURCE_LABELS, CONSENT_SOURCES, type ConsentKind, type ConsentSource } from "@/lib/clients/vocabulary";

type Values = { kind: ConsentKind; granted: "yes" | "no"; givenOn: string; source: ConsentSource; note: string };

/** Records that the client gave or withdrew one consent, when and how (PATCH …/clients/[id] with consent). */
export function ConsentForm({ clientId, current, today }: { clientId: string; current: Record<ConsentKind, boolean>; today: string }) {
  const queries = useQueryClient();
  const form = useForm<Values>({ defaultValues: { kind: "service", granted: current.service ? "no" : "yes", givenOn: today, source: "in_person", note: "" } });
  const errors = form.formState.errors;
  const { run, busy } = useRefreshingMutation(
    (v: Values) => apiJson(`/api/clients/${clientId}`, { method: "PATCH", body: JSON.stringify({ consent: { [v.kind]: { granted: v.granted === "yes", givenOn: v.givenOn || undefined, source: v.source, note: v.note } } }) }),
    {
      onSuccess: (_, v) => {
        const granted = v.granted === "yes";
        toast.success(granted ? "Consent recorded." : "Withdrawal recorded.");
        void queries.invalidateQueries({ queryKey: ["client-timeline", clientId] });
        form.reset({ ...v, granted: granted ? "no" : "yes", note: "" });
      },
      onError: (words, e) => {
        const fe = isApiError(e) ? e.fieldErrors : {};
        const field = Object.keys(fe).find((k) => k.startsWith("consent"));
        form.setError("root", { type: "server", message: (field && fe[field]?.[0]) || words });
      },
    },
  );
  const onSubmit = form.handleSubmit((v) => {
    const granted = v.granted === "yes";
    if (granted === current[v.kind]) return void form.setError("granted", { type: "manual", message: granted ? "They have already agreed to this." : "They haven't agreed to this." });
    run(v);
  });
  return (
    <form onSubmit={onSubmit} noValidate className="space-y-3" aria-label="Record a consent change">
      {/* One field a row: the form sits in the client page's side column, where two selects a row cut their words. */}
      <div className="space-y-3">
        <SelectField label="Which" {...form.register("kind")}>
          {CONSENT_KINDS.map((k) => (
            <option key={k} value={k}>
              {CONSENT_KIND_NAMES[k]}
            </option>
          ))}
        </SelectField>
        <SelectField label="They say" error={errors.granted?.message} {...form.register("granted")}>
          <option value="yes">Yes, they agree</option>
          <option value="no">No, they withdraw</option>
        </SelectField>
        <TextField label="On" type="date" max={today} {...form.register("givenOn")} />
        <SelectField label="How they told you" {...form.register("source")}>
          {CONSENT_SOURCES.filter((s) => s !== "account" && s !== "imported").map((s) => (
            <option key={s} value={s}>
              {CONSENT_SOURCE_LABELS[s]}
            </option>
          ))}
        </SelectField>
      </div>
      <TextField label="Note (optional)" maxLength={500} {...form.register("note")} />
      <ErrorLine>{errors.root?.message}</ErrorLine>
      <Button type="submit" variant="secondary" disabled={busy || form.formState.isSubmitting}>
        Record
      </Button>
    </form>
  );
}
