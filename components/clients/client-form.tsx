"use client";

import { useQueryClient } from "@tanstack/react-query";
import { useRouter } from "next/navigation";
import { useForm } from "react-hook-form";
import { toast } from "sonner";
import { ApiError, apiJson } from "@/components/api-client";
import { useLazyZodResolver } from "@/components/forms/lazy-zod-resolver";
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
  const router = useRouter();
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
  const onSubmit = form.handleSubmit(async (values) => {
    try {
      if (client) {
        const dirty = Object.fromEntries(FIELDS.filter((f) => form.formState.dirtyFields[f]).map((f) => [f, values[f]]));
        if (Object.keys(dirty).length === 0) return void toast.info("Nothing changed.");
        const saved = await apiJson<ClientDetail>(`/api/clients/${client.id}`, { method: "PATCH", body: JSON.stringify(dirty) });
        form.reset({ ...values, phone: saved.client.phoneDisplay, email: saved.client.email });
        toast.success("Contact details saved.");
        void queries.invalidateQueries({ queryKey: ["client-timeline", client.id] });
        router.refresh();
      } else {
        const { client: created } = await apiJson<{ client: { id: string } }>("/api/clients", { method: "POST", body: JSON.stringify(values) });
        toast.success("Client added.");
        router.push(`/studio/clients/${created.id}`);
      }
    } catch (e) {
      if (e instanceof ApiError) {
        let placed = false;
        for (const [field, messages] of Object.entries(e.fieldErrors)) {
          if ((FIELDS as readonly string[]).includes(field) && messages[0]) {
            form.setError(field as (typeof FIELDS)[number], { type: "server", message: messages[0] });
            placed = true;
          }
        }
        if (!placed) form.setError("root", { type: "server", message: e.message });
      } else form.setError("root", { type: "server", message: "The details weren't saved. Check your connection and try again." });
    }
  });
  return (
    <form onSubmit={onSubmit} noValidate className="space-y-4" aria-label={client ? "Contact details" : "New client"}>
      <div className="grid gap-4 md:grid-cols-2">
        <TextField label="Name" autoComplete="off" error={errors.name?.message} {...form.register("name")} />
        <TextField label="E-mail" type="email" autoComplete="off" error={errors.email?.message} {...form.register("email")} />
        <TextField label="Phone" type="tel" autoComplete="off" hint="Without a + country code, read as a number of the studio's country." error={errors.phone?.message} {...form.register("phone")} />
        <SelectField label="Preferred contact" error={errors.preferredContact?.message} {...form.register("preferredContact")}>
          {CONTACT_METHODS.map((m) => (
            <option key={m} value={m}>
              {CONTACT_METHOD_LABELS[m]}
            </option>
          ))}
        </SelectField>
        <ZoneSelect label="Time zone" choices={zones} error={errors.timeZone?.message} {...form.register("timeZone")}>
          <option value="">The studio’s ({zoneLabel(zones, studioZone)})</option>
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
      <Button type="submit" disabled={form.formState.isSubmitting}>
        {form.formState.isSubmitting ? "Saving…" : client ? "Save contact details" : "Add client"}
      </Button>
    </form>
  );
}
