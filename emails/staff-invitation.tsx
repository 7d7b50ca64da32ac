import { EmailLayout, Note, Paragraph } from "./components/layout";
import { ActionClose } from "./components/button";

export type StaffRole = "admin" | "staff" | "technician";

export type StaffInvitationEmailProps = {
  studioName: string;
  role: StaffRole;
  inviterName: string;
  /** Absolute URL of the invitation link. */
  url: string;
  expiresInDays: number;
};

const roleWords: Record<StaffRole, { title: string; does: string }> = {
  admin: {
    title: "an admin",
    does: "run the studio's side of Grainward: the team, warranty terms, finish catalog, rates and settings, as well as everything staff do",
  },
  staff: {
    title: "a staff member",
    does: "record delivered pieces and their finishes, print drawer cards, look after claims and book visits",
  },
  technician: {
    title: "a technician",
    does: "see the visits booked for you and record the touch-up work you do on each piece",
  },
};

export function staffInvitationSubject({ studioName }: Pick<StaffInvitationEmailProps, "studioName">): string {
  return `You're invited to join ${studioName} on Grainward`;
}

export function StaffInvitationEmail({ studioName, role, inviterName, url, expiresInDays }: StaffInvitationEmailProps) {
  const words = roleWords[role];
  const days = expiresInDays === 1 ? "1 day" : `${expiresInDays} days`;
  return (
    <EmailLayout preview={`${inviterName} invited you to ${studioName}.`} heading={`Join ${studioName}`}>
      <Paragraph>
        {inviterName} invited you to join {studioName} on Grainward as {words.title}.
      </Paragraph>
      <Paragraph>As {words.title}, you can {words.does}.</Paragraph>
      <ActionClose href={url} label="Accept the invitation" />
      <Note>
        The invitation is valid for {days}. If you were not expecting it, you can ignore this email and no account will be
        set up.
      </Note>
    </EmailLayout>
  );
}

// Invented example values (the demo studio of db/seed/demo.ts) for the React Email preview.
StaffInvitationEmail.PreviewProps = {
  studioName: "Larchmere Slab & Resin",
  role: "technician",
  inviterName: "Maren Okafor",
  url: "https://grainward.example/invitations/example-invitation-token",
  expiresInDays: 7,
} satisfies StaffInvitationEmailProps;

export default StaffInvitationEmail;
