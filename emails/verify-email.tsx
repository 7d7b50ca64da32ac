import { EmailLayout, Paragraph } from "./components/layout";
import { ActionClose } from "./components/button";

export type VerifyEmailProps = {
  name: string;
  /** Absolute URL of the verification link. */
  url: string;
};

export const verifyEmailSubject = "Confirm your e-mail address for Grainward";

export function VerifyEmail({ name, url }: VerifyEmailProps) {
  return (
    <EmailLayout preview="One tap to confirm your e-mail address." heading="Confirm your e-mail address">
      <Paragraph>Hi {name},</Paragraph>
      <Paragraph>
        Please confirm that this address is yours. Once it is, we can send you the care reminders for your pieces and
        keep you posted on any claim or visit.
      </Paragraph>
      <ActionClose href={url} label="Confirm e-mail address" note="If you did not create a Grainward account, you can ignore this message; nothing will happen." />
    </EmailLayout>
  );
}

// Invented example values for the React Email preview.
VerifyEmail.PreviewProps = {
  name: "Jonah Reyes",
  url: "https://grainward.example/verify-email?token=example-verification-token",
} satisfies VerifyEmailProps;

export default VerifyEmail;
