import { EmailLayout, Paragraph } from "./components/layout";
import { ActionClose } from "./components/button";
import { AskStudioForHelp, PLAN_MAIL_PREVIEW_NAMES, type PlanMailNames } from "./components/plan-mail";

export type PlanEndedEmailProps = PlanMailNames & {
  /** Cancelled by the owner or the studio, or ended because the piece changed hands. */
  reason: "cancelled" | "changed_hands";
  /** The day the plan stops covering, already written out with its zone ("14 January 2027 (Central European Time (Berlin))"). */
  endsOn: string;
  /** The money paid back, already written out ("$90.00"); null when nothing is paid back. */
  refund: string | null;
  /** The studio pays the refund back itself (the plan was paid by other means). */
  refundByOtherMeans: boolean;
  /** Whole unused months the refund is for. */
  months: number;
  /** The piece's page; the owner's list of pieces when the piece changed hands (it is no longer theirs). */
  url: string;
};

export function planEndedSubject({ planName, reason }: Pick<PlanEndedEmailProps, "planName" | "reason">): string {
  return reason === "changed_hands" ? `Your care plan has ended with the piece's new owner — ${planName}` : `Your care plan is cancelled — ${planName}`;
}

const monthsWord = (n: number) => (n === 1 ? "one unused month" : `${n} unused months`);

export function PlanEndedEmail({ ownerName, studioName, planName, pieceTitle, reason, endsOn, refund, refundByOtherMeans, months, url }: PlanEndedEmailProps) {
  const ends =
    reason === "changed_hands"
      ? `as your ${pieceTitle} has passed to a new owner, the ${planName} care plan on it ended on ${endsOn}.`
      : `the ${planName} care plan on your ${pieceTitle} is cancelled. It keeps working until ${endsOn} and isn't renewed after that.`;
  return (
    <EmailLayout
      preview={refund ? `${planName}: ${refund} back to you.` : `${planName} ends on ${endsOn}.`}
      heading={reason === "changed_hands" ? "Your care plan has ended" : "Your care plan is cancelled"}
    >
      <Paragraph>
        Hello {ownerName}, {ends}
      </Paragraph>
      {refund ? (
        <Paragraph>
          {refundByOtherMeans
            ? `${studioName} will pay you back ${refund} for ${monthsWord(months)}, the same way you paid for the plan.`
            : `${refund} for ${monthsWord(months)} is on its way back to the card you paid with. Banks usually take 5 to 10 days to show it.`}
        </Paragraph>
      ) : (
        <Paragraph>Under {studioName}&apos;s terms for this plan, nothing is paid back.</Paragraph>
      )}
      <ActionClose href={url} label={reason === "changed_hands" ? "See your pieces" : "See your piece"} note={<AskStudioForHelp studioName={studioName} />} />
    </EmailLayout>
  );
}

// Invented example values for the React Email preview.
PlanEndedEmail.PreviewProps = {
  ...PLAN_MAIL_PREVIEW_NAMES,
  reason: "cancelled",
  endsOn: "14 January 2027 (Pacific Time (Los Angeles))",
  refund: "$99.00",
  refundByOtherMeans: false,
  months: 9,
  url: "https://grainward.example/pieces/00000000-0000-4000-8000-000000000000",
} satisfies PlanEndedEmailProps;

export default PlanEndedEmail;
