import { EmailLayout, Note, Paragraph } from "./components/layout";
import { ActionButton } from "./components/button";

export type PaymentReceiptEmailProps = { ownerName: string; studioName: string; pieceTitle: string; amount: string; paidOn: string; reference: string; url: string };

export function PaymentReceiptEmail({ ownerName, studioName, pieceTitle, amount, paidOn, reference, url }: PaymentReceiptEmailProps) {
  return (
    <EmailLayout preview={`Receipt: ${amount} paid to ${studioName}`} heading="Payment received">
      <Paragraph>Hi {ownerName},</Paragraph>
      <Paragraph>
        Thank you — {studioName} received <strong>{amount}</strong> on {paidOn} for the work on <strong>{pieceTitle}</strong>.
      </Paragraph>
      <Paragraph>Payment reference: {reference}</Paragraph>
      <ActionButton href={url}>Book your visit</ActionButton>
      <Note>Keep this e-mail as your receipt.</Note>
    </EmailLayout>
  );
}

PaymentReceiptEmail.PreviewProps = {
  ownerName: "Jonah Reyes",
  studioName: "Larchmere Slab & Resin (invented)",
  pieceTitle: "Cherry writing desk",
  amount: "92.23 USD",
  paidOn: "2026-12-01",
  reference: "pi_test_example",
  url: "http://localhost:3000/jobs/example",
} satisfies PaymentReceiptEmailProps;

export default PaymentReceiptEmail;
