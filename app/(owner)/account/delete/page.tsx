import type { Metadata } from "next";
import Link from "next/link";
import { DeleteAccountForm } from "@/components/owner/delete-account-form";
import { Card, PageHeader } from "@/components/ui/card";
import { Notice } from "@/components/ui/notice";
import { requireUser } from "@/lib/auth/guards";
import { forPage } from "@/lib/auth/page";
import { formatCount } from "@/lib/format";
import { deletionPreview } from "@/lib/owner/account-delete";
import { deleteAccountAction } from "./actions";

export const metadata: Metadata = { title: "Delete my account" };

// The rules are lib/owner/account-delete.ts's; this page says them before anything happens.
export default async function DeleteAccountPage() {
  const user = await forPage(requireUser);
  const preview = deletionPreview(user);
  const piecesWords =
    preview.pieces.length === 0
      ? "You hold no pieces now."
      : `You hold ${formatCount(preview.pieces.length)} ${preview.pieces.length === 1 ? "piece" : "pieces"}: ${preview.pieces.map((p) => `${p.title} (${p.studioName})`).join(", ")}. We e-mail you each piece's new registration code: give it to whoever has the piece next, so they can register it.`;
  const now = (n: number) => (n === 0 ? "none now" : `${formatCount(n)} now`);
  return (
    <>
      <PageHeader title="Delete my account" lead="This can't be undone. Read what happens first." />
      <Card className="mb-6 space-y-3 text-sm">
        <h2 className="text-base font-semibold">What happens</h2>
        <ul className="list-disc space-y-2 pl-5">
          <li>
            <strong>Your pieces are released</strong>, as when you hand one on, so the studio can pass them to someone else. {piecesWords}
          </li>
          <li>A care plan on a piece ends or passes on with the piece, by the studio&apos;s rule for handing on; any refund it gives goes back to your card.</li>
          <li>
            Open claims are withdrawn and the studio is told ({now(preview.openClaims)}). Quotes waiting for your answer are declined ({now(preview.quotes)}).
          </li>
          <li>Your name, e-mail address and password are removed. You can&apos;t sign in again, and we stop writing to you.</li>
          <li>
            Payments, receipts and the records studios must keep for their books stay, showing you as &ldquo;Former owner (account deleted)&rdquo;. A
            studio&apos;s own customer list is theirs: ask them directly to remove you from it.
          </li>
          <li>You&apos;re signed out everywhere.</li>
        </ul>
      </Card>
      {preview.blocks.length ? (
        <Notice tone="warn" title="Not yet: something can't be undone safely">
          <ul className="list-disc space-y-1 pl-5">
            {preview.blocks.map((b) => (
              <li key={b.words}>{b.words}</li>
            ))}
          </ul>
        </Notice>
      ) : (
        <Card>
          <DeleteAccountForm action={deleteAccountAction} />
        </Card>
      )}
      <p className="mt-6 text-sm">
        <Link href="/account" className="font-semibold text-resin underline">
          Keep my account
        </Link>
      </p>
    </>
  );
}
