import type { Metadata } from "next";
import Link from "next/link";
import { ArrowRight, KeyRound } from "lucide-react";
import { RegisterButton } from "@/components/owner/register-form";
import { ButtonLink } from "@/components/ui/button";
import { Card } from "@/components/ui/card";
import { Notice } from "@/components/ui/notice";
import { clientIp, getCurrentSession } from "@/lib/auth/session";
import { lookupCard } from "@/lib/owner/registration";
import { registerAction } from "../../../(owner)/register/actions";

export const metadata: Metadata = { title: "Your piece's card", robots: { index: false } };

// The drawer card's QR code opens /r/<code>. Anyone holding the card sees only the studio, the
// piece's title and kind and its delivery month; registering keeps the code through sign-up and
// e-mail confirmation (the `next` link comes back here).
export default async function CardLandingPage({ params }: { params: Promise<{ code: string }> }) {
  const { code: raw } = await params;
  const typed = decodeURIComponent(raw).slice(0, 40);
  const { user } = await getCurrentSession();
  const card = await lookupCard(typed, await clientIp(), user);
  const here = `/r/${encodeURIComponent(card.code)}`;

  return (
    <div className="mx-auto max-w-md px-4 py-8">
      {"card" in card ? (
        <Card className="space-y-5">
          <div className="space-y-1">
            <p className="text-sm font-medium text-muted">{card.card.studioName}</p>
            <h1 className="font-display text-2xl font-semibold leading-tight">{card.card.title}</h1>
            <p className="text-muted">
              {card.card.kindLabel} · delivered {card.card.deliveredMonth}
            </p>
          </div>
          <p className="rounded-lg bg-paper px-3 py-2 text-center font-mono text-lg tracking-wider" aria-label="Registration code">
            {card.code}
          </p>
          {card.state === "available" ? (
            !user ? (
              <div className="space-y-3">
                <p>Register this piece to get its care schedule, a care guide written for its finish, reminders when care is due, and its warranty.</p>
                <ButtonLink href={`/sign-up?next=${encodeURIComponent(here)}`} className="w-full">
                  Create an account and register
                  <ArrowRight aria-hidden className="size-4" />
                </ButtonLink>
                <ButtonLink href={`/sign-in?next=${encodeURIComponent(here)}`} variant="secondary" className="w-full">
                  I have an account — sign in
                </ButtonLink>
              </div>
            ) : !user.emailVerifiedAt ? (
              <Notice tone="warn" title="Confirm your e-mail first">
                Open the link we sent to <span className="break-all">{user.email}</span>; it brings you back here to register. <Link className="underline" href={`/verify-email/sent?next=${encodeURIComponent(here)}`}>Need a new link?</Link>
              </Notice>
            ) : (
              <div className="space-y-3">
                <p>Signed in as <span className="break-all">{user.email}</span>. One tap puts this piece on your account.</p>
                <RegisterButton action={registerAction} code={card.code} />
              </div>
            )
          ) : card.state === "yours" ? (
            <div className="space-y-3">
              <Notice tone="ok" title="This piece is yours">
                It is already registered to your account.
              </Notice>
              <ButtonLink href={`/pieces/${card.pieceId}`} className="w-full">
                Open its care plan
                <ArrowRight aria-hidden className="size-4" />
              </ButtonLink>
            </div>
          ) : (
            <Notice tone="warn" title="Already registered">
              {card.message}
            </Notice>
          )}
        </Card>
      ) : (
        <Card className="space-y-4">
          <h1 className="font-display text-2xl font-semibold">Check the code</h1>
          <Notice tone={card.state === "rate_limited" ? "warn" : "error"} title={card.state === "typo" ? "That code has a typo" : card.state === "unknown" ? "Unknown code" : card.state === "rate_limited" ? "Too many tries" : "Not a registration code"}>
            {card.message}
          </Notice>
          <ButtonLink href={`/register?code=${encodeURIComponent(card.code)}`} variant="secondary" className="w-full">
            <KeyRound aria-hidden className="size-4" />
            Type the code from the card
          </ButtonLink>
        </Card>
      )}
    </div>
  );
}
