import { EmailLayout, Note, Paragraph } from "./components/layout";
import { ActionClose } from "./components/button";
import { PlanOffers, type PlanOfferLine } from "./components/plan-offers";

export type HandOverEmailProps = {
  name: string;
  studioName: string;
  pieceTitle: string;
  /** "Dining table · delivered 12 November 2026" */
  subtitle: string;
  /** One line per finish layer as it sits on the piece, e.g. "Top: hardwax oil (Harbour Oil), 2 coats". */
  finish: string[];
  /** The first care dates from the piece's schedule, written out ("Re-oil the top: due 12 May 2027"). */
  firstCare: string[];
  /** How long the newest layer cures: until when to go gently, from when full use is fine; null when nothing is curing. */
  curing: string | null;
  /** Short cautions for living with and caring for the piece. */
  cautions: string[];
  /** Warranty lines: what is covered, for how long, and whether it passes to a later owner. */
  warranty: string[];
  /** The one-tap link: registers the piece after sign-up or sign-in, no code to type. */
  url: string;
  /** When the link stops working, written out. */
  linkExpiresOn: string;
  /** The studio's care plans that fit the piece (lib/plans/offer-lines); none: no plan section. */
  plans?: PlanOfferLine[];
};

export function handOverSubject({ pieceTitle, studioName }: Pick<HandOverEmailProps, "pieceTitle" | "studioName">): string {
  return `Your ${pieceTitle} from ${studioName}: its care and warranty`;
}

function List({ title, items }: { title: string; items: string[] }) {
  if (!items.length) return null;
  return (
    <Paragraph>
      <strong>{title}</strong>
      {items.map((t) => (
        <span key={t}>
          <br />• {t}
        </span>
      ))}
    </Paragraph>
  );
}

export function HandOverEmail(p: HandOverEmailProps) {
  return (
    <EmailLayout preview={`The care and warranty of your ${p.pieceTitle}, and one tap to keep them with you`} heading={`Your ${p.pieceTitle}`}>
      <Paragraph>Hi {p.name},</Paragraph>
      <Paragraph>
        Thank you for choosing {p.studioName}. Here is what your new piece needs in its first months, and how to keep its care record and warranty with you.
      </Paragraph>
      <Paragraph>
        <strong>{p.pieceTitle}</strong>
        <br />
        {p.subtitle}
      </Paragraph>
      <List title="Its finish" items={p.finish} />
      {p.curing ? (
        <Paragraph>
          <strong>While the finish cures</strong>
          <br />
          {p.curing}
        </Paragraph>
      ) : null}
      <List title="First care" items={p.firstCare} />
      <List title="Warranty" items={p.warranty} />
      <Paragraph>
        Register the piece and Grainward reminds you when care is due, keeps the care you log, and holds its warranty. No code to type: this link does it once you have signed up or signed in with this address.
      </Paragraph>
      <ActionClose href={p.url} label="Register my piece" note={<>The link works once, until {p.linkExpiresOn}. The card in the drawer carries the piece&apos;s registration code too — keep it with the piece for whoever owns it next.</>} />
      <PlanOffers plans={p.plans ?? []} studioName={p.studioName} howToBuy="Once the piece is registered, you can start a plan from its page in Grainward. Nothing is charged unless you choose one." />
      {p.cautions.length ? (
        <>
          <Paragraph>
            <strong>Please take care</strong>
          </Paragraph>
          {p.cautions.map((c) => (
            <Note key={c}>{c}</Note>
          ))}
          <Note>Always follow the instructions on the care product&apos;s label and your local rules; for electrics or heavy lifting, ask a licensed trade.</Note>
        </>
      ) : null}
    </EmailLayout>
  );
}

// Invented example values for the React Email preview.
HandOverEmail.PreviewProps = {
  name: "Maren Tallis",
  studioName: "Larchmere Slab & Resin (invented)",
  pieceTitle: "Walnut river dining table",
  subtitle: "Dining table · delivered 12 November 2026",
  finish: ["Top: hardwax oil (Harbour Oil, invented), 2 coats, applied 9 November 2026"],
  firstCare: ["Re-oil the top: due 12 May 2027"],
  curing: "Keep water, mats and objects off it until 10 November 2026, then use it gently; full use from 23 November 2026.",
  cautions: ["Oily rags can catch fire by themselves: dry them flat outdoors or keep them in a closed metal can of water."],
  warranty: ["Cracks and splits: 24 months, until 12 November 2028 (passes to a later owner)"],
  url: "https://grainward.example/hand-over/example-token",
  linkExpiresOn: "10 February 2027",
  plans: [
    {
      name: "Oiled top care (invented)",
      price: "$240.00 a year, including $21.82 tax",
      includes: ["Re-oil done by the studio, no reminders to act on", "1 studio visit a year", "Crack or gap: covered 12 months longer while the plan runs", "10 % off paid repairs"],
      lastYear: null,
    },
  ],
} satisfies HandOverEmailProps;

export default HandOverEmail;
