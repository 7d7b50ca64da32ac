import type { Metadata } from "next";
import { ButtonLink } from "@/components/ui/button";
import { Card } from "@/components/ui/card";
import { Notice } from "@/components/ui/notice";
import { SpriteIcon } from "@/components/ui/sprite-icon";
import { clientIp, getCurrentSession } from "@/lib/auth/session";
import { lookupCard } from "@/lib/owner/registration";
import { CardConfirm } from "../card-confirm";

export const metadata: Metadata = { title: "Your piece's card", robots: { index: false } };

// The drawer card's QR code opens /r/<code>. Anyone holding the card sees only the studio, the
// piece's title and kind and its delivery month; registering keeps the code through sign-up and
// e-mail confirmation (the `next` link comes back here).
export default async function CardLandingPage({ params }: { params: Promise<{ code: string }> }) {
  const { code: raw } = await params;
  const typed = decodeURIComponent(raw).slice(0, 40);
  const { user } = await getCurrentSession();
  const card = await lookupCard(typed, await clientIp(), user);

  return (
    <div className="mx-auto max-w-md px-4 py-8">
      {"card" in card ? (
        <Card>
          <h1 className="sr-only">Your piece&apos;s card</h1>
          <CardConfirm found={card} user={user} here={`/r/${encodeURIComponent(card.code)}`} />
        </Card>
      ) : (
        <Card className="space-y-4">
          <h1 className="font-display text-2xl font-semibold">Check the code</h1>
          <Notice tone={card.state === "rate_limited" ? "warn" : "error"} title={card.state === "typo" ? "That code has a typo" : card.state === "unknown" ? "Unknown code" : card.state === "rate_limited" ? "Too many tries" : "Not a registration code"}>
            {card.message}
          </Notice>
          <ButtonLink href={`/register?code=${encodeURIComponent(card.code)}`} variant="secondary" className="w-full">
            <SpriteIcon name="key-round" className="size-4" />
            Type the code from the card
          </ButtonLink>
        </Card>
      )}
    </div>
  );
}
