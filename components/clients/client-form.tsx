"use client";

import { useQueryClient } from "@tanstack/react-query";
import Link from "next/link";
import { useState } from "react";
import { useForm } from "react-hook-form";
import { toast } from "sonner";
import { apiJson, isApiError } from "@/components/api-client";
import { useLazyZodResolver } from "@/components/forms/lazy-zod-resolver";
import { useRefreshingMutation } from "@/components/forms/use-refreshing-mutation";
import { Button } from "@/components/ui/button";
import { ErrorLine } from "@/components/ui/error-line";
import { SelectField, TextField } from "@/components/ui/field";
import { ZoneSelect } from "@/components/ui/zone-select";
import { zoneLabel, type ZoneChoices } from "@/lib/format";
import type { ClientDetail } from "@/lib/clients/get";
import { CONTACT_METHOD_LABELS, CONTACT_METHODS } from "@/lib/clients/vocabulary";
import type { ClientFormInput } from "@/lib/validation/clients";

const FIELDS = ["name", "email", "phone", "address", "preferredContact", "timeZone", "notes"] as const;
const textarea = "block w-full rounded-lg border border-line bg-white px-3 py-2 text-base focus:border-resin aria-[invalid=true]:border-danger";

/** A client's contact details: a new client (POST) or changes to one (PATCH). The schema loads while the form is filled in. */
export function ClientForm({ client, studioZone, zones }: { client?: ClientDetail["client"]; studioZone: string; zones: ZoneChoices }) {
  const queries = useQueryClient();
  const form = useForm<ClientFormInput>({
    resolver: useLazyZodResolver(() => import("@/lib/validation/clients").then((m) => m.clientFormSchema)),
    defaultValues: {
      name: client?.name ?? "",
      email: client?.email ?? "",
      phone: client?.phoneDisplay ?? "",
      address: client?.address ?? "",
      preferredContact: client?.preferredContact ?? "email",
      timeZone: client?.timeZone ?? "",
      notes: client?.notes ?? "",
    },
  });
  const errors = form.formState.errors;
  // The client who already has the e-mail typed, when the server says so: one tap opens their record.
  const [holder, setHolder] = useState<{ id: string; name: string } | null>(null);
  // A change sends only the fields touched and stays on the page; a new client opens its own page.
  const { run, busy } = useRefreshingMutation(
    async ({ values, changed }: { values: ClientFormInput; changed: Partial<ClientFormInput> }) =>
      client
        ? { saved: await apiJson<ClientDetail>(`/api/clients/${client.id}`, { method: "PATCH", body: JSON.stringify(changed) }) }
        : { createdId: (await apiJson<{ client: { id: string } }>("/api/clients", { method: "POST", body: JSON.stringify(values) })).client.id },
    {
      onSuccess: ({ saved }, { values }) => {
        if (!saved) return void toast.success("Client added.");
        form.reset({ ...values, phone: saved.client.phoneDisplay, email: saved.client.email });
        toast.success("Contact details saved.");
        void queries.invalidateQueries({ queryKey: ["client-timeline", saved.client.id] });
      },
      goTo: ({ createdId }) => (createdId ? `/studio/clients/${createdId}` : null),
      onError: (words, e) => {
        const other = isApiError(e) ? (e.body.client as { id?: unknown; name?: unknown } | undefined) : undefined;
        setHolder(other && typeof other.id === "string" && typeof other.name === "string" ? { id: other.id, name: other.name } : null);
        let placed = false;
        for (const [field, messages] of Object.entries(isApiError(e) ? e.fieldErrors : {})) {
          if ((FIELDS as readonly string[]).includes(field) && messages[0]) {
            form.setError(field as (typeof FIELDS)[number], { type: "server", message: messages[0] });
            placed = true;
          }
        }
        if (!placed) form.setError("root", { type: "server", message: words });
      },
    },
  );
  const onSubmit = form.handleSubmit((values) => {
    const changed = Object.fromEntries(FIELDS.filter((f) => form.formState.dirtyFields[f]).map((f) => [f, values[f]]));
    if (client && Object.keys(changed).length === 0) return void toast.info("Nothing changed.");
    run({ values, changed });
  });
  const saving = busy || form.formState.isSubmitting;
  return (
    <form onSubmit={onSubmit} noValidate className="space-y-4" aria-label={client ? "Contact details" : "New client"}>
      <div className="grid gap-4 md:grid-cols-2">
        <TextField label="Name" autoComplete="off" error={errors.name?.message} {...form.register("name")} />
        <div className="space-y-1">
          <TextField label="E-mail" type="email" autoComplete="off" error={errors.email?.message} {...form.register("email")} />
          {holder && errors.email ? (
            <Link href={`/studio/clients/${holder.id}`} className="inline-flex min-h-11 items-center text-sm font-medium text-resin underline">
              Open {holder.name}&apos;s record
            </Link>
          ) : null}
        </div>
        <TextField label="Phone" type="tel" autoComplete="off" hint="Without a + country code, read as a number of the studio's country." error={errors.phone?.message} {...form.register("phone")} />
        <SelectField label="Preferred contact" error={errors.preferredContact?.message} {...form.register("preferredContact")}>
          {CONTACT_METHODS.map((m) => (
            <option key={m} value={m}>
              {CONTACT_METHOD_LABELS[m]}
            </option>
          ))}
        </SelectField>
        <ZoneSelect label="Time zone" choices={zones} hint={`The studio’s is ${zoneLabel(zones, studioZone)}.`} error={errors.timeZone?.message} {...form.register("timeZone")}>
          <option value="">The studio’s</option>
        </ZoneSelect>
      </div>
      <div className="space-y-1.5">
        <label htmlFor="client-address" className="block text-sm font-medium">
          Postal address
        </label>
        <textarea id="client-address" rows={3} className={textarea} aria-invalid={errors.address ? true : undefined} {...form.register("address")} />
        <ErrorLine>{errors.address?.message}</ErrorLine>
      </div>
      <div className="space-y-1.5">
        <label htmlFor="client-notes" className="block text-sm font-medium">
          Notes for the studio
        </label>
        <textarea id="client-notes" rows={3} className={textarea} aria-invalid={errors.notes ? true : undefined} {...form.register("notes")} />
        <ErrorLine>{errors.notes?.message}</ErrorLine>
      </div>
      <ErrorLine>{errors.root?.message}</ErrorLine>
      <Button type="submit" disabled={saving}>
        {saving ? "Saving…" : client ? "Save contact details" : "Add client"}
      </Button>
    </form>
  );
}
