import { EmailLayout, Paragraph } from "./components/layout";
import { ActionClose } from "./components/button";

export type PieceReleasedEmailProps = {
  studioName: string;
  pieceTitle: string;
  ownerName: string;
  /** Date of the release in the studio's time zone, already written out. */
  releasedOn: string;
  /** Absolute URL of the piece record in the studio console. */
  url: string;
};

export function pieceReleasedSubject({ pieceTitle }: Pick<PieceReleasedEmailProps, "pieceTitle">): string {
  return `A piece changed hands: ${pieceTitle}`;
}

export function PieceReleasedEmail({ studioName, pieceTitle, ownerName, releasedOn, url }: PieceReleasedEmailProps) {
  return (
    <EmailLayout preview={`${ownerName} released ${pieceTitle} for a new owner.`} heading="A piece is changing hands">
      <Paragraph>
        {ownerName} released the {pieceTitle} on {releasedOn}. Grainward issued a new registration code and sent it to them to hand
        to the next owner; the code on the old drawer card no longer works.
      </Paragraph>
      <Paragraph>
        Until the next owner registers, the piece has no owner and no care reminders go out. The warranty passes on as {studioName}&apos;s
        policy says for each line.
      </Paragraph>
      <ActionClose href={url} label="Open the piece record" note="You can print a fresh drawer card with the new code from the piece record." />
    </EmailLayout>
  );
}

// Invented example values for the React Email preview.
PieceReleasedEmail.PreviewProps = {
  studioName: "Larchmere Slab & Resin",
  pieceTitle: "Cherry writing desk",
  ownerName: "Jonah Reyes",
  releasedOn: "2 March 2026",
  url: "https://grainward.example/studio/pieces/00000000-0000-4000-8000-000000000000",
} satisfies PieceReleasedEmailProps;

export default PieceReleasedEmail;
