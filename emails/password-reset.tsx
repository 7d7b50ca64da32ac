import { EmailLayout, Note, Paragraph } from "./components/layout";
import { ActionClose } from "./components/button";

export type PasswordResetEmailProps = {
  name: string;
  /** Absolute URL of the single-use reset link. */
  url: string;
  expiresInMinutes: number;
};

export const passwordResetSubject = "Reset your Grainward password";

/** "1 hour", "2 hours", "30 minutes". */
export function describeMinutes(minutes: number): string {
  if (minutes >= 60 && minutes % 60 === 0) {
    const hours = minutes / 60;
    return hours === 1 ? "1 hour" : `${hours} hours`;
  }
  return minutes === 1 ? "1 minute" : `${minutes} minutes`;
}

export function PasswordResetEmail({ name, url, expiresInMinutes }: PasswordResetEmailProps) {
  const expiry = describeMinutes(expiresInMinutes);
  return (
    <EmailLayout preview={`Your password reset link works for ${expiry}.`} heading="Choose a new password">
      <Paragraph>Hi {name},</Paragraph>
      <Paragraph>Someone asked to reset the password of your Grainward account. If it was you, choose a new one here:</Paragraph>
      <ActionClose href={url} label="Choose a new password" />
      <Note>
        The link expires in {expiry} and can be used once. If you did not ask for this, you can safely ignore this email:
        your password stays as it is.
      </Note>
    </EmailLayout>
  );
}

// Invented example values for the React Email preview.
PasswordResetEmail.PreviewProps = {
  name: "Ines Varga",
  url: "https://grainward.example/reset-password?token=example-reset-token",
  expiresInMinutes: 60,
} satisfies PasswordResetEmailProps;

export default PasswordResetEmail;
