import { Link } from "@react-email/components";
import { EmailLayout, Note, Paragraph } from "./components/layout";
import { ActionClose, SpelledLink } from "./components/button";
import { colors } from "./components/theme";

export type SignUpAttemptEmailProps = {
  name: string;
  /** Absolute URL of the sign-in page. */
  signInUrl: string;
  /** Absolute URL of the page that sends a password reset link. */
  resetUrl: string;
};

export const signUpAttemptSubject = "Someone tried to create a Grainward account with your address";

/** Sent instead of a second account: the sign-up page answers the same whether or not an address has one. */
export function SignUpAttemptEmail({ name, signInUrl, resetUrl }: SignUpAttemptEmailProps) {
  return (
    <EmailLayout preview="Your address already has a Grainward account." heading="You already have an account">
      <Paragraph>Hi {name},</Paragraph>
      <Paragraph>
        Someone just tried to create a new Grainward account with this email address. It already has an account, so
        nothing was created and nothing about your account changed.
      </Paragraph>
      <Paragraph>If it was you, sign in instead:</Paragraph>
      <ActionClose href={signInUrl} label="Sign in" />
      <Paragraph>
        Forgotten your password?{" "}
        <Link href={resetUrl} style={{ color: colors.accent }}>
          Choose a new one
        </Link>{" "}
        (<SpelledLink href={resetUrl} />).
      </Paragraph>
      <Note>If it wasn&apos;t you, you can ignore this message: your password and your pieces stay as they are.</Note>
    </EmailLayout>
  );
}

// Invented example values for the React Email preview.
SignUpAttemptEmail.PreviewProps = {
  name: "Jonah Reyes",
  signInUrl: "https://grainward.example/sign-in",
  resetUrl: "https://grainward.example/forgot-password",
} satisfies SignUpAttemptEmailProps;

export default SignUpAttemptEmail;
