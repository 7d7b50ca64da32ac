import { EmailLayout, Paragraph } from "./components/layout";
import { ActionClose } from "./components/button";

export type EmailChangeConfirmProps = {
  name: string;
  /** The address this mail goes to: the one the account moves to. */
  newEmail: string;
  /** Absolute URL of the confirmation link. */
  url: string;
  expiresInHours: number;
};

export const emailChangeConfirmSubject = "Confirm your new e-mail address for Grainward";

/** To the new address (lib/owner/account-email.ts): the account moves here only when this link is opened. */
export function EmailChangeConfirmEmail({ name, newEmail, url, expiresInHours }: EmailChangeConfirmProps) {
  return (
    <EmailLayout preview="One tap to move your Grainward account to this address." heading="Confirm your new address">
      <Paragraph>Hi {name},</Paragraph>
      <Paragraph>
        You asked to use {newEmail} for your Grainward account. Open the link below while signed in to your account to
        make the change. Until you do, nothing changes and we keep writing to your current address.
      </Paragraph>
      <ActionClose
        href={url}
        label="Use this address"
        note={`The link works for ${expiresInHours} hours, once. If you did not ask for this, ignore this message; nothing will happen.`}
      />
    </EmailLayout>
  );
}

// Invented example values for the React Email preview.
EmailChangeConfirmEmail.PreviewProps = {
  name: "Jonah Reyes",
  newEmail: "jonah.new@owners.example",
  url: "https://grainward.example/account/email/confirm?token=example-change-token",
  expiresInHours: 24,
} satisfies EmailChangeConfirmProps;

export default EmailChangeConfirmEmail;
