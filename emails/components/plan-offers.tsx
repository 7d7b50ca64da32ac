import { Section, Text } from "@react-email/components";
import { colors, serifStack } from "./theme";

/** One care plan that fits the piece, as lib/plans/offer-lines writes it. */
export type PlanOfferLine = {
  name: string;
  price: string;
  includes: string[];
  /** What it would have saved over the last year of the owner's own care log; null: nothing to compare. */
  lastYear: string | null;
};

/** The studio's care plans that fit the piece, in the hand-over and refresh mails. */
export function PlanOffers({
  plans,
  studioName,
  howToBuy,
}: {
  plans: PlanOfferLine[];
  studioName: string;
  howToBuy: string;
}) {
  if (!plans.length) return null;
  return (
    <Section
      style={{
        borderTop: `1px solid ${colors.rule}`,
        marginTop: "24px",
        paddingTop: "20px",
      }}
    >
      <Text
        style={{
          fontFamily: serifStack,
          fontSize: "19px",
          lineHeight: "26px",
          fontWeight: 600,
          color: colors.ink,
          margin: "0 0 8px",
        }}
      >
        {plans.length === 1
          ? `A care plan from ${studioName} for this piece`
          : `Care plans from ${studioName} for this piece`}
      </Text>
      {plans.map((p) => (
        <Text
          key={p.name}
          style={{
            fontSize: "15px",
            lineHeight: "24px",
            color: colors.ink,
            margin: "0 0 12px",
          }}
        >
          <strong>{p.name}</strong> · {p.price}
          {p.includes.map((i) => (
            <span key={i}>
              <br />• {i}
            </span>
          ))}
          {p.lastYear ? (
            <>
              <br />
              <span style={{ color: colors.muted }}>{p.lastYear}</span>
            </>
          ) : null}
        </Text>
      ))}
      <Text
        style={{
          fontSize: "14px",
          lineHeight: "22px",
          color: colors.muted,
          margin: "0",
        }}
      >
        {howToBuy}
      </Text>
    </Section>
  );
}
