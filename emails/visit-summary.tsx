import { EmailLayout, Note, Paragraph } from "./components/layout";
import { ActionClose, SpelledLink } from "./components/button";

export type VisitSummaryEmailProps = {
  ownerName: string;
  studioName: string;
  pieceTitle: string;
  jobTitle: string;
  when: string;
  technicianName: string;
  work: string;
  layers: string[];
  /** The owner's single-use sign-off link (the owner signs off; the technician never does it for them). */
  signOffUrl: string;
  photoCount: number;
  /** Next care tasks; dueOn already written out ("8 December 2027"). */
  nextCare: { label: string; dueOn: string }[];
  /** The new layers' cure time: until when to go gently, from when full use is fine; null when nothing is curing. */
  curing: { title: string; lines: string[]; closing: string } | null;
  /** Cautions for living with the piece (heat on resin). */
  cautions: string[];
  url: string;
};

export function VisitSummaryEmail(p: VisitSummaryEmailProps) {
  return (
    <EmailLayout preview={`Visit report: ${p.pieceTitle}`} heading="Your visit report">
      <Paragraph>Hi {p.ownerName},</Paragraph>
      <Paragraph>
        {p.technicianName} finished <strong>{p.jobTitle}</strong> on {p.pieceTitle} ({p.when}).
      </Paragraph>
      <Paragraph>
        <strong>What was done</strong>
        <br />
        {p.work}
      </Paragraph>
      {p.layers.length ? (
        <Paragraph>
          <strong>New finish layers</strong>
          {p.layers.map((l) => (
            <span key={l}>
              <br />• {l}
            </span>
          ))}
        </Paragraph>
      ) : null}
      {p.curing ? (
        <Paragraph>
          <strong>{p.curing.title}</strong>
          {p.curing.lines.map((l) => (
            <span key={l}>
              <br />• {l}
            </span>
          ))}
          <br />
          {p.curing.closing}
        </Paragraph>
      ) : null}
      {p.photoCount ? <Paragraph>{p.photoCount} photo{p.photoCount === 1 ? "" : "s"} are on the piece&apos;s record.</Paragraph> : null}
      {p.nextCare.length ? (
        <Paragraph>
          <strong>Next care</strong>
          {p.nextCare.map((t) => (
            <span key={t.label}>
              <br />• {t.label}: {t.dueOn}
            </span>
          ))}
        </Paragraph>
      ) : null}
      {p.cautions.map((c) => (
        <Note key={c}>{c}</Note>
      ))}
      <Paragraph>
        <strong>Happy with the work?</strong> Sign it off: the link opens a page with a button, and works once.
      </Paragraph>
      <ActionClose href={p.signOffUrl} label="Sign off the work" />
      <Paragraph>
        Not happy with it? Don&apos;t sign off; write to the studio. The piece&apos;s care record: <SpelledLink href={p.url} />
      </Paragraph>
    </EmailLayout>
  );
}

VisitSummaryEmail.PreviewProps = {
  ownerName: "The Holloway household",
  studioName: "Larchmere Slab & Resin (invented)",
  pieceTitle: "Walnut river dining table",
  jobTitle: "Topcoat refresh, dining table",
  when: "Tuesday, 8 December 2026, 09:00–10:30 PST",
  technicianName: "Ines Varga",
  work: "Cleaned, keyed the topcoat, one fresh coat of ceramic-type topcoat.",
  layers: ["Top: Ceramic-type topcoat over oil — Ceramic-type topcoat, matte, 1 coat, 8 December 2026"],
  signOffUrl: "http://localhost:3000/visit-sign-off?token=example",
  photoCount: 2,
  nextCare: [{ label: "Topcoat refresh (top)", dueOn: "8 December 2027" }],
  curing: {
    title: "The new finish is still curing: full use from 15 December 2026",
    lines: [
      "Ceramic-type topcoat over oil (Ceramic-type topcoat, matte), put on 8 December 2026: keep water, mats, cloths and objects off it until 9 December 2026; from then light use is fine — set things down gently and wipe with a dry cloth. From 15 December 2026 it is fully cured: children, heavy dishes, and wiping with water and mild soap are all fine.",
    ],
    closing: "A slightly tacky feel in the first days is normal while the finish hardens. If it still feels tacky after 15 December 2026, tell the studio.",
  },
  cautions: [],
  url: "http://localhost:3000/pieces/example",
} satisfies VisitSummaryEmailProps;

export default VisitSummaryEmail;
