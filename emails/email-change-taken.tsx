import { EmailLayout, Note, Paragraph } from "./components/layout";

export type EmailChangeTakenProps = {
  name: string;
};

export const emailChangeTakenSubject = "Someone tried to move a Grainward account to your address";

/**
 * To an address that already has an account, instead of a confirmation link (lib/owner/account-email.ts):
 * the person asking is told the same either way, so they never learn whether the address has an account.
 */
export function EmailChangeTakenEmail({ name }: EmailChangeTakenProps) {
  return (
    <EmailLayout preview="Nothing changed: your address already has a Grainward account." heading="Your address is already in use">
      <Paragraph>Hi {name},</Paragraph>
      <Paragraph>
        Someone signed in to another Grainward account asked to use this address for it. This address already belongs to
        your account, so nothing changed, and your account stays as it is.
      </Paragraph>
      <Note>If it was you with a second account, sign in to that one and choose a different address for it.</Note>
    </EmailLayout>
  );
}

// Invented example values for the React Email preview.
EmailChangeTakenEmail.PreviewProps = { name: "Jonah Reyes" } satisfies EmailChangeTakenProps;

export default EmailChangeTakenEmail;
