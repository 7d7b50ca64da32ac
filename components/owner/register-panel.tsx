import type { ReactNode } from "react";
import Link from "next/link";
import type { User } from "lucia";
import { ButtonLink } from "@/components/ui/button";
import { Notice } from "@/components/ui/notice";
import { SpriteIcon } from "@/components/ui/sprite-icon";

export type RegisterPanelPiece = { studioName: string; title: string; kindLabel: string; deliveredMonth: string };

type Props = {
  piece: RegisterPanelPiece;
  /** The page's own h1 (the hand-over link) or a heading under a hidden one (the drawer card). */
  heading: "h1" | "h2";
  /** Shown under the piece (the drawer card's code). */
  detail?: ReactNode;
  /** Where sign-up, sign-in and e-mail confirmation come back to. */
  here: string;
  user: Pick<User, "email" | "emailVerifiedAt"> | null;
  /** "yours": registered to this account; "open": can be registered here; otherwise why not (a notice). */
  state: { kind: "yours"; pieceId: string | null; note: string } | { kind: "open"; signUpLead: ReactNode; ready: ReactNode } | { kind: "closed"; notice: ReactNode };
};

/**
 * The one way a buyer registers a piece they are looking at, wherever they came from: the drawer
 * card's QR code or typed code (/r/<code>, /register) and the hand-over mail's link
 * (/hand-over/<token>). The piece as the studio delivered it, then the step they are at: sign up or
 * sign in, confirm their e-mail, one tap to register — or that it is theirs already, or why it can't be.
 */
export function RegisterPanel({ piece, heading: Heading, detail, here, user, state }: Props) {
  return (
    <div className="space-y-5">
      <div className="space-y-1">
        <p className="text-sm font-medium text-muted">{piece.studioName}</p>
        <Heading className="font-display text-2xl font-semibold leading-tight">{piece.title}</Heading>
        <p className="text-muted">
          {piece.kindLabel} · delivered {piece.deliveredMonth}
        </p>
      </div>
      {detail}
      {state.kind === "yours" ? (
        <div className="space-y-3">
          <Notice tone="ok" title="This piece is yours">
            {state.note}
          </Notice>
          <ButtonLink href={`/pieces/${state.pieceId}`} className="w-full">
            {/* Not "its care plan": a care plan is something the owner buys (components/plans). */}
            Open the piece
            <SpriteIcon name="arrow-right" className="size-4" />
          </ButtonLink>
        </div>
      ) : state.kind === "closed" ? (
        state.notice
      ) : !user ? (
        <div className="space-y-3">
          <p>{state.signUpLead}</p>
          <ButtonLink href={`/sign-up?next=${encodeURIComponent(here)}`} className="w-full">
            Create an account and register
            <SpriteIcon name="arrow-right" className="size-4" />
          </ButtonLink>
          <ButtonLink href={`/sign-in?next=${encodeURIComponent(here)}`} variant="secondary" className="w-full">
            I have an account — sign in
          </ButtonLink>
        </div>
      ) : !user.emailVerifiedAt ? (
        <Notice tone="warn" title="Confirm your e-mail first">
          Open the link we sent to <span className="break-all">{user.email}</span>; it brings you back here to register.{" "}
          <Link className="underline" href={`/verify-email/sent?next=${encodeURIComponent(here)}`}>
            Need a new link?
          </Link>
        </Notice>
      ) : (
        <div className="space-y-3">{state.ready}</div>
      )}
    </div>
  );
}
