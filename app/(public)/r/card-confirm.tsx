import Link from "next/link";
import { ArrowRight } from "lucide-react";
import type { User } from "lucia";
import { RegisterButton } from "@/components/owner/register-form";
import { ButtonLink } from "@/components/ui/button";
import { Notice } from "@/components/ui/notice";
import type { CardLanding } from "@/lib/owner/registration";
import { registerAction } from "../../(owner)/register/actions";

type Found = Extract<CardLanding, { card: unknown }>;

/**
 * Which piece a drawer-card code belongs to, and the one way to register it: used where the QR code
 * lands (/r/<code>) and where a code is typed (/register). `here` is where sign-up and e-mail
 * confirmation come back to.
 */
export function CardConfirm({ found, user, here }: { found: Found; user: Pick<User, "email" | "emailVerifiedAt"> | null; here: string }) {
  return (
    <div className="space-y-5">
      <div className="space-y-1">
        <p className="text-sm font-medium text-muted">{found.card.studioName}</p>
        <h2 className="font-display text-2xl font-semibold leading-tight">{found.card.title}</h2>
        <p className="text-muted">
          {found.card.kindLabel} · delivered {found.card.deliveredMonth}
        </p>
      </div>
      <p className="rounded-lg bg-paper px-3 py-2 text-center font-mono text-lg tracking-wider" aria-label="Registration code">
        {found.code}
      </p>
      {found.state === "available" ? (
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
            Open the link we sent to <span className="break-all">{user.email}</span>; it brings you back here to register.{" "}
            <Link className="underline" href={`/verify-email/sent?next=${encodeURIComponent(here)}`}>
              Need a new link?
            </Link>
          </Notice>
        ) : (
          <div className="space-y-3">
            <p>
              Is this your piece? Signed in as <span className="break-all">{user.email}</span>, one tap puts it on your account.
            </p>
            <RegisterButton action={registerAction} code={found.code} />
          </div>
        )
      ) : found.state === "yours" ? (
        <div className="space-y-3">
          <Notice tone="ok" title="This piece is yours">
            It is already registered to your account.
          </Notice>
          <ButtonLink href={`/pieces/${found.pieceId}`} className="w-full">
            Open its care plan
            <ArrowRight aria-hidden className="size-4" />
          </ButtonLink>
        </div>
      ) : (
        <Notice tone="warn" title="Already registered">
          {found.message}
        </Notice>
      )}
    </div>
  );
}
