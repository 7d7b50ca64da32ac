import type { Metadata } from "next";
import Link from "next/link";
import { HandoverRegisterButton } from "@/components/owner/register-form";
import { RegisterPanel } from "@/components/owner/register-panel";
import { ButtonLink } from "@/components/ui/button";
import { Card } from "@/components/ui/card";
import { Notice } from "@/components/ui/notice";
import { getCurrentSession } from "@/lib/auth/session";
import { openHandover } from "@/lib/pieces/handover";
import { registerByHandoverAction } from "./actions";
import { signOutAction } from "@/app/actions/session";
import { Button } from "@/components/ui/button";

export const metadata: Metadata = { title: "Your new piece", robots: { index: false } };

// The hand-over mail's link opens /hand-over/<token>. Opening it registers nothing (mail scanners open
// links too); the button does, once the buyer is signed in with the address the mail went to. Signing
// up or in keeps the link through e-mail confirmation (the `next` link comes back here).
export default async function HandoverPage({ params }: { params: Promise<{ token: string }> }) {
  const { token: raw } = await params;
  const token = decodeURIComponent(raw).slice(0, 100);
  const { user } = await getCurrentSession();
  const landing = openHandover(token, user);
  const here = `/hand-over/${encodeURIComponent(token)}`;

  if (landing.state === "unknown") {
    return (
      <div className="mx-auto max-w-md px-4 py-8">
        <Card className="space-y-4">
          <h1 className="font-display text-2xl font-semibold">This link doesn&apos;t work</h1>
          <Notice tone="error" title="Unknown link">
            It may have been replaced by a newer mail from the studio. Open the newest mail, or register with the code on the card in the piece&apos;s drawer.
          </Notice>
          <ButtonLink href="/register" variant="secondary" className="w-full">
            Type the code from the card
          </ButtonLink>
        </Card>
      </div>
    );
  }

  const wrongAccount = user && user.email.toLowerCase() !== landing.email.toLowerCase();
  const closed =
    landing.state === "taken" ? (
      <Notice tone="warn" title="Already registered">
        This link has been used and the piece is registered. If that wasn&apos;t you, ask {landing.studioName}.
      </Notice>
    ) : landing.state === "expired" ? (
      <Notice tone="warn" title="This link has expired">
        Ask {landing.studioName} to send the mail again, or <Link className="underline" href="/register">type the code from the drawer card</Link>.
      </Notice>
    ) : wrongAccount ? (
      <Notice tone="warn" title="Signed in with another address">
        This link was sent to <span className="break-all">{landing.email}</span>; you are signed in as <span className="break-all">{user.email}</span>. Sign out and sign in (or sign up) with {landing.email} to register the piece, or type the code from the drawer card.
        {/* Signing out from the header lost this link; this comes back to it after signing in. */}
        <form action={signOutAction} className="mt-3">
          <input type="hidden" name="next" value={here} />
          <Button type="submit" variant="secondary" className="w-full">
            Sign out, then use this link
          </Button>
        </form>
      </Notice>
    ) : null;
  return (
    <div className="mx-auto max-w-md px-4 py-8">
      <Card>
        <RegisterPanel
          piece={landing}
          heading="h1"
          here={here}
          user={user}
          state={
            landing.state === "yours"
              ? { kind: "yours", pieceId: landing.pieceId, note: "It is registered to your account." }
              : closed
                ? { kind: "closed", notice: closed }
                : {
                    kind: "open",
                    signUpLead: (
                      <>
                        Register this piece to get its care schedule, reminders when care is due, and its warranty. Use <span className="break-all font-medium">{landing.email}</span>, the address this mail went to — no code to type.
                      </>
                    ),
                    ready: (
                      <>
                        <p>
                          Signed in as <span className="break-all">{user?.email}</span>. One tap puts this piece on your account.
                        </p>
                        <HandoverRegisterButton action={registerByHandoverAction} token={token} />
                      </>
                    ),
                  }
          }
        />
      </Card>
    </div>
  );
}
