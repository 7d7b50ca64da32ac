import type { Metadata } from "next";
import { PolicyEditor } from "@/components/settings/policy-editor";
import { Card } from "@/components/ui/card";
import { StatusBadge } from "@/components/ui/status";
import { requireAdmin } from "@/lib/auth/guards";
import { forPage } from "@/lib/auth/page";
import { warrantyTermsName } from "@/lib/claims/coverage";
import { formatInstant } from "@/lib/format";
import { listPolicyVersions, policyEditorValues } from "@/lib/settings";
import { createPolicyVersionAction } from "../actions";

export const metadata: Metadata = { title: "Warranty policy" };

export default async function WarrantySettingsPage() {
  const ctx = await forPage(requireAdmin);
  const versions = listPolicyVersions(ctx);
  const editor = policyEditorValues(ctx);
  return (
    <div className="space-y-6">
      <Card className="space-y-4">
        <div>
          <h2 className="font-display text-xl font-semibold">Warranty policy</h2>
          <p className="text-sm text-muted">
            Saving makes new terms for pieces delivered from the date you choose. Every piece keeps the terms in force on its delivery date, so changes never reach back to pieces already delivered. The coverage check on each claim reads the piece&apos;s own terms.
          </p>
        </div>
        <PolicyEditor values={editor.values} earliest={editor.earliest} latestVersion={editor.latestVersion} action={createPolicyVersionAction} />
      </Card>
      <Card>
        <h2 className="mb-3 font-semibold">Saved terms</h2>
        {versions.length ? (
          <ol className="divide-y divide-line">
            {versions.map((v) => (
              <li key={v.id} className="py-3">
                <p className="flex flex-wrap items-center gap-2">
                  <strong>{warrantyTermsName(v.effectiveFrom)}</strong>
                  {v.current ? <StatusBadge tone="ok" label="In force for new deliveries" /> : v.upcoming ? <StatusBadge tone="waiting" label="Starts later" /> : <StatusBadge tone="stopped" label="Earlier deliveries" />}
                </p>
                <p className="text-sm text-muted">
                  {v.lineCount} line{v.lineCount === 1 ? "" : "s"} · saved {formatInstant(v.createdAt, ctx.studio.timeZone)}
                  {v.createdBy ? ` by ${v.createdBy}` : ""}
                </p>
                <ul className="mt-1 list-disc pl-5 text-sm">
                  {v.changes.map((c, i) => (
                    <li key={i}>{c}</li>
                  ))}
                </ul>
              </li>
            ))}
          </ol>
        ) : (
          <p className="text-sm text-muted">No warranty terms yet. Pieces recorded now carry none until the first terms are saved.</p>
        )}
      </Card>
    </div>
  );
}
