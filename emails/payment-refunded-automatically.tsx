import { EmailLayout, Note, Paragraph } from "./components/layout";
import { ActionClose } from "./components/button";

export type AutomaticRefundReason = "older_quote" | "already_paid" | "not_awaiting_payment" | "piece_handed_on";

export type PaymentRefundedAutomaticallyEmailProps = {
  audience: "owner" | "studio";
  ownerName: string;
  studioName: string;
  pieceTitle: string;
  jobTitle: string;
  /** The refunded amount with its currency, as lib/format writes it, e.g. "$92.23" or "92,23 €". */
  amount: string;
  reason: AutomaticRefundReason;
  /** Absolute URL of the job page for this audience. */
  url: string;
};

const OWNER_REASON: Record<AutomaticRefundReason, string> = {
  older_quote: "it was for an earlier version of the quote — the studio changed the quote after you opened the payment page",
  already_paid: "the work had already been paid for by another payment of yours",
  not_awaiting_payment: "the job was no longer waiting for payment when it went through (the studio was changing the quote, or the job had been closed)",
  piece_handed_on: "it went through after you had handed the piece on, so the repair was no longer yours to pay for",
};

const STUDIO_REASON: Record<AutomaticRefundReason, string> = {
  older_quote: "it was for an older quote than the one the job has now",
  already_paid: "the job had already been paid by another payment",
  not_awaiting_payment: "the job was no longer waiting for payment when it went through",
  piece_handed_on: "the owner had handed the piece on before paying (a payment page opened before the hand-over)",
};

export function paymentRefundedAutomaticallySubject({ audience, amount, studioName, pieceTitle, ownerName }: Pick<PaymentRefundedAutomaticallyEmailProps, "audience" | "amount" | "studioName" | "pieceTitle" | "ownerName">): string {
  return audience === "owner" ? `Refund of ${amount} from ${studioName}` : `Payment refunded automatically: ${pieceTitle} (${ownerName})`;
}

export function PaymentRefundedAutomaticallyEmail(p: PaymentRefundedAutomaticallyEmailProps) {
  const owner = p.audience === "owner";
  return (
    <EmailLayout
      preview={owner ? `${p.amount} is on its way back to your card.` : `${p.ownerName}'s payment of ${p.amount} was given back.`}
      heading={owner ? "We refunded a payment" : "A payment was refunded automatically"}
    >
      {owner ? (
        <>
          <Paragraph>Hi {p.ownerName},</Paragraph>
          <Paragraph>
            You paid <strong>{p.amount}</strong> to {p.studioName} for the work on <strong>{p.pieceTitle}</strong>, but {OWNER_REASON[p.reason]}. So
            this payment was not kept: the full amount is on its way back to the card you paid with.
          </Paragraph>
          {p.reason === "already_paid" ? (
            <Paragraph>Your other payment stands, and the work goes ahead as planned.</Paragraph>
          ) : p.reason === "piece_handed_on" ? (
            <Paragraph>Nothing is left for you to pay for this repair.</Paragraph>
          ) : (
            <Paragraph>Open the job to see where it stands and what, if anything, is left to pay.</Paragraph>
          )}
        </>
      ) : (
        <Paragraph>
          {p.ownerName} paid <strong>{p.amount}</strong> for “{p.jobTitle}” on the {p.pieceTitle}. Grainward refunded it in full because {STUDIO_REASON[p.reason]}. The
          owner has been told by e-mail; nothing else needs doing unless they ask.
        </Paragraph>
      )}
      <ActionClose href={p.url} label={owner ? "See your repair" : "Open the job"} />
      {owner ? <Note>Refunds usually show on your statement within 5–10 business days, depending on your bank.</Note> : null}
    </EmailLayout>
  );
}

// Invented example values for the React Email preview.
PaymentRefundedAutomaticallyEmail.PreviewProps = {
  audience: "owner",
  ownerName: "Jonah Reyes",
  studioName: "Larchmere Slab & Resin (invented)",
  pieceTitle: "Cherry writing desk",
  jobTitle: "Re-oil the desk top",
  amount: "$92.23",
  reason: "older_quote",
  url: "http://localhost:3000/jobs/example",
} satisfies PaymentRefundedAutomaticallyEmailProps;

export default PaymentRefundedAutomaticallyEmail;
