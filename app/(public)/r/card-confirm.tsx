import type { User } from "lucia";
import { RegisterButton } from "@/components/owner/register-form";
import { RegisterPanel } from "@/components/owner/register-panel";
import { Notice } from "@/components/ui/notice";
import type { CardLanding } from "@/lib/owner/registration";
import { registerAction } from "../../(owner)/register/actions";

type Found = Extract<CardLanding, { card: unknown }>;

/**
 * Which piece a drawer-card code belongs to, and the one way to register it (RegisterPanel, as the
 * hand-over link does): used where the QR code lands (/r/<code>) and where a code is typed
 * (/register). `here` is where sign-up and e-mail confirmation come back to.
 */
export function CardConfirm({ found, user, here }: { found: Found; user: Pick<User, "email" | "emailVerifiedAt"> | null; here: string }) {
  return (
    <RegisterPanel
      piece={found.card}
      heading="h2"
      detail={
        <p className="rounded-lg bg-paper px-3 py-2 text-center font-mono text-lg tracking-wider" aria-label="Registration code">
          {found.code}
        </p>
      }
      here={here}
      user={user}
      state={
        found.state === "available"
          ? {
              kind: "open",
              signUpLead: "Register this piece to get its care schedule, a care guide written for its finish, reminders when care is due, and its warranty.",
              ready: (
                <>
                  <p>
                    Is this your piece? Signed in as <span className="break-all">{user?.email}</span>, one tap puts it on your account.
                  </p>
                  <RegisterButton action={registerAction} code={found.code} />
                </>
              ),
            }
          : found.state === "yours"
            ? { kind: "yours", pieceId: found.pieceId, note: "It is already registered to your account." }
            : {
                kind: "closed",
                notice: (
                  <Notice tone="warn" title="Already registered">
                    {found.message}
                  </Notice>
                ),
              }
      }
    />
  );
}
