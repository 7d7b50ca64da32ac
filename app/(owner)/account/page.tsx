import Link from "next/link";
import type { Metadata } from "next";
import { NameForm } from "@/components/owner/name-form";
import { PreferencesForm } from "@/components/owner/preferences-form";
import { Card, PageHeader } from "@/components/ui/card";
import { Notice } from "@/components/ui/notice";
import { requireUser } from "@/lib/auth/guards";
import { forPage } from "@/lib/auth/page";
import { zoneChoices } from "@/lib/format";
import { pendingEmailChange } from "@/lib/owner/account-email";
import { getPreferences } from "@/lib/owner/preferences";
import { saveNameAction, savePreferencesAction } from "./actions";

export const metadata: Metadata = { title: "Account" };

const linkClass = "flex min-h-11 items-center rounded-lg border border-line px-4 text-sm font-semibold text-resin hover:border-resin";

export default async function AccountPage({ searchParams }: { searchParams: Promise<Record<string, string | string[] | undefined>> }) {
  const user = await forPage(requireUser);
  const prefs = getPreferences(user);
  const pending = pendingEmailChange(user);
  const changed = (await searchParams).email === "changed";
  return (
    <>
      <PageHeader title="Account" lead={`${prefs.name} · ${prefs.email}`} />
      {changed ? (
        <Notice tone="ok" title="E-mail address changed" className="mb-6">
          Your account now uses {prefs.email}. You&apos;re signed out on every other device.
        </Notice>
      ) : null}
      <Card className="mb-6">
        <NameForm action={saveNameAction} name={prefs.name} />
      </Card>
      <Card className="mb-6 flex flex-wrap items-center justify-between gap-3">
        <div className="min-w-0">
          <h2 className="font-semibold">E-mail address</h2>
          <p className="break-words text-sm text-muted">
            {prefs.email}
            {pending ? ` · a change to ${pending.newEmail} is waiting for its link` : ""}
          </p>
        </div>
        <Link href="/account/email" className={linkClass}>
          Change e-mail address
        </Link>
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
        <Link href="/account/password" className={linkClass}>
          Change password
        </Link>
      </Card>
      <Card className="mt-6 flex flex-wrap items-center justify-between gap-3">
        <div>
          <h2 className="font-semibold">Delete my account</h2>
          <p className="text-sm text-muted">Releases your pieces and removes your name and address. The next page says exactly what happens.</p>
        </div>
        <Link href="/account/delete" className="flex min-h-11 items-center rounded-lg border border-danger/40 px-4 text-sm font-semibold text-danger hover:border-danger">
          Delete my account…
        </Link>
      </Card>
    </>
  );
}
