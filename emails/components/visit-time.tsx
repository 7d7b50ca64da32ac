import { Paragraph } from "./layout";

/** The visit's time and place, as the booking, move and technician mails show it. */
export function VisitTime({ when, previousWhen, timeZone, location, technicianName }: { when: string; previousWhen?: string; timeZone: string; location: string; technicianName?: string }) {
  return (
    <Paragraph>
      <strong>{when}</strong> ({timeZone})
      {previousWhen ? <><br />instead of {previousWhen}</> : null}
      <br />
      At: {location}
      {technicianName ? <><br />Technician: {technicianName}</> : null}
    </Paragraph>
  );
}
