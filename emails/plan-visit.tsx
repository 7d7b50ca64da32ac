import { EmailLayout, Paragraph } from "./components/layout";
import { ActionClose } from "./components/button";
import { PLAN_MAIL_PREVIEW_NAMES, type PlanMailNames } from "./components/plan-mail";

export type PlanVisitEmailProps = PlanMailNames & {
  /** The visit's due date, written out ("3 June 2027"). */
  dueOn: string;
  /** What the owner pays for it, written out ("Included in your plan" or "$40.00"). */
  price: string;
  /** Free times the studio proposes, written out with their zone. */
  slots: string[];
  /** The job page, where the owner picks a time. */
  url: string;
};

export function planVisitSubject({ pieceTitle }: Pick<PlanVisitEmailProps, "pieceTitle">): string {
  return `Time for your care plan visit — ${pieceTitle}`;
}

export function PlanVisitEmail({ ownerName, studioName, planName, pieceTitle, dueOn, price, slots, url }: PlanVisitEmailProps) {
  return (
    <EmailLayout preview={`${studioName} will look after your ${pieceTitle} around ${dueOn}.`} heading="Your care plan visit is coming up">
      <Paragraph>
        Hello {ownerName}, your {planName} plan includes a visit from {studioName} for your {pieceTitle}, due around {dueOn}. {price}.
      </Paragraph>
      {slots.length > 0 ? (
        <Paragraph>
          Times that are free now: {slots.join("; ")}. Pick one (or another) on the visit page.
        </Paragraph>
      ) : (
        <Paragraph>Pick a time that suits you on the visit page.</Paragraph>
      )}
      <ActionClose href={url} label="Choose a time" note="The studio does the plan's care tasks at this visit, so you won't get reminders for them." />
    </EmailLayout>
  );
}

// Invented example values for the React Email preview.
PlanVisitEmail.PreviewProps = {
  ...PLAN_MAIL_PREVIEW_NAMES,
  dueOn: "3 June 2027",
  price: "Included in your plan",
  slots: ["Tuesday 1 June 2027 at 09:00 BST", "Wednesday 2 June 2027 at 13:00 BST"],
  url: "https://grainward.example/jobs/00000000-0000-4000-8000-000000000000",
} satisfies PlanVisitEmailProps;

export default PlanVisitEmail;
