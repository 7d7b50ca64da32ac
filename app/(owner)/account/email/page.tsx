import type { Metadata } from "next";
import { CancelEmailChangeButton, ChangeEmailForm } from "@/components/owner/change-email-form";
import { Card, PageHeader } from "@/components/ui/card";
import { Notice } from "@/components/ui/notice";
import { requireUser } from "@/lib/auth/guards";
import { forPage } from "@/lib/auth/page";
import { formatInstant } from "@/lib/format";
import { pendingEmailChange } from "@/lib/owner/account-email";
import { getPreferences } from "@/lib/owner/preferences";
import { cancelEmailChangeAction, requestEmailChangeAction } from "./actions";

export const metadata: Metadata = { title: "Change e-mail address" };

export default async function ChangeEmailPage() {
  const user = await forPage(requireUser);
  const prefs = getPreferences(user);
  const pending = pendingEmailChange(user);
  const zone = prefs.timeZone;
  return (
    <>
      <PageHeader title="Change e-mail address" lead={`Your account uses ${prefs.email}.`} />
      {pending ? (
        <Notice tone="info" title="A change is waiting for its link" className="mb-6">
          <p>
            We sent a link to {pending.newEmail}. Your address changes to it when you open that link while signed in here. It
            works until {formatInstant(pending.expiresAt, zone, { time: true })}.
          </p>
          <p className="mt-2">Didn&apos;t ask for this, or changed your mind?</p>
          <div className="mt-2">
            <CancelEmailChangeButton action={cancelEmailChangeAction} />
          </div>
        </Notice>
      ) : null}
      <Card>
        <ChangeEmailForm action={requestEmailChangeAction} />
      </Card>
      <Card className="mt-6 space-y-2 text-sm text-muted">
        <h2 className="font-semibold text-ink">What happens</h2>
        <ul className="list-disc space-y-1 pl-5">
          <li>We send a link to the new address and a note to {prefs.email}. Nothing changes until the link is opened.</li>
          <li>The link works once, for 24 hours, and only for this account. Asking again replaces it.</li>
          <li>When the address changes, you stay signed in here and are signed out everywhere else. Studios see the new address on their record of you.</li>
          <li>Replies to our mails reach the right conversation from your new address.</li>
        </ul>
      </Card>
    </>
  );
}
