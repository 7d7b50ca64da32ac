// iCalendar invites for visits (RFC 5545 objects, RFC 5546 iTIP methods), written by the `ics`
// package, which emits CRLF line ends and folds lines at 75 octets (RFC 5545 §3.1). No server-only
// import: the scheduler sends visit mail too.
//
// What each invite carries and why:
// - VCALENDAR: PRODID and VERSION:2.0 (§3.6, §3.7.3–4), METHOD REQUEST or CANCEL (RFC 5546 §3.2).
// - VEVENT: UID stable for the life of the visit (§3.8.4.7), DTSTAMP in UTC (§3.8.7.2), DTSTART and
//   DTEND in UTC (§3.8.2.4, §3.8.2.2) — UTC "Z" times need no VTIMEZONE (§3.6.5) — SEQUENCE raised on
//   every change (§3.8.7.4; RFC 5546 §2.1.4), LOCATION = the address (§3.8.1.7), ORGANIZER and ATTENDEE
//   (RFC 5546 §3.2.2 REQUEST, §3.2.5 CANCEL), STATUS CANCELLED on a cancel (§3.8.1.11).
import { createEvent, type EventAttributes } from "ics";

export type InviteMethod = "REQUEST" | "CANCEL";

export type InviteInput = {
  method: InviteMethod;
  uid: string;
  sequence: number;
  startMs: number;
  endMs: number;
  summary: string;
  description: string;
  location: string;
  organizer: { name: string; email: string };
  attendee: { name: string; email: string };
  /** DTSTAMP: when this invite was made. */
  now?: Date;
};

export const ICS_PRODID = "-//Grainward//Visits 1.0//EN";

export function visitUid(visitId: string): string {
  return `visit-${visitId}@grainward.app`;
}

/** The .ics text of one visit invite or cancellation; throws if the `ics` package refuses the input. */
export function buildInvite(input: InviteInput): string {
  const attrs: EventAttributes & { timestamp: number } = {
    productId: ICS_PRODID,
    method: input.method,
    uid: input.uid,
    sequence: input.sequence,
    timestamp: (input.now ?? new Date()).getTime(),
    start: input.startMs,
    startInputType: "utc",
    startOutputType: "utc",
    end: input.endMs,
    endInputType: "utc",
    endOutputType: "utc",
    title: input.summary,
    description: input.description,
    location: input.location,
    status: input.method === "CANCEL" ? "CANCELLED" : "CONFIRMED",
    busyStatus: input.method === "CANCEL" ? "FREE" : "BUSY",
    organizer: { name: input.organizer.name, email: input.organizer.email },
    attendees: [{ name: input.attendee.name, email: input.attendee.email, rsvp: false, partstat: "ACCEPTED", role: "REQ-PARTICIPANT" }],
  };
  const { error, value } = createEvent(attrs);
  if (error || !value) throw new Error(`could not write the visit invite: ${error?.message ?? "no output"}`);
  return refoldOctets(value);
}

/**
 * The `ics` package folds at 75 characters; RFC 5545 §3.1 counts octets, so a line with non-ASCII
 * text (an address like "Søndergade") would run over. Unfold, then fold again at 75 octets without
 * splitting a UTF-8 sequence (a continuation line starts with one space, which counts).
 */
export function refoldOctets(text: string): string {
  const lines = text.replace(/\r\n[ \t]/g, "").split("\r\n");
  const out: string[] = [];
  for (const line of lines) {
    let current = "";
    let octets = 0;
    for (const ch of line) {
      const n = Buffer.byteLength(ch, "utf8");
      if (octets + n > 75) {
        out.push(current);
        current = " ";
        octets = 1;
      }
      current += ch;
      octets += n;
    }
    out.push(current);
  }
  return out.join("\r\n");
}

export function inviteAttachment(ics: string, method: InviteMethod) {
  return {
    filename: method === "CANCEL" ? "cancel.ics" : "invite.ics",
    content: ics,
    contentType: `text/calendar; method=${method}; charset=UTF-8`,
  };
}
