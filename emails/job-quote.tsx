import { quoteMailWords } from "@/lib/repairs/states";
import { EmailLayout, Paragraph } from "./components/layout";
import { ActionClose } from "./components/button";
import { MoneyLines, type MoneyLinesProps } from "./components/money-lines";

export type JobQuoteEmailProps = Omit<MoneyLinesProps, "totalLabel"> & {
  ownerName: string;
  studioName: string;
  pieceTitle: string;
  fullyCovered: boolean;
  /** The heading: who pays says (quoteMailWords in lib/repairs/states.ts), as in the subject. */
  heading: string;
  url: string;
};

export function JobQuoteEmail({ ownerName, studioName, pieceTitle, fullyCovered, heading, url, ...money }: JobQuoteEmailProps) {
  return (
    <EmailLayout preview={fullyCovered ? `${heading}: ${pieceTitle}` : `${heading} from ${studioName}: ${money.total}`} heading={heading}>
      <Paragraph>Hi {ownerName},</Paragraph>
      <Paragraph>
        {studioName} has priced the work on <strong>{pieceTitle}</strong>:
      </Paragraph>
      <MoneyLines {...money} totalLabel="To pay" />
      <Paragraph>
        <strong>{fullyCovered ? "You pay nothing." : `To pay: ${money.total}`}</strong>
      </Paragraph>
      <ActionClose href={url} label={fullyCovered ? "See the job and book a visit" : "Review, approve and pay"} note="Questions about the quote? Reply to the studio before you approve it." />
    </EmailLayout>
  );
}

JobQuoteEmail.PreviewProps = {
  ownerName: "Jonah Reyes",
  studioName: "Larchmere Slab & Resin (invented)",
  pieceTitle: "Cherry writing desk",
  lines: [{ description: "Crack or check fill", detail: "1 h × $85.00", amount: "$85.00" }],
  subtotal: "$85.00",
  covered: null,
  net: "$85.00",
  taxLabel: "Tax (8.5 %)",
  tax: "$7.23",
  total: "$92.23",
  roundingNote: "Amounts are exact to the cent.",
  taxNumber: null,
  fullyCovered: false,
  heading: quoteMailWords({ origin: "studio", coveredPct: 0, totalMinor: 9223 }, "Larchmere Slab & Resin (invented)", "Cherry writing desk").heading,
  url: "http://localhost:3000/jobs/example",
} satisfies JobQuoteEmailProps;

export default JobQuoteEmail;
