// Every .ics the product sends (booking, move, cancellation; the owner's and the technician's) read back from the real SMTP sink and
// parsed with ical.js, a general-purpose reference parser, then checked against RFC 5545 / RFC 5546.
import ICAL from "ical.js";
import { describe, expect, it } from "vitest";
import { buildInvite } from "@/lib/visits/ics";
import { bookVisit } from "@/lib/visits/book";
import { cancelVisit } from "@/lib/visits/cancel";
import { listJobSlots } from "@/lib/visits/slots";
import { moveVisit } from "@/lib/visits/reschedule";
import { putTechnicianHours } from "@/lib/visits/technicians";
import { memberContext } from "../support/fixtures";
import { getMail, waitForMail } from "../support/mail";
import { ownerActor, staffActor, visitWorld, WEEKDAYS_9_TO_5 } from "./visits-helpers";

const NOW = Date.parse("2027-05-03T12:00:00Z"); // a Monday

async function inviteOf(to: string, subject: RegExp, since: number) {
  const summary = await waitForMail({ to, subject, since });
  const mail = await getMail(summary.id);
  const ics = mail.attachments.find((a) => a.contentType.startsWith("text/calendar"));
  expect(ics, "the message carries a text/calendar attachment").toBeDefined();
  // The parsed summary keeps only the MIME type; the raw message has the full header with its method.
  const header = /Content-Type: (text\/calendar[^\r\n]*(?:\r\n[ \t][^\r\n]*)*)/i.exec(mail.raw)?.[1]?.replace(/\r\n[ \t]/g, " ") ?? "";
  return { text: Buffer.from(ics!.contentBase64, "base64").toString("utf8"), contentType: header, mail };
}

function checkRequired(text: string) {
  // RFC 5545 §3.1: lines end in CRLF and are folded so that no line is longer than 75 octets.
  expect(text.replace(/\r\n/g, "")).not.toMatch(/[\r\n]/);
  for (const line of text.split("\r\n")) expect(Buffer.byteLength(line, "utf8")).toBeLessThanOrEqual(75);
  const cal = new ICAL.Component(ICAL.parse(text));
  expect(cal.name).toBe("vcalendar");
  // §3.7.3 PRODID and §3.7.4 VERSION are required in the VCALENDAR.
  expect(cal.getFirstPropertyValue("prodid")).toMatch(/Grainward/);
  expect(cal.getFirstPropertyValue("version")).toBe("2.0");
  const events = cal.getAllSubcomponents("vevent");
  expect(events).toHaveLength(1);
  const ev = events[0]!;
  // §3.6.1: UID and DTSTAMP are required in a VEVENT; §3.8.7.2: DTSTAMP is a UTC date-time.
  expect(ev.getFirstPropertyValue("uid")).toBeTruthy();
  const dtstamp = ev.getFirstPropertyValue("dtstamp") as ICAL.Time;
  expect(dtstamp.zone?.tzid).toBe("UTC");
  expect(ev.getFirstProperty("dtstamp")!.toICALString()).toMatch(/Z$/);
  // §3.8.2.4 DTSTART and §3.8.2.2 DTEND (never together with DURATION, §3.6.1).
  expect(ev.getFirstProperty("dtstart")).toBeTruthy();
  expect(ev.getFirstProperty("dtend")).toBeTruthy();
  expect(ev.getFirstProperty("duration")).toBeNull();
  // §3.6.5: a TZID needs a VTIMEZONE; we write UTC times and no TZID at all.
  expect(text).not.toMatch(/TZID=/);
  // RFC 5546 §3.2.2 / §3.2.5: REQUEST and CANCEL carry ORGANIZER and ATTENDEE.
  expect(ev.getFirstPropertyValue("organizer")).toMatch(/^mailto:/i);
  expect(ev.getFirstPropertyValue("attendee")).toMatch(/^mailto:/i);
  return { cal, ev };
}

