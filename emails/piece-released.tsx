import { Link, Section, Text } from "@react-email/components";
import { EmailLayout, Paragraph } from "./components/layout";
import { ActionClose } from "./components/button";
import { colors } from "./components/theme";

/** A claim, repair job or visit the release leaves with the studio, already written out (lib/repairs/handed-on.ts openWorkAtRelease). */
export type OpenWorkText = { kind: string; title: string; state: string; next: string; url: string };

export type PieceReleasedEmailProps = {
  studioName: string;
  pieceTitle: string;
  ownerName: string;
  /** Date of the release in the studio's time zone, already written out. */
  releasedOn: string;
  /** Absolute URL of the piece record in the studio console. */
  url: string;
  /** The former owner's open work on the piece; empty when there is none. */
  openWork?: OpenWorkText[];
};

export function pieceReleasedSubject({ pieceTitle, openWork = 0 }: Pick<PieceReleasedEmailProps, "pieceTitle"> & { openWork?: number }): string {
  return openWork > 0 ? `A piece changed hands with open work: ${pieceTitle}` : `A piece changed hands: ${pieceTitle}`;
}

const small = { fontSize: "14px", lineHeight: "20px", color: colors.muted, margin: "0 0 4px" } as const;
const body = { fontSize: "15px", lineHeight: "22px", color: colors.ink, margin: "0 0 6px" } as const;

export function PieceReleasedEmail({ studioName, pieceTitle, ownerName, releasedOn, url, openWork = [] }: PieceReleasedEmailProps) {
  return (
    <EmailLayout preview={`${ownerName} released ${pieceTitle} for a new owner.`} heading="A piece is changing hands">
      <Paragraph>
        {ownerName} released the {pieceTitle} on {releasedOn}. Grainward issued a new registration code and sent it to them to hand
        to the next owner; the code on the old drawer card no longer works.
      </Paragraph>
      {openWork.length > 0 ? (
        <>
          <Paragraph>
            {ownerName} left {openWork.length === 1 ? "one thing" : `${openWork.length} things`} open on this piece. They can no longer approve, pay for or
            book work on it, and the new owner does not see any of it:
          </Paragraph>
          {openWork.map((w, i) => (
            <Section key={i} style={{ borderTop: `1px solid ${colors.rule}`, padding: "10px 0 4px" }}>
              <Text style={{ ...body, fontWeight: 700 }}>
                {w.kind}: {w.title}
              </Text>
              <Text style={small}>{w.state}</Text>
              <Text style={body}>{w.next}</Text>
              <Text style={{ ...body, margin: "0 0 8px" }}>
                <Link href={w.url} style={{ color: colors.ink, textDecoration: "underline" }}>
                  Open the {w.kind.toLowerCase()}
                </Link>
              </Text>
            </Section>
          ))}
        </>
      ) : null}
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
  openWork: [
    {
      kind: "Visit",
      title: "Refresh the top with Ines Okafor",
      state: "Booked for Thursday, 5 March 2026, 09:00–11:00 PST",
      next: "Jonah Reyes no longer sees this visit or gets its reminders. Agree with them and the new owner whether it goes ahead, then move or cancel it on the job's page.",
      url: "https://grainward.example/studio/jobs/00000000-0000-4000-8000-000000000001",
    },
  ],
} satisfies PieceReleasedEmailProps;

export default PieceReleasedEmail;
