import { Section, Text } from "@react-email/components";
import { EmailLayout, Note, Paragraph } from "./components/layout";
import { ActionClose } from "./components/button";
import { colors } from "./components/theme";

export type TransferCodeEmailProps = {
  name: string;
  pieceTitle: string;
  studioName: string;
  /** The fresh registration code, XXXX-XXXX-XXXX-C. */
  code: string;
  /** Absolute URL of the card landing for the new code. */
  url: string;
  /** Warranty lines that pass to the next owner, and those that stay with the first owner. */
  transferring: string[];
  staying: string[];
};

export function transferCodeSubject({ pieceTitle }: Pick<TransferCodeEmailProps, "pieceTitle">): string {
  return `The new registration code for your ${pieceTitle}`;
}

export function TransferCodeEmail({ name, pieceTitle, studioName, code, url, transferring, staying }: TransferCodeEmailProps) {
  return (
    <EmailLayout preview={`Hand this code to the piece's next owner: ${code}`} heading="Hand this code to the next owner">
      <Paragraph>Hi {name},</Paragraph>
      <Paragraph>
        You released your {pieceTitle} from {studioName}. It is no longer on your account, and the old code on the drawer card no longer works.
        Give the next owner this new registration code — they type it at Grainward, or open the link below:
      </Paragraph>
      <Section style={{ margin: "0 0 20px" }}>
        <Text style={{ fontFamily: "ui-monospace, Menlo, Consolas, monospace", fontSize: "24px", letterSpacing: "0.08em", color: colors.ink, margin: 0 }}>
          {code}
        </Text>
      </Section>
      <ActionClose href={url} label="Register with this code" />
      {transferring.length ? <Paragraph>Warranty that passes to the next owner: {transferring.join("; ")}.</Paragraph> : null}
      {staying.length ? <Paragraph>Warranty that stays with you as the first owner and ends for the piece: {staying.join("; ")}.</Paragraph> : null}
      <Note>Keep this message until the code has been used. If you did not release this piece, tell {studioName} straight away.</Note>
    </EmailLayout>
  );
}

// Invented example values for the React Email preview.
TransferCodeEmail.PreviewProps = {
  name: "Jonah Reyes",
  pieceTitle: "Cherry writing desk",
  studioName: "Larchmere Slab & Resin",
  code: "7K3M-Q9XD-2HRT-P",
  url: "https://grainward.example/r/7K3M-Q9XD-2HRT-P",
  transferring: ["Cracks, gaps and resin separation"],
  staying: ["Finish wear or rings"],
} satisfies TransferCodeEmailProps;

export default TransferCodeEmail;
