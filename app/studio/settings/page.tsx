import type { Metadata } from "next";
import { ProfileForm } from "@/components/settings/profile-form";
import { Card } from "@/components/ui/card";
import { requireAdmin } from "@/lib/auth/guards";
import { forPage } from "@/lib/auth/page";
import { zoneChoices } from "@/lib/format";
import { profileFormValues } from "@/lib/settings";
import { saveProfileAction } from "./actions";

export const metadata: Metadata = { title: "Settings" };

export default async function SettingsProfilePage() {
  const ctx = await forPage(requireAdmin);
  const values = profileFormValues(ctx);
  const timeZones = zoneChoices([values.timeZone]);
  return (
    <Card className="space-y-4">
      <div>
        <h2 className="font-display text-xl font-semibold">Profile and rates</h2>
        <p className="text-sm text-muted">Quotes and refresh offers are priced from these rates; amounts in {values.currency}.</p>
      </div>
      <ProfileForm values={values} timeZones={timeZones} action={saveProfileAction} />
    </Card>
  );
}
