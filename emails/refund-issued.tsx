import { EmailLayout, Note, Paragraph } from "./components/layout";

export type RefundIssuedEmailProps = { ownerName: string; studioName: string; pieceTitle: string; amount: string };

export function RefundIssuedEmail({ ownerName, studioName, pieceTitle, amount }: RefundIssuedEmailProps) {
  return (
    <EmailLayout preview={`Refund of ${amount} from ${studioName}`} heading="Your refund is on its way">
      <Paragraph>Hi {ownerName},</Paragraph>
      <Paragraph>
        {studioName} cancelled the work on <strong>{pieceTitle}</strong> and refunded <strong>{amount}</strong> to the card you paid with.
      </Paragraph>
      <Note>Refunds usually show on your statement within 5–10 business days, depending on your bank.</Note>
    </EmailLayout>
  );
}

RefundIssuedEmail.PreviewProps = { ownerName: "Jonah Reyes", studioName: "Larchmere Slab & Resin (invented)", pieceTitle: "Cherry writing desk", amount: "$92.23" } satisfies RefundIssuedEmailProps;

export default RefundIssuedEmail;
