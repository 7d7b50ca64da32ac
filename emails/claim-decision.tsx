import { EmailLayout, Paragraph } from "./components/layout";
import { ActionClose } from "./components/button";

export type ClaimDecisionEmailProps = {
  ownerName: string;
  studioName: string;
  pieceTitle: string;
  decision: "covered" | "partly_covered" | "chargeable" | "declined";
  coveredPct: number | null;
  reason: string | null;
  url: string;
};

export function claimDecisionSubject({ studioName, pieceTitle }: Pick<ClaimDecisionEmailProps, "studioName" | "pieceTitle">): string {
  return `${studioName} has decided your claim about the ${pieceTitle}`;
}

const WORDS: Record<ClaimDecisionEmailProps["decision"], (pct: number | null) => string> = {
  covered: () => "The repair is covered by your warranty: it costs you nothing.",
  partly_covered: (pct) => `The repair is partly covered: the warranty pays ${pct ?? "part"} % and the studio will quote you the rest.`,
  chargeable: () => "The repair is not covered by the warranty, but the studio can do it as a paid repair and will send you a quote.",
  declined: () => "The studio has declined the claim.",
};

export function ClaimDecisionEmail(p: ClaimDecisionEmailProps) {
  return (
    <EmailLayout
      preview={WORDS[p.decision](p.coveredPct)}
      heading="Your claim has a decision"
      footer="You get this message because of a claim you filed; claim mail is sent even if you turned care reminders off."
    >
      <Paragraph>Hi {p.ownerName},</Paragraph>
      <Paragraph>
        {p.studioName} has looked at your claim about the {p.pieceTitle}. {WORDS[p.decision](p.coveredPct)}
      </Paragraph>
      {p.reason ? <Paragraph>The studio wrote: “{p.reason}”</Paragraph> : null}
      <ActionClose href={p.url} label="See the decision" note="Questions about it? Reply with a message on the claim page." />
    </EmailLayout>
  );
}

ClaimDecisionEmail.PreviewProps = {
  ownerName: "Jonah Reyes",
  studioName: "Larchmere Slab & Resin",
  pieceTitle: "Cherry writing desk",
  decision: "partly_covered",
  coveredPct: 50,
  reason: "The room was drier than the care guide over the winter. (Invented example.)",
  url: "https://grainward.example/claims/example",
} satisfies ClaimDecisionEmailProps;

export default ClaimDecisionEmail;
