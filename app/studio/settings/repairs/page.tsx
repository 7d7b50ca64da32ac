import type { Metadata } from "next";
import { RepairSettingsForm } from "@/components/jobs/repair-settings-form";
import { Card } from "@/components/ui/card";
import { requireAdmin } from "@/lib/auth/guards";
import { forPage } from "@/lib/auth/page";
import { repairSettingsValues } from "@/lib/repairs/settings";
import { saveRepairSettingsAction } from "./actions";

export const metadata: Metadata = { title: "Repair prices and tax" };

export default async function RepairSettingsPage() {
  const ctx = await forPage(requireAdmin);
  const { singleRatePct, currency, ...values } = repairSettingsValues(ctx);
  return (
    <Card className="space-y-4">
      <div className="space-y-2">
        <h2 className="font-display text-xl font-semibold">Repair prices and tax</h2>
        <p className="text-sm text-muted">
          Your repair tasks and their default prices in {currency}, how quotes are rounded, and how tax is charged. The quote builder proposes these; staff can change any line
          on a quote. Quotes already sent keep the prices and tax they were sent with.
        </p>
      </div>
      <RepairSettingsForm values={values} singleRatePct={singleRatePct} currency={currency} action={saveRepairSettingsAction} />
    </Card>
  );
}
