import { EmailLayout, Note, Paragraph } from "./components/layout";
import { ActionClose } from "./components/button";

export type ThreadMessageEmailProps = {
  audience: "owner" | "studio";
  authorName: string;
  studioName: string;
  pieceTitle: string;
  /** "repair job" or "visit": what the conversation is about. */
  about: string;
  body: string;
  url: string;
};

export function threadMessageSubject({ audience, pieceTitle, studioName, authorName, about }: Omit<ThreadMessageEmailProps, "body" | "url">): string {
  if (audience === "owner") return `New message from ${studioName} about the ${about} for your ${pieceTitle}`;
  return `Message from ${authorName} about the ${pieceTitle} ${about}`;
}

export function ThreadMessageEmail(p: ThreadMessageEmailProps) {
  const owner = p.audience === "owner";
  return (
    <EmailLayout
      preview={p.body.slice(0, 90)}
      heading={owner ? "A message from the studio" : "A message from the owner"}
      footer={owner ? `You get this message because of a ${p.about} with ${p.studioName}; it is sent even if you turned care reminders off.` : undefined}
    >
      <Paragraph>
        {owner ? `${p.authorName} at ${p.studioName}` : p.authorName} wrote about the {p.about} for the {p.pieceTitle}:
      </Paragraph>
      <Paragraph>“{p.body}”</Paragraph>
      <ActionClose href={p.url} label={owner ? "Open the conversation" : "Open it in the inbox"} />
      {owner ? <Note>You can also answer by replying to this e-mail; your reply goes to the studio.</Note> : null}
    </EmailLayout>
  );
}

ThreadMessageEmail.PreviewProps = {
  audience: "owner",
  authorName: "Teo Lindqvist",
  studioName: "Larchmere Slab & Resin",
  pieceTitle: "Cherry writing desk",
  about: "repair job",
  body: "We can bring the sander on Thursday morning if that suits you. (Invented example.)",
  url: "https://grainward.example/jobs/example",
} satisfies ThreadMessageEmailProps;

export default ThreadMessageEmail;
