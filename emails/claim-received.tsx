import { EmailLayout, Note, Paragraph } from "./components/layout";
import { ActionClose } from "./components/button";

export type ClaimReceivedEmailProps = {
  audience: "owner" | "studio";
  ownerName: string;
  studioName: string;
  pieceTitle: string;
  categoryLabel: string;
  noticedOn: string;
  description: string;
  /** Absolute URL of the claim page for this audience. */
  url: string;
};

export function claimReceivedSubject({ audience, pieceTitle, ownerName }: Pick<ClaimReceivedEmailProps, "audience" | "pieceTitle" | "ownerName">): string {
  return audience === "owner" ? `We've received your claim about the ${pieceTitle}` : `New claim: ${pieceTitle} (${ownerName})`;
}

export function ClaimReceivedEmail(p: ClaimReceivedEmailProps) {
  const owner = p.audience === "owner";
  return (
    <EmailLayout
      preview={owner ? `${p.studioName} has your claim and will answer here.` : `${p.ownerName} reported ${p.categoryLabel.toLowerCase()}.`}
      heading={owner ? "Your claim is with the studio" : "A new claim to look at"}
      footer={owner ? "You get this message because you filed a claim; claim mail is sent even if you turned care reminders off." : undefined}
    >
      {owner ? (
        <Paragraph>
          Hi {p.ownerName}, thank you for letting {p.studioName} know. Your report about the {p.pieceTitle} is filed, and the
          studio will look at it and answer you through Grainward.
        </Paragraph>
      ) : (
        <Paragraph>
          {p.ownerName} filed a claim about the {p.pieceTitle}.
        </Paragraph>
      )}
      <Paragraph>
        {p.categoryLabel}, noticed on {p.noticedOn}: “{p.description}”
      </Paragraph>
      <ActionClose href={p.url} label={owner ? "See your claim" : "Open the claim"} />
      {owner ? <Note>Photos you add later and the studio&apos;s questions appear on the claim page.</Note> : null}
    </EmailLayout>
  );
}

// Invented example values (the demo studio of db/seed/demo.ts) for the React Email preview.
ClaimReceivedEmail.PreviewProps = {
  audience: "owner",
  ownerName: "Jonah Reyes",
  studioName: "Larchmere Slab & Resin",
  pieceTitle: "Cherry writing desk",
  categoryLabel: "Crack or gap",
  noticedOn: "2 February 2026",
  description: "A hairline crack opened along the left edge over the winter.",
  url: "https://grainward.example/claims/example",
} satisfies ClaimReceivedEmailProps;

export default ClaimReceivedEmail;
