"use client";

import { useQuery } from "@tanstack/react-query";
import { useEffect, useState } from "react";
import type { FieldValues, UseFormRegister, UseFormSetValue } from "react-hook-form";
import { apiJson } from "@/components/api-client";
import { TextField } from "@/components/ui/field";
import type { ClientPage } from "@/lib/clients/list";
import { ErrorLine } from "@/components/ui/error-line";
import { SpriteIcon } from "@/components/ui/sprite-icon";

type Errors = Record<string, { message?: string } | undefined>;

const MODES = [
  { value: "none", label: "Not recorded yet", hint: "The buyer registers later with the drawer card." },
  { value: "existing", label: "A client already on record", hint: "Find them by name, e-mail or phone." },
  { value: "new", label: "A new client", hint: "Their details go on a new client record." },
] as const;

/**
 * The new-piece form's buyer: nobody yet, a client found by search (GET /api/clients?q=), or a new
 * client typed here; then whether to send them the hand-over mail. Fields of the piece form
 * (deliverPieceSchema in lib/validation/clients).
 */
export function BuyerFields({
  picked = null,
  register,
  setValue,
  watch,
  errors,
}: {
  /** The client already picked when the form opens (from their client page). */
  picked?: { id: string; name: string; email: string } | null;
  register: UseFormRegister<FieldValues>;
  setValue: UseFormSetValue<FieldValues>;
  watch: (name: string) => unknown;
  errors: Errors;
}) {
  const mode = (watch("buyer") as string) || "none";
  const chosenId = (watch("buyerClientId") as string) || "";
  const [typed, setTyped] = useState("");
  const [q, setQ] = useState("");
  useEffect(() => {
    const t = setTimeout(() => setQ(typed.trim()), 250);
    return () => clearTimeout(t);
  }, [typed]);
  const found = useQuery({
    queryKey: ["buyer-search", q],
    queryFn: () => apiJson<ClientPage>(`/api/clients?${new URLSearchParams({ q })}`),
    enabled: mode === "existing" && q.length >= 2,
  });
  const [chosen, setChosen] = useState<{ id: string; name: string; email: string } | null>(picked);

  return (
    <div className="space-y-4">
      <fieldset className="space-y-2">
        <legend className="text-sm font-medium">Who bought it?</legend>
        <div className="grid gap-2 sm:grid-cols-3">
          {MODES.map((m) => (
            <label key={m.value} className="flex min-h-11 cursor-pointer gap-2 rounded-lg border border-line bg-white p-3 has-[:checked]:border-resin">
              <input type="radio" value={m.value} {...register("buyer")} className="mt-1 size-4" />
              <span>
                <span className="block font-medium">{m.label}</span>
                <span className="block text-sm text-muted">{m.hint}</span>
              </span>
            </label>
          ))}
        </div>
      </fieldset>

      {mode === "existing" ? (
        <div className="space-y-2">
          <label htmlFor="buyer-search" className="block text-sm font-medium">
            Find the client
          </label>
          <div className="relative">
            <SpriteIcon name="search" className="pointer-events-none absolute left-3 top-1/2 size-5 -translate-y-1/2 text-muted" />
            <input
              id="buyer-search"
              type="search"
              value={typed}
              maxLength={200}
              onChange={(e) => setTyped(e.target.value)}
              placeholder="Name, e-mail or phone"
              className="block min-h-11 w-full rounded-lg border border-line bg-white py-2 pl-10 pr-3 text-base focus:border-resin"
            />
          </div>
          {found.data && found.data.rows.length === 0 ? <p className="text-sm text-muted">No client matches. Pick “A new client” to add them.</p> : null}
          {found.data?.rows.length ? (
            <ul className="divide-y divide-line rounded-lg border border-line bg-white" aria-label="Matching clients">
              {found.data.rows.slice(0, 8).map((c) => (
                <li key={c.id}>
                  <label className="flex min-h-11 cursor-pointer items-center gap-2 px-3 py-2">
                    <input
                      type="radio"
                      name="buyer-pick"
                      checked={chosenId === c.id}
                      onChange={() => {
                        setChosen({ id: c.id, name: c.name, email: c.email });
                        setValue("buyerClientId", c.id, { shouldValidate: true });
                      }}
                      className="size-4"
                    />
                    <span>
                      <span className="font-medium">{c.name}</span>
                      <span className="text-sm text-muted">{[c.email, c.phoneDisplay].filter(Boolean).length ? ` · ${[c.email, c.phoneDisplay].filter(Boolean).join(" · ")}` : ""}</span>
                    </span>
                  </label>
                </li>
              ))}
            </ul>
          ) : null}
          {chosen && chosenId === chosen.id ? (
            <p className="text-sm">
              Buyer: <span className="font-semibold">{chosen.name}</span>
              {chosen.email ? "" : " (no e-mail on record, so no hand-over mail)"}
            </p>
          ) : null}
          <input type="hidden" {...register("buyerClientId")} />
          <ErrorLine>{errors.buyerClientId?.message}</ErrorLine>
        </div>
      ) : null}

      {mode === "new" ? (
        <div className="grid gap-4 sm:grid-cols-3">
          <TextField label="Buyer's name" autoComplete="off" {...register("buyerName")} error={errors.buyerName?.message} />
          <TextField label="Buyer's e-mail" type="email" autoComplete="off" {...register("buyerEmail")} error={errors.buyerEmail?.message} />
          <TextField label="Buyer's phone" type="tel" autoComplete="off" {...register("buyerPhone")} error={errors.buyerPhone?.message} />
          <label className="flex min-h-11 items-center gap-2 text-sm sm:col-span-3">
            <input type="checkbox" {...register("buyerServiceMail")} className="size-4" />
            They agreed to service mail (care reminders, visit mail and the hand-over mail)
          </label>
        </div>
      ) : null}

      {mode !== "none" ? (
        <label className="flex min-h-11 items-center gap-2 text-sm">
          <input type="checkbox" {...register("sendHandover")} className="size-4" />
          Send them the hand-over mail now: care, warranty and a link that registers the piece (only with an e-mail and their consent to service mail)
        </label>
      ) : null}
    </div>
  );
}
