import Link from "next/link";
import type { Metadata } from "next";
import { NameForm } from "@/components/owner/name-form";
import { PreferencesForm } from "@/components/owner/preferences-form";
import { Card, PageHeader } from "@/components/ui/card";
import { requireUser } from "@/lib/auth/guards";
import { forPage } from "@/lib/auth/page";
import { zoneChoices } from "@/lib/format";
import { getPreferences } from "@/lib/owner/preferences";
import { saveNameAction, savePreferencesAction } from "./actions";

export const metadata: Metadata = { title: "Account" };

export default async function AccountPage() {
  const prefs = await forPage(async () => getPreferences(await requireUser()));
  return (
    <>
      <PageHeader title="Account" lead={`${prefs.name} · ${prefs.email}`} />
      <Card className="mb-6">
        <NameForm action={saveNameAction} name={prefs.name} />
      </Card>
      <Card>
        <PreferencesForm
          action={savePreferencesAction}
          zones={zoneChoices([prefs.timeZone])}
          zoneNeverSet={prefs.timeZone === "UTC"}
          defaults={{ remindersEnabled: prefs.remindersEnabled, timeZone: prefs.timeZone, unitSystem: prefs.unitSystem }}
        />
      </Card>
      <Card className="mt-6 flex flex-wrap items-center justify-between gap-3">
        <div>
          <h2 className="font-semibold">Password</h2>
          <p className="text-sm text-muted">Changing it signs you out on every other device.</p>
        </div>
        <Link href="/account/password" className="flex min-h-11 items-center rounded-lg border border-line px-4 text-sm font-semibold text-resin hover:border-resin">
          Change password
        </Link>
      </Card>
    </>
  );
}
