import { EmailLayout, Note, Paragraph } from "./components/layout";
import { ActionClose } from "./components/button";

export type ClaimMessageEmailProps = {
  audience: "owner" | "studio";
  authorName: string;
  studioName: string;
  pieceTitle: string;
  body: string;
  /** The studio asked the owner for more information. */
  requestInfo: boolean;
  url: string;
};

export function claimMessageSubject({ audience, pieceTitle, studioName, authorName, requestInfo }: Omit<ClaimMessageEmailProps, "body" | "url">): string {
  if (audience === "owner") return requestInfo ? `${studioName} needs a little more about your ${pieceTitle}` : `New message from ${studioName} about your ${pieceTitle}`;
  return `Reply from ${authorName} on the ${pieceTitle} claim`;
}

export function ClaimMessageEmail(p: ClaimMessageEmailProps) {
  const owner = p.audience === "owner";
  return (
    <EmailLayout
      preview={p.body.slice(0, 90)}
      heading={owner ? (p.requestInfo ? "The studio has a question" : "A message from the studio") : "The owner replied"}
      footer={owner ? "You get this message because of a claim you filed; claim mail is sent even if you turned care reminders off." : undefined}
    >
      <Paragraph>
        {owner ? `${p.authorName} at ${p.studioName}` : p.authorName} wrote about the {p.pieceTitle}:
      </Paragraph>
      <Paragraph>“{p.body}”</Paragraph>
      <ActionClose href={p.url} label={owner ? "Reply on the claim page" : "Open the claim"} />
      {owner && p.requestInfo ? <Note>The studio will carry on once you reply.</Note> : null}
    </EmailLayout>
  );
}

ClaimMessageEmail.PreviewProps = {
  audience: "owner",
  authorName: "Teo Lindqvist",
  studioName: "Larchmere Slab & Resin",
  pieceTitle: "Cherry writing desk",
  body: "Could you send a photo of the underside, near the crack? (Invented example.)",
  requestInfo: true,
  url: "https://grainward.example/claims/example",
} satisfies ClaimMessageEmailProps;

export default ClaimMessageEmail;
