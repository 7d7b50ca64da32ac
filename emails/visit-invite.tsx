import { EmailLayout, Note, Paragraph } from "./components/layout";
import { ActionClose } from "./components/button";
import { VisitTime } from "./components/visit-time";

export type VisitInviteEmailProps = {
  kind: "booked" | "moved" | "cancelled";
  ownerName: string;
  studioName: string;
  pieceTitle: string;
  jobTitle: string;
  /** e.g. "Tuesday, 8 December 2026, 09:00–10:30 PST" (formatVisitWhen) in the reader's time zone */
  when: string;
  /** The time before a move, for "moved". */
  previousWhen?: string;
  /** The zone in words (formatZone): "Pacific Time, Los Angeles". */
  timeZone: string;
  /** "today", "tomorrow" or "on Friday 4 June 2027", by the owner's calendar day (not for a cancellation). */
  dayWord?: string;
  location: string;
  technicianName: string;
  reason?: string;
  url: string;
};

const HEADINGS = { booked: "Your visit is booked", moved: "Your visit has moved", cancelled: "Your visit is cancelled" } as const;

export function VisitInviteEmail(p: VisitInviteEmailProps) {
  return (
    <EmailLayout preview={`${HEADINGS[p.kind]}: ${p.when}`} heading={HEADINGS[p.kind]}>
      <Paragraph>Hi {p.ownerName},</Paragraph>
      {p.kind === "cancelled" ? (
        <Paragraph>
          The visit for <strong>{p.jobTitle}</strong> on {p.pieceTitle}, planned for {p.when} ({p.timeZone}), is cancelled.
          {p.reason ? ` Reason: ${p.reason}` : ""} You can book another time from your job page.
        </Paragraph>
      ) : (
        <>
          <Paragraph>
            {p.kind === "moved" ? "The new time" : "The time"} for <strong>{p.jobTitle}</strong> on {p.pieceTitle}{p.dayWord ? <> is {p.dayWord}</> : null}:
          </Paragraph>
          <VisitTime when={p.when} previousWhen={p.previousWhen} timeZone={p.timeZone} location={p.location} technicianName={p.technicianName} />
          <Paragraph>The attached calendar file adds the visit to your calendar{p.kind === "moved" ? " and replaces the earlier time" : ""}.</Paragraph>
          <Note>Please clear the top before the visit and keep pets and children away from fresh finish for the day. Lifting a heavy top takes two people; the technician will ask for help rather than lift it alone.</Note>
        </>
      )}
      <ActionClose href={p.url} label={p.kind === "cancelled" ? "Book another time" : "See or change the visit"} note={<>Sent by {p.studioName} through Grainward.</>} />
    </EmailLayout>
  );
}

VisitInviteEmail.PreviewProps = {
  kind: "booked",
  ownerName: "The Holloway household",
  studioName: "Larchmere Slab & Resin (invented)",
  pieceTitle: "Walnut river dining table",
  jobTitle: "Topcoat refresh, dining table",
  when: "Tuesday, 8 December 2026, 09:00–10:30 PST",
  timeZone: "Pacific Time, Los Angeles",
  dayWord: "on Tuesday 8 December 2026",
  location: "14 Quarry Lane, Port Alder",
  technicianName: "Ines Varga",
  url: "http://localhost:3000/jobs/example",
} satisfies VisitInviteEmailProps;

export default VisitInviteEmail;
