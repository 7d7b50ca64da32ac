"use client";
import { useRouter } from "next/navigation";
import { useState } from "react";
import { apiJson, isApiError } from "@/components/api-client";
import { Button } from "@/components/ui/button";
import { CARE_TASK_LABELS, CLAIM_CATEGORIES, REFRESH_TASK_KINDS, type CareTaskKind, type ClaimCategory } from "@/lib/care/vocabulary";

const field = "w-full rounded-lg border border-line bg-card px-3 py-2";

/** A new care plan template (admin). Sent to POST /api/plans; the price is typed in the studio's currency. */
export function PlanTemplateForm({ currency, exponent, categoryLabels }: { currency: string; exponent: number; categoryLabels: Record<ClaimCategory, string> }) {
  const router = useRouter();
  const [error, setError] = useState<string | null>(null);
  const [busy, setBusy] = useState(false);
  async function submit(form: FormData) {
    setBusy(true);
    setError(null);
    const num = (k: string) => Number(form.get(k) ?? 0);
    const category = String(form.get("extendCategory") ?? "");
    const months = num("extendMonths");
    try {
      await apiJson("/api/plans", {
        method: "POST",
        json: {
          name: String(form.get("name") ?? ""),
          summary: String(form.get("summary") ?? ""),
          priceMinor: Math.round(num("price") * 10 ** exponent),
          interval: form.get("interval") === "month" ? "month" : "year",
          included: {
            tasks: form.getAll("tasks").map(String),
            visitsPerYear: num("visitsPerYear"),
            visitSharePct: num("visitSharePct"),
            extendedLines: category && months > 0 ? [{ category, extraMonths: months }] : [],
            repairDiscountPct: num("repairDiscountPct"),
          },
          fits: { finishClasses: [], pieceKinds: [], minTopAreaM2: null, maxTopAreaM2: null },
        },
      });
      router.refresh();
      (document.getElementById("plan-template-form") as HTMLFormElement | null)?.reset();
    } catch (e) {
      setError(isApiError(e) ? [e.message, ...Object.values(e.fieldErrors).flat()].join(" ") : "The plan couldn't be saved. Try again.");
    }
    setBusy(false);
  }
  return (
    <form id="plan-template-form" action={submit} className="grid gap-3 sm:grid-cols-2">
      <label className="space-y-1 sm:col-span-2">
        <span className="font-semibold">Name</span>
        <input name="name" required minLength={2} maxLength={80} className={field} />
      </label>
      <label className="space-y-1 sm:col-span-2">
        <span className="font-semibold">What owners read about it</span>
        <textarea name="summary" maxLength={600} rows={2} className={field} />
      </label>
      <label className="space-y-1">
        <span className="font-semibold">Price ({currency}, before tax as your settings apply it)</span>
        <input name="price" type="number" min={0} step={10 ** -exponent} required className={field} />
      </label>
      <label className="space-y-1">
        <span className="font-semibold">Billed</span>
        <select name="interval" className={field} defaultValue="year">
          <option value="year">Every year</option>
          <option value="month">Every month</option>
        </select>
      </label>
      <fieldset className="space-y-1 sm:col-span-2">
        <legend className="font-semibold">Care tasks the studio does (no reminders to the owner)</legend>
        {REFRESH_TASK_KINDS.map((t: CareTaskKind) => (
          <label key={t} className="mr-4 inline-flex min-h-11 items-center gap-2">
            <input type="checkbox" name="tasks" value={t} /> {CARE_TASK_LABELS[t]}
          </label>
        ))}
      </fieldset>
      <label className="space-y-1">
        <span className="font-semibold">Studio visits a year</span>
        <input name="visitsPerYear" type="number" min={0} max={12} defaultValue={1} className={field} />
      </label>
      <label className="space-y-1">
        <span className="font-semibold">Owner pays of each visit (%)</span>
        <input name="visitSharePct" type="number" min={0} max={100} defaultValue={0} className={field} />
      </label>
      <label className="space-y-1">
        <span className="font-semibold">Longer warranty for</span>
        <select name="extendCategory" className={field} defaultValue="">
          <option value="">No line</option>
          {CLAIM_CATEGORIES.map((c) => (
            <option key={c} value={c}>
              {categoryLabels[c]}
            </option>
          ))}
        </select>
      </label>
      <label className="space-y-1">
        <span className="font-semibold">By (months)</span>
        <input name="extendMonths" type="number" min={0} max={120} defaultValue={12} className={field} />
      </label>
      <label className="space-y-1">
        <span className="font-semibold">Discount on paid repairs (%)</span>
        <input name="repairDiscountPct" type="number" min={0} max={100} defaultValue={0} className={field} />
      </label>
      <div className="sm:col-span-2 space-y-2">
        <Button type="submit" disabled={busy}>
          {busy ? "Saving…" : "Add the plan"}
        </Button>
        {error ? (
          <p role="alert" className="text-sm text-danger">
            {error}
          </p>
        ) : null}
      </div>
    </form>
  );
}
