import { EmailLayout, Paragraph } from "./components/layout";
import { ActionClose } from "./components/button";
import { AskStudioForHelp, PLAN_MAIL_PREVIEW_NAMES, type PlanMailNames } from "./components/plan-mail";

export type PlanGraceEmailProps = PlanMailNames & {
  /** The renewal amount, already written out ("$132.00"). */
  amount: string;
  /** The last day of the grace period, already written out ("17 December 2026"). */
  graceEndsOn: string;
  /** The owner's piece page, where the plan and its payment are shown. */
  url: string;
};

export function planGraceSubject({ planName }: Pick<PlanGraceEmailProps, "planName">): string {
  return `Your care plan payment didn't go through — ${planName}`;
}

export function PlanGraceEmail({ ownerName, studioName, planName, pieceTitle, amount, graceEndsOn, url }: PlanGraceEmailProps) {
  return (
    <EmailLayout preview={`The renewal of ${planName} (${amount}) didn't go through.`} heading="Your care plan renewal didn't go through">
      <Paragraph>
        Hello {ownerName}, the renewal payment of {amount} for the {planName} care plan on your {pieceTitle} didn&apos;t go through.
      </Paragraph>
      <Paragraph>
        Your plan keeps working until {graceEndsOn} while the payment is tried again. If it still can&apos;t be paid by then, the plan
        ends: included visits stop and the warranty goes back to {studioName}&apos;s standard terms from that day.
      </Paragraph>
      <ActionClose
        href={url}
        label="See your piece and plan"
        note={
          <>
            Nothing else changes on your piece record. <AskStudioForHelp studioName={studioName} />
          </>
        }
      />
    </EmailLayout>
  );
}

// Invented example values for the React Email preview.
PlanGraceEmail.PreviewProps = {
  ...PLAN_MAIL_PREVIEW_NAMES,
  amount: "$132.00",
  graceEndsOn: "17 December 2026",
  url: "https://grainward.example/pieces/00000000-0000-4000-8000-000000000000",
} satisfies PlanGraceEmailProps;

export default PlanGraceEmail;
