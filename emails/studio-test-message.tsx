import { EmailLayout, Note, Paragraph } from "./components/layout";

export type StudioTestMessageProps = {
  studioName: string;
  senderName: string;
  /** Where owners' answers go; empty when the studio has none. */
  replyTo: string;
};

/** Sent from the set-up's mail step to the admin who asked, so they see the studio's mail as owners will. */
export function StudioTestMessage({ studioName, senderName, replyTo }: StudioTestMessageProps) {
  return (
    <EmailLayout preview={`This is how ${studioName}'s e-mails look.`} heading="Your test message arrived">
      <Paragraph>
        This is how e-mails from {studioName} reach owners: they come from “{senderName}”, with your logo and colour at the top.
      </Paragraph>
      <Paragraph>
        {replyTo ? `When an owner answers, the answer goes to ${replyTo}.` : "No reply address is set yet, so owners' answers have nowhere to go: add one in the set-up's mail step."}
      </Paragraph>
      <Note>You asked for this message in your studio&apos;s set-up. Nothing else was sent.</Note>
    </EmailLayout>
  );
}

// Invented example values (the demo studio of db/seed/demo.ts) for the React Email preview.
StudioTestMessage.PreviewProps = {
  studioName: "Larchmere Slab & Resin",
  senderName: "Larchmere Slab & Resin",
  replyTo: "studio@larchmere.example",
} satisfies StudioTestMessageProps;

export default StudioTestMessage;
