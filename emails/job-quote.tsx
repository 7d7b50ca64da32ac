import { EmailLayout, Note, Paragraph } from "./components/layout";
import { ActionButton, LinkFallback } from "./components/button";

export type JobQuoteEmailProps = {
  ownerName: string;
  studioName: string;
  pieceTitle: string;
  lines: { description: string; amount: string }[];
  covered: string | null;
  tax: string;
  total: string;
  fullyCovered: boolean;
  url: string;
};

export function JobQuoteEmail({ ownerName, studioName, pieceTitle, lines, covered, tax, total, fullyCovered, url }: JobQuoteEmailProps) {
  return (
    <EmailLayout preview={fullyCovered ? `Your repair is covered: ${pieceTitle}` : `Your quote from ${studioName}: ${total}`} heading={fullyCovered ? "Your repair is covered" : "Your repair quote"}>
      <Paragraph>Hi {ownerName},</Paragraph>
      <Paragraph>
        {studioName} has priced the work on <strong>{pieceTitle}</strong>:
      </Paragraph>
      {lines.map((l) => (
        <Paragraph key={l.description}>
          {l.description}: {l.amount}
        </Paragraph>
      ))}
      {covered ? <Paragraph>Covered by your warranty: −{covered}</Paragraph> : null}
      <Paragraph>Tax: {tax}</Paragraph>
      <Paragraph>
        <strong>{fullyCovered ? "You pay nothing." : `To pay: ${total}`}</strong>
      </Paragraph>
      <ActionButton href={url}>{fullyCovered ? "See the job and book a visit" : "Review, approve and pay"}</ActionButton>
      <LinkFallback href={url} />
      <Note>Questions about the quote? Reply to the studio before you approve it.</Note>
    </EmailLayout>
  );
}

JobQuoteEmail.PreviewProps = {
  ownerName: "Jonah Reyes",
  studioName: "Larchmere Slab & Resin (invented)",
  pieceTitle: "Cherry writing desk",
  lines: [{ description: "Re-wax — labour", amount: "85.00 USD" }],
  covered: null,
  tax: "7.23 USD",
  total: "92.23 USD",
  fullyCovered: false,
  url: "http://localhost:3000/jobs/example",
} satisfies JobQuoteEmailProps;

export default JobQuoteEmail;
