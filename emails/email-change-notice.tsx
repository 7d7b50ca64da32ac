import { EmailLayout, Note, Paragraph } from "./components/layout";
import { ActionClose } from "./components/button";

export type EmailChangeNoticeProps = {
  name: string;
  /** The address the change asks for, or made. */
  newEmail: string;
  /** "asked": a link went to the new address; "done": the account now uses it. */
  stage: "asked" | "done";
  /** Absolute URL of the account's e-mail page, where a waiting change can be cancelled. */
  accountUrl: string;
};

export const emailChangeNoticeSubject = (stage: EmailChangeNoticeProps["stage"]) =>
  stage === "asked" ? "Someone asked to change your Grainward e-mail address" : "Your Grainward e-mail address was changed";

/** To the old address (lib/owner/account-email.ts): when a change is asked for, and when it is made. */
export function EmailChangeNoticeEmail({ name, newEmail, stage, accountUrl }: EmailChangeNoticeProps) {
  return (
    <EmailLayout
      preview={stage === "asked" ? `A change of address to ${newEmail} is waiting.` : `Your account now uses ${newEmail}.`}
      heading={stage === "asked" ? "A change of address was asked for" : "Your address was changed"}
    >
      <Paragraph>Hi {name},</Paragraph>
      {stage === "asked" ? (
        <>
          <Paragraph>
            Someone signed in to your Grainward account asked to use {newEmail} instead of this address. We sent a link to
            that address; nothing changes unless it is opened.
          </Paragraph>
          <Paragraph>If this wasn&apos;t you, cancel the change on your account page, then change your password:</Paragraph>
          <ActionClose href={accountUrl} label="This wasn't me: cancel the change" />
        </>
      ) : (
        <>
          <Paragraph>
            Your Grainward account now uses {newEmail}. We won&apos;t write to this address about your pieces any more.
          </Paragraph>
          <Paragraph>
            If this wasn&apos;t you, write to the studio that made your piece straight away: someone who knew your password
            has moved your account. Once you have it back, choose a new password.
          </Paragraph>
        </>
      )}
      <Note>If it was you, there is nothing more to do.</Note>
    </EmailLayout>
  );
}

// Invented example values for the React Email preview.
EmailChangeNoticeEmail.PreviewProps = {
  name: "Jonah Reyes",
  newEmail: "jonah.new@owners.example",
  stage: "asked",
  accountUrl: "https://grainward.example/account/email",
} satisfies EmailChangeNoticeProps;

export default EmailChangeNoticeEmail;
