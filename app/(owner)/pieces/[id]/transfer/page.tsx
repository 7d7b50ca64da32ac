import type { Metadata } from "next";
import Link from "next/link";
import { ReleaseForm } from "@/components/owner/release-form";
import { Card, PageHeader } from "@/components/ui/card";
import { requireUser } from "@/lib/auth/guards";
import { forPage } from "@/lib/auth/page";
import { formatInstant, formatMoney, formatZone } from "@/lib/format";
import { getMyPiece } from "@/lib/owner/pieces";
import { planOnRelease, type PlanOnRelease } from "@/lib/plans/transfer";
import { CODE_WHEN_PIECE_CHANGES_HANDS } from "@/lib/pieces/card-words";
import { releaseAction } from "./actions";

export const metadata: Metadata = { title: "Hand a piece on" };

/** What releasing does to the care plan the owner pays for on the piece, in the words of lib/plans/transfer.ts's rule. */
function planWords(p: PlanOnRelease, timeZone: string): string {
  const day = (ms: number) => `${formatInstant(ms, timeZone)} (${formatZone(timeZone)})`;
  if (p.moves) {
    return `Your care plan “${p.planName}” stays with the piece${p.endsAt ? ` until ${day(p.endsAt)}` : ""} for its next owner. It isn't renewed on your ${p.paidBy === "card" ? "card" : "account"}, and nothing is paid back to you.`;
  }
  const back =
    p.refundMinor > 0
      ? `You get ${formatMoney(p.refundMinor, p.currency, p.country)} back for ${p.months === 1 ? "one unused month" : `${p.months} unused months`}${p.paidBy === "card" ? ", to the card you paid with" : ", paid back by the studio"}.`
      : "Nothing is paid back under the studio's terms for this plan.";
  return `Your care plan “${p.planName}” ends the moment you release the piece. ${back}`;
}

export default async function TransferPage({ params }: { params: Promise<{ id: string }> }) {
  const { id } = await params;
  const user = await forPage(requireUser);
  const piece = await forPage(async () => getMyPiece(user, id));
  const plan = planOnRelease(user, piece.id);
  const planNote = plan ? planWords(plan, piece.timeZone) : null;
  const passes = piece.warranty.lines.filter((l) => l.transfersToNewOwner && l.status === "active");
  const stays = piece.warranty.lines.filter((l) => !l.transfersToNewOwner);
  const action = releaseAction.bind(null, piece.id);
  return (
    <>
      <p className="text-sm font-medium text-muted">
        <Link href={`/pieces/${piece.id}`} className="inline-flex min-h-11 items-center hover:underline">
          ← {piece.title}
        </Link>
      </p>
      <PageHeader title="Selling or giving it away?" lead={`Release the ${piece.title} so its next owner can register it.`} />
      <Card className="mb-4 space-y-3 text-sm">
        <h2 className="text-base font-semibold">What happens</h2>
        {/* The same sentence is printed on the drawer card. */}
        <p>{CODE_WHEN_PIECE_CHANGES_HANDS}</p>
        <ol className="list-decimal space-y-1 pl-5">
          <li>The piece leaves your account and its reminders stop.</li>
          <li>You get the new registration code, shown once here and e-mailed to you. The code on the drawer card stops working.</li>
          <li>Hand the code to the next owner; they register the piece with it. {piece.studio.name} is told the piece changed hands.</li>
          <li>The care log stays with the piece, so the care you gave still counts. Your notes and photos are not shown to the next owner.</li>
        </ol>
        {piece.warranty.lines.length ? (
          <>
            <h2 className="pt-1 text-base font-semibold">The warranty</h2>
            {passes.length ? <p>Passes to the next owner: {passes.map((l) => l.label).join("; ")}.</p> : null}
            {stays.length ? <p>Ends when the piece changes hands: {stays.map((l) => l.label).join("; ")}.</p> : null}
          </>
        ) : null}
        {planNote ? (
          <>
            <h2 className="pt-1 text-base font-semibold">Your care plan</h2>
            <p>{planNote}</p>
          </>
        ) : null}
      </Card>
      <Card>
        <ReleaseForm action={action} pieceTitle={piece.title} planNote={planNote} />
      </Card>
    </>
  );
}
