import { Column, Row, Section, Text } from "@react-email/components";
import { ActionClose } from "./components/button";
import { PlanOffers, type PlanOfferLine } from "./components/plan-offers";
import { colors, serifStack } from "./components/theme";

export type RefreshOfferProps = {
  studioName: string;
  taskLabel: string;
  /** As lib/format writes it, e.g. "$412.55" or "412,55 €". */
  total: string;
  lines: { description: string; amount: string }[];
  tax: string;
  acceptUrl: string;
  /** The studio's care plans that fit the piece, with the last year of the owner's log against each. */
  plans?: PlanOfferLine[];
};

/** The refresh-visit offer that travels with the first reminder of a refresh task. */
export function RefreshOfferSection({ studioName, taskLabel, total, lines, tax, acceptUrl, plans = [] }: RefreshOfferProps) {
  return (
    <>
      <Section style={{ borderTop: `1px solid ${colors.rule}`, marginTop: "24px", paddingTop: "20px" }}>
        <Text style={{ fontFamily: serifStack, fontSize: "19px", lineHeight: "26px", fontWeight: 600, color: colors.ink, margin: "0 0 8px" }}>
          Or let {studioName} do it: a refresh visit
        </Text>
        <Text style={{ fontSize: "16px", lineHeight: "26px", color: colors.ink, margin: "0 0 12px" }}>
          A technician comes to you and does the {taskLabel.toLowerCase()} for {total}, travel and tax included.
        </Text>
        {lines.map((l) => (
          <Row key={l.description}>
            <Column style={{ fontSize: "14px", lineHeight: "22px", color: colors.muted }}>{l.description}</Column>
            <Column style={{ fontSize: "14px", lineHeight: "22px", color: colors.ink, textAlign: "right" }}>{l.amount}</Column>
          </Row>
        ))}
        <Text style={{ fontSize: "14px", lineHeight: "22px", color: colors.muted, margin: "4px 0 16px" }}>
          {tax}. Total: {total}.
        </Text>
        <ActionClose href={acceptUrl} label="Accept the refresh offer" note="Accepting asks the studio to get in touch and book a visit with you. Nothing is charged now." />
      </Section>
      <PlanOffers plans={plans} studioName={studioName} howToBuy="Or have it done every time: you can start a plan from the piece's page in Grainward." />
    </>
  );
}

// Invented example values: a refresh offer with a plan that fits, for the previews of the care reminder.
export const REFRESH_OFFER_PREVIEW = {
  total: "$138.29",
  lines: [
    { description: "Re-oil — labour (0.75 h)", amount: "$63.75" },
    { description: "Studio hardwax oil, 4.3 US fl oz (125 mL)", amount: "$19.00" },
    { description: "Travel", amount: "$45.00" },
  ],
  tax: "Tax (8.25 %) $10.54",
  acceptUrl: "https://grainward.example/offers/example",
  plans: [
    {
      name: "Oiled top care (invented)",
      price: "$259.80 a year, including $19.80 tax",
      includes: ["Re-oil done by the studio, no reminders to act on", "1 studio visit a year", "10 % off paid repairs"],
      lastYear: "The care you logged over the last year (2 tasks) would have cost $276.58 from Larchmere Slab & Resin (invented); a year of this plan is $259.80, so it would have saved you $16.78.",
    },
  ],
} satisfies Omit<RefreshOfferProps, "studioName" | "taskLabel">;

export default RefreshOfferSection;
