import { EmailLayout, Note, Paragraph } from "./components/layout";

export type RefundIssuedEmailProps = {
  ownerName: string;
  studioName: string;
  pieceTitle: string;
  amount: string;
  /** The job the money was paid for, by its title; and whether the studio cancelled it (else the work stands). */
  jobTitle: string;
  cancelled: boolean;
};

export function RefundIssuedEmail({ ownerName, studioName, pieceTitle, amount, jobTitle, cancelled }: RefundIssuedEmailProps) {
  return (
    <EmailLayout preview={`Refund of ${amount} from ${studioName}`} heading="Your refund is on its way">
      <Paragraph>Hi {ownerName},</Paragraph>
      <Paragraph>
        {cancelled ? (
          <>
            {studioName} cancelled the work on <strong>{pieceTitle}</strong> and refunded <strong>{amount}</strong> to the card you paid with.
          </>
        ) : (
          <>
            {studioName} refunded <strong>{amount}</strong> of your payment for “{jobTitle}” on <strong>{pieceTitle}</strong> to the card you paid with.
          </>
        )}
      </Paragraph>
      <Note>Refunds usually show on your statement within 5–10 business days, depending on your bank.</Note>
    </EmailLayout>
  );
}

RefundIssuedEmail.PreviewProps = { ownerName: "Jonah Reyes", studioName: "Larchmere Slab & Resin (invented)", pieceTitle: "Cherry writing desk", amount: "$92.23", jobTitle: "Repair: crack or gap", cancelled: true } satisfies RefundIssuedEmailProps;

export default RefundIssuedEmail;
