import type { Metadata } from "next";
import { Button } from "@/components/ui/button";
import { Card } from "@/components/ui/card";
import { Notice } from "@/components/ui/notice";
import { SpriteIcon } from "@/components/ui/sprite-icon";
import type { SpriteIconName } from "@/components/ui/sprite-names";
import { isAppError } from "@/lib/errors";
import { getOfferByToken } from "@/lib/reminders/offers";
import { acceptOfferAction } from "./actions";

export const metadata: Metadata = { title: "Refresh visit offer", robots: { index: false } };
export const dynamic = "force-dynamic";

const STATE: Record<"offered" | "accepted" | "declined" | "expired", { icon: SpriteIconName; word: string }> = {
  offered: { icon: "hourglass", word: "Open" },
  accepted: { icon: "calendar-check", word: "Accepted" },
  declined: { icon: "circle-slash", word: "Declined" },
  expired: { icon: "circle-slash", word: "No longer open" },
};

function load(token: string) {
  try {
    return { offer: getOfferByToken(token) };
  } catch (e) {
    if (isAppError(e)) return { error: e.message };
    throw e;
  }
}

export default async function OfferPage({ params, searchParams }: { params: Promise<{ token: string }>; searchParams: Promise<Record<string, string | string[] | undefined>> }) {
  const { token } = await params;
  const { result } = await searchParams;
  const { offer, error } = load(decodeURIComponent(token));
  if (!offer) {
    return (
      <div className="mx-auto max-w-xl px-4 py-10 sm:py-16">
        <h1 className="mb-4 font-display text-3xl font-semibold tracking-tight">Refresh visit offer</h1>
        <Notice tone="error" title="This link doesn't work">{error}</Notice>
      </div>
    );
  }
  const { icon, word } = STATE[offer.status];
  return (
    <div className="mx-auto max-w-xl space-y-4 px-4 py-10 sm:py-16">
      <h1 className="font-display text-3xl font-semibold tracking-tight">Refresh visit offer</h1>
      {result === "closed" ? <Notice tone="warn" title="This offer is no longer open">The care it was for has moved on. The studio can send you a new one.</Notice> : null}
      {offer.status === "accepted" ? (
        <Notice tone="ok" title="Offer accepted">
          Thank you. {offer.studioName} will be in touch to book a visit{offer.studioEmail ? <> (or write to {offer.studioEmail})</> : null}. Nothing is charged now.
        </Notice>
      ) : null}
      <Card className="space-y-3">
        <p className="flex items-center gap-2 text-sm font-medium">
          <SpriteIcon name={icon} className="size-4" /> {word}
        </p>
        <p>
          {offer.studioName} offers to do the <strong>{offer.taskLabel.toLowerCase()}</strong> of your <strong>{offer.pieceTitle}</strong> at your home,
          for <strong>{offer.total}</strong> including travel and tax.
        </p>
        <table className="w-full text-sm">
          <caption className="sr-only">Price</caption>
          <tbody>
            {offer.lines.map((l) => (
              <tr key={l.description} className="border-b border-line">
                <th scope="row" className="py-1.5 text-left font-normal text-muted">{l.description}</th>
                <td className="py-1.5 text-right tabular-nums">{l.amount}</td>
              </tr>
            ))}
            <tr className="border-b border-line">
              <th scope="row" className="py-1.5 text-left font-normal text-muted">Tax</th>
              <td className="py-1.5 text-right tabular-nums">{offer.tax}</td>
            </tr>
            <tr>
              <th scope="row" className="py-1.5 text-left font-semibold">Total</th>
              <td className="py-1.5 text-right font-semibold tabular-nums">{offer.total}</td>
            </tr>
          </tbody>
        </table>
        {offer.status === "offered" ? (
          <form action={acceptOfferAction} className="space-y-2">
            <input type="hidden" name="token" value={decodeURIComponent(token)} />
            <Button type="submit">Accept the refresh offer</Button>
            <p className="text-sm text-muted">Accepting asks the studio to get in touch and book a visit with you. Nothing is charged now.</p>
          </form>
        ) : null}
      </Card>
    </div>
  );
}
