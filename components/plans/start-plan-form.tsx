"use client";
import { apiJson } from "@/components/api-client";
import { useRefreshingMutation } from "@/components/forms/use-refreshing-mutation";
import { Button } from "@/components/ui/button";
import { ErrorLine } from "@/components/ui/error-line";

const field = "w-full rounded-lg border border-line bg-card px-3 py-2";

/** Staff start a plan for a client who paid by other means (POST /api/plans/subscriptions). */
export function StartPlanForm({ pieceId, pieceTitle, options }: { pieceId: string; pieceTitle: string; options: { id: string; label: string }[] }) {
  const { run, busy, error } = useRefreshingMutation(
    (form: FormData) => apiJson("/api/plans/subscriptions", { method: "POST", json: { pieceId, templateId: String(form.get("templateId")), paidByNote: String(form.get("paidByNote") ?? "") } }),
    { withFieldErrors: true },
  );
  const submit = (form: FormData) => run(form);
  return (
    <form action={submit} className="space-y-2" aria-label={`Start a plan for ${pieceTitle}`}>
      {/* A choice each plan, whose name and price wrap: a select cut them short in the client page's side column. */}
      <fieldset className="text-sm">
        <legend className="font-semibold">Plan</legend>
        {options.map((o, i) => (
          <label key={o.id} className="flex min-h-11 items-center gap-2">
            <input type="radio" name="templateId" value={o.id} defaultChecked={i === 0} className="size-5 shrink-0 accent-resin" />
            <span>{o.label}</span>
          </label>
        ))}
      </fieldset>
      <label className="block space-y-1 text-sm">
        <span className="font-semibold">How the client paid</span>
        <input name="paidByNote" required minLength={2} maxLength={200} placeholder="Bank transfer, cash at the studio…" className={field} />
      </label>
      <Button type="submit" variant="secondary" disabled={busy}>
        {busy ? "Starting…" : "Start the plan (paid by other means)"}
      </Button>
      <ErrorLine>{error}</ErrorLine>
    </form>
  );
}
