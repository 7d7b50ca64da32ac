import { EmailLayout, Paragraph } from "./components/layout";
import { ActionClose } from "./components/button";
import { AskStudioForHelp, PLAN_MAIL_PREVIEW_NAMES, type PlanMailNames } from "./components/plan-mail";

export type PlanRenewalHeldEmailProps = PlanMailNames & {
  /** What the renewal charged, already written out ("$150.00"). */
  charged: string;
  /** The plan's price, already written out ("$120.00"). */
  price: string;
  /** When it was charged, already written out with its zone ("3 December 2026, 14:05 PST"). */
  paidOn: string;
  url: string;
};

export function planRenewalHeldSubject({ planName }: Pick<PlanRenewalHeldEmailProps, "planName">): string {
  return `Your care plan renewal payment is being checked — ${planName}`;
}

/**
 * To the owner when a renewal was charged at another amount than the plan's price (lib/plans/held.ts):
 * the studio checks it before the new period starts. The decision comes in emails/plan-held-settled.tsx.
 */
export function PlanRenewalHeldEmail({ ownerName, studioName, planName, pieceTitle, charged, price, paidOn, url }: PlanRenewalHeldEmailProps) {
  return (
    <EmailLayout preview={`${planName}: your renewal of ${charged} is being checked by ${studioName}.`} heading="Your renewal payment is being checked">
      <Paragraph>
        Hello {ownerName}, the renewal of the {planName} care plan on your {pieceTitle} charged {charged} on {paidOn}, while the plan costs {price}.
      </Paragraph>
      <Paragraph>
        {studioName} is checking it and will either keep it as this renewal&apos;s payment or pay back what isn&apos;t owed. You&apos;ll get another e-mail when they have
        decided. Your plan keeps covering your piece meanwhile, and nothing more is charged.
      </Paragraph>
      <ActionClose href={url} label="See your piece and plan" note={<AskStudioForHelp studioName={studioName} />} />
    </EmailLayout>
  );
}

// Invented example values for the React Email preview.
PlanRenewalHeldEmail.PreviewProps = {
  ...PLAN_MAIL_PREVIEW_NAMES,
  charged: "$150.00",
  price: "$120.00",
  paidOn: "3 December 2026 at 14:05 PST",
  url: "https://grainward.example/pieces/00000000-0000-4000-8000-000000000000",
} satisfies PlanRenewalHeldEmailProps;

export default PlanRenewalHeldEmail;
