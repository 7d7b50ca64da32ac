import { EmailLayout, Note, Paragraph } from "./components/layout";
import { ActionClose } from "./components/button";
import { VisitTime } from "./components/visit-time";

export type TechnicianVisitEmailProps = {
  /** "booked": new on their calendar (booked, or moved to them); "moved": their visit has a new time or place; "cancelled": off their calendar (cancelled, or given to someone else). */
  kind: "booked" | "moved" | "cancelled";
  technicianName: string;
  studioName: string;
  ownerName: string;
  pieceTitle: string;
  jobTitle: string;
  when: string;
  previousWhen?: string;
  /** The zone in words (formatZone): "Pacific Time, Los Angeles". */
  timeZone: string;
  location: string;
  reason?: string;
  /** Their day page for the visit's date. */
  url: string;
};

const HEADINGS = { booked: "A visit on your calendar", moved: "Your visit has moved", cancelled: "A visit is off your calendar" } as const;

export function TechnicianVisitEmail(p: TechnicianVisitEmailProps) {
  return (
    <EmailLayout preview={`${HEADINGS[p.kind]}: ${p.when}`} heading={HEADINGS[p.kind]}>
      <Paragraph>Hi {p.technicianName},</Paragraph>
      {p.kind === "cancelled" ? (
        <Paragraph>
          <strong>{p.jobTitle}</strong> on {p.pieceTitle} for {p.ownerName}, planned for {p.when} ({p.timeZone}), is no longer yours.
          {p.reason ? ` ${p.reason}` : ""} The attached calendar file takes it off your calendar.
        </Paragraph>
      ) : (
        <>
          <Paragraph>
            <strong>{p.jobTitle}</strong> on {p.pieceTitle} for {p.ownerName}:
          </Paragraph>
          <VisitTime when={p.when} previousWhen={p.previousWhen} timeZone={p.timeZone} location={p.location} />
          <Paragraph>The attached calendar file puts the visit on your calendar{p.kind === "moved" ? " and replaces the earlier time" : ""}.</Paragraph>
          <Note>
            Follow the finish maker&apos;s instructions, keep the room aired while you work, and leave oily rags flat to dry outdoors or in a closed metal can with water — they can catch
            fire on their own. Lift a heavy top with two people.
          </Note>
        </>
      )}
      <ActionClose href={p.url} label="See your day" note={<>Sent by {p.studioName} through Grainward.</>} />
    </EmailLayout>
  );
}

TechnicianVisitEmail.PreviewProps = {
  kind: "booked",
  technicianName: "Ines Varga",
  studioName: "Larchmere Slab & Resin (invented)",
  ownerName: "The Holloway household",
  pieceTitle: "Walnut river dining table",
  jobTitle: "Topcoat refresh, dining table",
  when: "Tuesday, 8 December 2026, 09:00–10:30 PST",
  timeZone: "Pacific Time, Los Angeles",
  location: "14 Quarry Lane, Port Alder",
  url: "http://localhost:3000/studio/today?date=2026-12-08",
} satisfies TechnicianVisitEmailProps;

export default TechnicianVisitEmail;
