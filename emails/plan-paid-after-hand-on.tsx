import { EmailLayout, Note, Paragraph } from "./components/layout";
import { AskStudioForHelp, PLAN_MAIL_PREVIEW_NAMES, type PlanMailNames } from "./components/plan-mail";

export type PlanPaidAfterHandOnEmailProps = PlanMailNames & {
  /**
   * "held": the payment has just come in and is held; "paid_back": the studio has paid it all back;
   * "renewal_paid_back": a renewal charged for a period after the plan's end was paid back at once;
   * "covered_paid_back": the first payment of a plan for a piece already under another plan, paid back at once.
   */
  stage: "held" | "paid_back" | "renewal_paid_back" | "covered_paid_back";
  /** What was paid, already written out ("$120.00"). */
  amount: string;
  /** When it was paid, already written out with its zone ("3 December 2026, 14:05 PST"). */
  paidOn: string;
};

export function planPaidAfterHandOnSubject({ stage, planName }: Pick<PlanPaidAfterHandOnEmailProps, "stage" | "planName">): string {
  return stage === "held" ? `Your care plan payment is held — ${planName}` : `Your care plan payment is on its way back — ${planName}`;
}

/**
 * To the person who paid for a care plan after handing its piece on (lib/plans/held.ts): the plan can't
 * start for a piece they no longer hold, so the payment is held, then paid back by the studio. Also to
 * one charged for a renewal after the plan's end, or for a plan whose piece another plan already covered,
 * which is paid back at once (lib/plans/stripe-sync.ts).
 */
export function PlanPaidAfterHandOnEmail({ ownerName, studioName, planName, pieceTitle, stage, amount, paidOn }: PlanPaidAfterHandOnEmailProps) {
  return (
    <EmailLayout
      preview={stage === "held" ? `${amount} held: ${planName} can't start for a piece you handed on.` : `${amount} back to your card from ${studioName}.`}
      heading={stage === "held" ? "Your payment is held" : "Your payment is on its way back"}
    >
      <Paragraph>Hello {ownerName},</Paragraph>
      {stage === "held" ? (
        <>
          <Paragraph>
            You paid <strong>{amount}</strong> on {paidOn} for the {planName} care plan on your {pieceTitle}. The payment came in after you had handed the piece on, and a care
            plan only covers a piece its buyer still holds, so this plan hasn&apos;t started.
          </Paragraph>
          <Paragraph>
            {studioName} holds the payment and will pay it back to the card you paid with. You&apos;ll get another e-mail when they do. Nothing more will be charged for this plan.
          </Paragraph>
        </>
      ) : stage === "covered_paid_back" ? (
        <>
          <Paragraph>
            Your card was charged <strong>{amount}</strong> on {paidOn} for the {planName} care plan on your {pieceTitle}. The piece was already under a care plan by then,
            so this one didn&apos;t start, and {studioName} has paid it all back. Nothing more will be charged for it.
          </Paragraph>
          <Paragraph>Banks usually take 5 to 10 days to show the money back on your statement.</Paragraph>
        </>
      ) : stage === "renewal_paid_back" ? (
        <>
          <Paragraph>
            Your card was charged <strong>{amount}</strong> on {paidOn} to renew the {planName} care plan on your {pieceTitle}. The plan had already been set to end before
            that renewal, so nothing was owed for it, and {studioName} has paid it all back. Nothing more will be charged for this plan.
          </Paragraph>
          <Paragraph>Banks usually take 5 to 10 days to show the money back on your statement.</Paragraph>
        </>
      ) : (
        <>
          <Paragraph>
            {studioName} has paid back the <strong>{amount}</strong> you paid on {paidOn} for the {planName} care plan on your {pieceTitle}. The plan never started, since the piece
            had been handed on, and it is now closed. Nothing more will be charged for it.
          </Paragraph>
          <Paragraph>Banks usually take 5 to 10 days to show the money back on your statement.</Paragraph>
        </>
      )}
      <Note>
        <AskStudioForHelp studioName={studioName} />
      </Note>
    </EmailLayout>
  );
}

// Invented example values for the React Email preview.
PlanPaidAfterHandOnEmail.PreviewProps = {
  ...PLAN_MAIL_PREVIEW_NAMES,
  stage: "held",
  amount: "$120.00",
  paidOn: "3 December 2026 at 14:05 PST",
} satisfies PlanPaidAfterHandOnEmailProps;

export default PlanPaidAfterHandOnEmail;
