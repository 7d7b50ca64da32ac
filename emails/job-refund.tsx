import { EmailLayout, Note, Paragraph } from "./components/layout";
import { ActionClose, SpelledLink } from "./components/button";
import { RefundRows, type RefundRowText } from "./components/refund-rows";

export type JobRefundEmailProps = {
  ownerName: string;
  studioName: string;
  pieceTitle: string;
  jobTitle: string;
  /** This refund, written out ("$40.00"), when (with its zone) and the studio's reason. */
  amount: string;
  on: string;
  reason: string;
  /** What was paid for the job and what the owner has kept paid after every refund, written out. */
  paid: string;
  kept: string;
  /** Every refund on the job so far, this one included. */
  refunds: RefundRowText[];
  url: string;
  pdfUrl: string;
};

export function jobRefundSubject({ studioName, amount }: Pick<JobRefundEmailProps, "studioName" | "amount">): string {
  return `${studioName} gave back ${amount}`;
}

export function JobRefundEmail({ ownerName, studioName, pieceTitle, jobTitle, amount, on, reason, paid, kept, refunds, url, pdfUrl }: JobRefundEmailProps) {
  return (
    <EmailLayout preview={`${amount} back to your card from ${studioName}`} heading="Money back on your repair">
      <Paragraph>Hi {ownerName},</Paragraph>
      <Paragraph>
        {studioName} gave back <strong>{amount}</strong> of what you paid for “{jobTitle}” on <strong>{pieceTitle}</strong>, on {on}. The work itself stays as it is.
      </Paragraph>
      <Paragraph>Their reason: {reason}</Paragraph>
      <RefundRows refunds={refunds} />
      <Paragraph>
        You paid {paid}; after what was given back, {kept} stays paid.
      </Paragraph>
      <Note>The money goes back to the card you paid with. Banks usually take 5 to 10 days to show it.</Note>
      <ActionClose href={url} label="See the repair" note={<>The receipt lists every refund. A PDF copy is on your job page (sign in first): <SpelledLink href={pdfUrl} /></>} />
    </EmailLayout>
  );
}

// Invented example values for the React Email preview.
JobRefundEmail.PreviewProps = {
  ownerName: "Jonah Reyes",
  studioName: "Larchmere Slab & Resin (invented)",
  pieceTitle: "Cherry writing desk",
  jobTitle: "Repair: crack or gap",
  amount: "$40.00",
  on: "3 December 2026, 14:05 PST",
  reason: "The second drawer's runner was not replaced as quoted.",
  paid: "$207.30",
  kept: "$167.30",
  refunds: [{ amount: "$40.00", on: "3 December 2026, 14:05 PST", why: "The second drawer's runner was not replaced as quoted." }],
  url: "http://localhost:3000/jobs/example",
  pdfUrl: "http://localhost:3000/api/jobs/example/receipt",
} satisfies JobRefundEmailProps;

export default JobRefundEmail;
