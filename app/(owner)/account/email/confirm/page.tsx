import type { Metadata } from "next";
import Link from "next/link";
import { ConfirmEmailForm } from "@/components/auth/confirm-email-form";
import { Card, PageHeader } from "@/components/ui/card";
import { Notice } from "@/components/ui/notice";
import { requireUser } from "@/lib/auth/guards";
import { forPage } from "@/lib/auth/page";
import { emailChangeLink } from "@/lib/owner/account-email";
import { confirmEmailChangeAction } from "./actions";

export const metadata: Metadata = { title: "Confirm your new address", robots: { index: false } };

// The link mailed to the new address opens this page, signed in (app/(owner)/layout.tsx sends others to
// sign in first and back here). Opening it as the account that asked sends the change; another
// account sees why nothing happened, and the link stays usable for the account it belongs to.
export default async function ConfirmEmailChangePage({ searchParams }: { searchParams: Promise<Record<string, string | string[] | undefined>> }) {
  const user = await forPage(requireUser);
  const params = await searchParams;
  const token = typeof params.token === "string" ? params.token : "";
  const failed = typeof params.failed === "string" ? params.failed : null;
  const found = failed ? null : emailChangeLink(token);
  const back = (
    <Link href="/account/email" className="font-semibold text-resin underline">
      Back to your e-mail address
    </Link>
  );
  if (!found || found.userId !== user.id) {
    const otherAccount = found !== null;
    return (
      <>
        <PageHeader title="Confirm your new address" />
        <Notice tone="warn" title={otherAccount ? "This link is for another account" : failed === "taken" ? "That address is taken" : "This link doesn't work any more"}>
          {otherAccount
            ? "You're signed in to a different Grainward account from the one that asked for this change. Sign out, then open the link again and sign in to the account that asked. Nothing has changed."
            : failed === "taken"
              ? "Another Grainward account started using that address after the link was sent, so your address stays as it was. Ask again with a different address."
              : "It has expired, was already used, or a newer request replaced it. Your address stays as it was; ask again from your account if you still want to change it."}
        </Notice>
        <p className="mt-4 text-sm">{back}</p>
      </>
    );
  }
  return (
    <>
      <PageHeader title="Confirm your new address" lead={`Your account moves to ${found.newEmail}.`} />
      <Card>
        <ConfirmEmailForm action={confirmEmailChangeAction} token={token} />
      </Card>
    </>
  );
}
