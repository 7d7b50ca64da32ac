import { Column, Row, Section, Text } from "@react-email/components";
import { ActionButton, LinkFallback } from "./components/button";
import { Note } from "./components/layout";
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
        <ActionButton href={acceptUrl}>Accept the refresh offer</ActionButton>
        <LinkFallback href={acceptUrl} />
        <Note>Accepting asks the studio to get in touch and book a visit with you. Nothing is charged now.</Note>
      </Section>
      <PlanOffers plans={plans} studioName={studioName} howToBuy="Or have it done every time: you can start a plan from the piece's page in Grainward." />
    </>
  );
}

export default RefreshOfferSection;
