import { EmailLayout, Note, Paragraph } from "./components/layout";
import { ActionClose } from "./components/button";

export type VisitReminderEmailProps = {
  /** "today", "tomorrow" or "on Friday 4 June 2027", by the owner's calendar day. */
  dayWord: string;
  ownerName: string;
  studioName: string;
  pieceTitle: string;
  jobTitle: string;
  when: string;
  /** The zone in words (formatZone): "Pacific Time, Los Angeles". */
  timeZone: string;
  location: string;
  technicianName: string;
  url: string;
};

export function VisitReminderEmail(p: VisitReminderEmailProps) {
  return (
    <EmailLayout preview={`Your visit ${p.dayWord}: ${p.when}`} heading={`Your visit is ${p.dayWord}`}>
      <Paragraph>Hi {p.ownerName},</Paragraph>
      <Paragraph>
        A reminder: {p.technicianName} from {p.studioName} comes for <strong>{p.jobTitle}</strong> on {p.pieceTitle}.
      </Paragraph>
      <Paragraph>
        <strong>{p.when}</strong> ({p.timeZone})
        <br />
        At: {p.location}
      </Paragraph>
      <Note>Please clear the top and make room around the piece. Finishing needs fresh air: we will ask to open a window.</Note>
      <ActionClose href={p.url} label="See the visit" />
    </EmailLayout>
  );
}

VisitReminderEmail.PreviewProps = {
  dayWord: "tomorrow",
  ownerName: "Jonah Reyes",
  studioName: "Larchmere Slab & Resin (invented)",
  pieceTitle: "Walnut and maple resin coffee table",
  jobTitle: "Polish the resin river",
  when: "Wednesday 9 December 2026, 13:00–14:30",
  timeZone: "Pacific Time, Los Angeles",
  location: "3 Ferry Row, Port Alder",
  technicianName: "Sol Amberly",
  url: "http://localhost:3000/jobs/example",
} satisfies VisitReminderEmailProps;

export default VisitReminderEmail;
