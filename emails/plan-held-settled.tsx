import { EmailLayout, Paragraph } from "./components/layout";
import { ActionClose } from "./components/button";
import { AskStudioForHelp, PLAN_MAIL_PREVIEW_NAMES, type PlanMailNames } from "./components/plan-mail";

export type PlanHeldSettledEmailProps = PlanMailNames & {
  /** What the renewal charged, already written out ("$150.00"). */
  charged: string;
  /** The plan's price, already written out ("$120.00"). */
  price: string;
  /** What the studio decided: keep the payment as charged, pay back the part above the price, or pay it all back and end the plan. */
  decision: "accept" | "refund_difference" | "refund_and_end";
  /** The money paid back, already written out ("$30.00"); null when nothing is paid back. */
  refund: string | null;
  /** The plan's next renewal (or, when it ended, the day it ended), already written out with its zone ("3 December 2027 (Central Time (Chicago))"). */
  nextOn: string;
  url: string;
};

export function planHeldSettledSubject({ planName, decision }: Pick<PlanHeldSettledEmailProps, "planName" | "decision">): string {
  return decision === "refund_and_end" ? `Your renewal is paid back and your care plan has ended — ${planName}` : `Your care plan renewal is settled — ${planName}`;
}

export function PlanHeldSettledEmail({ ownerName, studioName, planName, pieceTitle, charged, price, decision, refund, nextOn, url }: PlanHeldSettledEmailProps) {
  const decided =
    decision === "accept"
      ? `${studioName} has kept the ${charged} as the payment for this renewal.`
      : decision === "refund_difference"
        ? `${studioName} has kept the plan's ${price} as the payment for this renewal and is paying back the ${refund} above it.`
        : `${studioName} is paying the whole ${charged} back, and the plan isn't renewed.`;
  const next = decision === "refund_and_end" ? `The plan ended on ${nextOn}. Your piece keeps ${studioName}'s standard warranty.` : `Your plan keeps covering your piece; its next renewal is on ${nextOn}.`;
  return (
    <EmailLayout preview={refund ? `${planName}: ${refund} back to you.` : `${planName}: your renewal of ${charged} is settled.`} heading={decision === "refund_and_end" ? "Your renewal is paid back" : "Your care plan renewal is settled"}>
      <Paragraph>
        Hello {ownerName}, the renewal of the {planName} care plan on your {pieceTitle} charged {charged}, while the plan costs {price}. {decided}
      </Paragraph>
      {refund ? <Paragraph>{refund} is on its way back to the card you paid with. Banks usually take 5 to 10 days to show it.</Paragraph> : null}
      <Paragraph>{next}</Paragraph>
      <ActionClose href={url} label="See your piece and plan" note={<AskStudioForHelp studioName={studioName} />} />
    </EmailLayout>
  );
}

// Invented example values for the React Email preview.
PlanHeldSettledEmail.PreviewProps = {
  ...PLAN_MAIL_PREVIEW_NAMES,
  charged: "$150.00",
  price: "$120.00",
  decision: "refund_difference",
  refund: "$30.00",
  nextOn: "3 December 2027 (Pacific Time (Los Angeles))",
  url: "https://grainward.example/pieces/00000000-0000-4000-8000-000000000000",
} satisfies PlanHeldSettledEmailProps;

export default PlanHeldSettledEmail;