describe("visit invites (.ics)", () => {
  it("booking → REQUEST; move keeps the UID and raises SEQUENCE; cancel is METHOD:CANCEL with a higher SEQUENCE", async () => {
    const w = await visitWorld();
    const { slots } = listJobSlots(ownerActor(w.owner), w.job.id, { from: "2027-05-10T00:00:00Z", to: "2027-05-15T00:00:00Z" }, NOW);
    expect(slots.length).toBeGreaterThan(2);
    const since = Date.now();
    const booked = await bookVisit(ownerActor(w.owner), { jobId: w.job.id, technicianId: slots[0]!.technicianId, start: slots[0]!.start }, NOW);

    const first = await inviteOf(w.owner.email, /^Visit booked/, since);
    expect(first.contentType).toMatch(/^text\/calendar/);
    expect(first.contentType).toMatch(/method=REQUEST/i);
    const a = checkRequired(first.text);
    expect(a.cal.getFirstPropertyValue("method")).toBe("REQUEST"); // RFC 5546 §1.4
    expect(a.ev.getFirstPropertyValue("uid")).toBe(booked.icsUid); // §3.8.4.7 stable UID
    expect(a.ev.getFirstPropertyValue("sequence")).toBe(0); // §3.8.7.4 starts at 0
    expect((a.ev.getFirstPropertyValue("dtstart") as ICAL.Time).toJSDate().toISOString()).toBe(booked.start);
    expect((a.ev.getFirstPropertyValue("dtend") as ICAL.Time).toJSDate().toISOString()).toBe(booked.end);
    expect(a.ev.getFirstPropertyValue("location")).toBe("5 Test Road, Testville (invented)"); // §3.8.1.7
    expect(String(a.ev.getFirstPropertyValue("attendee")).toLowerCase()).toBe(`mailto:${w.owner.email}`);

    const later = slots.find((s) => Date.parse(s.start) >= Date.parse(booked.end) + 3 * 3_600_000)!;
    const since2 = Date.now();
    const moved = await moveVisit(staffActor(w.staff), booked.id, { start: later.start }, NOW);
    const second = await inviteOf(w.owner.email, /^Visit moved/, since2);
    const b = checkRequired(second.text);
    expect(b.cal.getFirstPropertyValue("method")).toBe("REQUEST");
    expect(b.ev.getFirstPropertyValue("uid")).toBe(booked.icsUid);
    expect(b.ev.getFirstPropertyValue("sequence")).toBe(1);
    expect(moved.sequence).toBe(1);
    expect((b.ev.getFirstPropertyValue("dtstart") as ICAL.Time).toJSDate().toISOString()).toBe(later.start);

    const since3 = Date.now();
    await cancelVisit(ownerActor(w.owner), booked.id, { reason: "Away that week" }, NOW);
    const third = await inviteOf(w.owner.email, /^Visit cancelled/, since3);
    expect(third.contentType).toMatch(/method=CANCEL/i);
    const c = checkRequired(third.text);
    expect(c.cal.getFirstPropertyValue("method")).toBe("CANCEL"); // RFC 5546 §3.2.5
    expect(c.ev.getFirstPropertyValue("uid")).toBe(booked.icsUid);
    expect(c.ev.getFirstPropertyValue("sequence")).toBe(2);
    expect(c.ev.getFirstPropertyValue("status")).toBe("CANCELLED"); // §3.8.1.11
  });

  it("the technician gets their own copy naming them; a visit handed to another technician is a cancellation for one and an invite for the other", async () => {
    const w = await visitWorld();
    const other = await memberContext(w.studio, "technician");
    putTechnicianHours(w.staff, other.user.id, { hours: WEEKDAYS_9_TO_5, timeOff: [] });
    const { slots } = listJobSlots(staffActor(w.staff), w.job.id, { from: "2027-05-10T00:00:00Z", to: "2027-05-15T00:00:00Z" }, NOW);
    const mine = slots.find((s) => s.technicianId === w.tech.user.id)!;
    const since = Date.now();
    const booked = await bookVisit(staffActor(w.staff), { jobId: w.job.id, technicianId: mine.technicianId, start: mine.start }, NOW);

    const tech = w.tech.user.email;
    const first = await inviteOf(tech, /^New visit: /, since);
    const a = checkRequired(first.text);
    expect(a.cal.getFirstPropertyValue("method")).toBe("REQUEST");
    expect(a.ev.getFirstPropertyValue("uid")).toBe(booked.icsUid); // the same event as the owner's (RFC 5545 §3.8.4.7)
    expect(String(a.ev.getFirstPropertyValue("attendee")).toLowerCase()).toBe(`mailto:${tech}`);
    expect(first.mail.text).toContain("oily rags");
    expect(first.mail.text).toMatch(/\/studio\/today\?date=2027-05-10/);

    // Staff hand the visit to the other technician at the same time.
    const since2 = Date.now();
    await moveVisit(staffActor(w.staff), booked.id, { start: mine.start, technicianId: other.user.id }, NOW);
    const off = await inviteOf(tech, /^Visit off your calendar/, since2);
    const b = checkRequired(off.text);
    expect(b.cal.getFirstPropertyValue("method")).toBe("CANCEL"); // RFC 5546 §3.2.5
    expect(b.ev.getFirstPropertyValue("uid")).toBe(booked.icsUid);
    expect(b.ev.getFirstPropertyValue("sequence")).toBe(1);
    expect(off.mail.text).toContain(`It has gone to ${other.user.name}.`);
    const on = await inviteOf(other.user.email, /^New visit: /, since2);
    const c = checkRequired(on.text);
    expect(c.cal.getFirstPropertyValue("method")).toBe("REQUEST");
    expect(c.ev.getFirstPropertyValue("sequence")).toBe(1);
    expect(String(c.ev.getFirstPropertyValue("attendee")).toLowerCase()).toBe(`mailto:${other.user.email}`);

    const since3 = Date.now();
    await cancelVisit(ownerActor(w.owner), booked.id, { reason: "Away that week" }, NOW);
    const gone = await inviteOf(other.user.email, /^Visit off your calendar/, since3);
    expect(checkRequired(gone.text).cal.getFirstPropertyValue("method")).toBe("CANCEL");
    expect(gone.mail.text).toContain("Reason: Away that week");
  });

  it("long addresses and non-ASCII text fold at 75 octets and read back unchanged", () => {
    const location = "Flat 3, Søndergade 141, Ærøskøbing — the blue door behind the boatyard, ring twice (invented address)";
    const text = buildInvite({ method: "REQUEST", uid: "visit-test@grainward.app", sequence: 4, startMs: Date.UTC(2027, 2, 15, 13), endMs: Date.UTC(2027, 2, 15, 14, 30), summary: "Touch-up visit — résine polish", description: "Line one\nLine two; with, punctuation", location, organizer: { name: "Test Studio", email: "shop@test.example" }, attendee: { name: "Zoë Owner", email: "zoe@test.example" }, now: new Date(Date.UTC(2027, 0, 1)) });
    const { ev } = checkRequired(text);
    expect(ev.getFirstPropertyValue("location")).toBe(location);
    expect(ev.getFirstPropertyValue("description")).toBe("Line one\nLine two; with, punctuation");
    expect(ev.getFirstPropertyValue("sequence")).toBe(4);
    expect(ev.getFirstProperty("dtstamp")!.toICALString()).toBe("DTSTAMP:20270101T000000Z");
  });
});
