import { EmailLayout, Note, Paragraph } from "./components/layout";
import { ActionClose, SpelledLink } from "./components/button";
import { MoneyLines, type MoneyLinesProps } from "./components/money-lines";
import { RefundRows, type RefundRowText } from "./components/refund-rows";

export type PaymentReceiptEmailProps = Omit<MoneyLinesProps, "totalLabel"> & {
  ownerName: string;
  studioName: string;
  studioAddress: string;
  pieceTitle: string;
  amount: string;
  paidOn: string;
  reference: string;
  url: string;
  pdfUrl: string;
  /** Every refund on the job when the receipt is sent (another payment for it given back, say); empty or absent: none. */
  refunds?: RefundRowText[];
};

export function PaymentReceiptEmail({ ownerName, studioName, studioAddress, pieceTitle, amount, paidOn, reference, url, pdfUrl, refunds = [], ...money }: PaymentReceiptEmailProps) {
  return (
    <EmailLayout preview={`Receipt: ${amount} paid to ${studioName}`} heading="Payment received">
      <Paragraph>Hi {ownerName},</Paragraph>
      <Paragraph>
        Thank you — {studioName} received <strong>{amount}</strong> on {paidOn} for the work on your <strong>{pieceTitle}</strong>.
      </Paragraph>
      <MoneyLines {...money} totalLabel="Paid" />
      <RefundRows refunds={refunds} />
      <Paragraph>Payment reference: {reference}</Paragraph>
      <Note>
        {studioName}
        {studioAddress ? `, ${studioAddress}` : ""}
      </Note>
      <ActionClose href={url} label="Book your visit" note={<>Keep this e-mail as your receipt. A PDF copy, once you are signed in: <SpelledLink href={pdfUrl} /></>} />
    </EmailLayout>
  );
}

PaymentReceiptEmail.PreviewProps = {
  ownerName: "Jonah Reyes",
  studioName: "Larchmere Slab & Resin (invented)",
  studioAddress: "12 Invented Lane, Portland OR",
  pieceTitle: "Cherry writing desk",
  amount: "$92.23",
  paidOn: "1 December 2026",
  reference: "pi_test_example",
  lines: [{ description: "Crack or check fill", detail: "1 h × $85.00", amount: "$85.00" }],
  subtotal: "$85.00",
  covered: null,
  net: "$85.00",
  taxLabel: "Tax (8.5 %)",
  tax: "$7.23",
  total: "$92.23",
  roundingNote: null,
  taxNumber: "US-TAX-000 (invented)",
  url: "http://localhost:3000/jobs/example",
  pdfUrl: "http://localhost:3000/api/jobs/example/receipt",
} satisfies PaymentReceiptEmailProps;

export default PaymentReceiptEmail;
