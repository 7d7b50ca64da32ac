import "server-only";
// The e-mail templates rendered with their invented PreviewProps (each template's example values),
// for the settings page. Rendering is the same @react-email/render call lib/mail makes for real mail.
import { render } from "@react-email/render";
import type { ComponentType } from "react";
import CareReminder, { type CareReminderProps } from "@/emails/care-reminder";
import ClaimDecisionEmail from "@/emails/claim-decision";
import ClaimMessageEmail from "@/emails/claim-message";
import ClaimReceivedEmail from "@/emails/claim-received";
import HandOverEmail from "@/emails/hand-over";
import JobQuoteEmail from "@/emails/job-quote";
import PasswordResetEmail from "@/emails/password-reset";
import PaymentReceiptEmail from "@/emails/payment-receipt";
import PieceReleasedEmail from "@/emails/piece-released";
import PlanGraceEmail from "@/emails/plan-grace";
import PlanVisitEmail from "@/emails/plan-visit";
import { REFRESH_OFFER_PREVIEW } from "@/emails/refresh-offer";
import RefundIssuedEmail from "@/emails/refund-issued";
import JobRefundEmail from "@/emails/job-refund";
import PlanPaidAfterHandOnEmail from "@/emails/plan-paid-after-hand-on";
import { PaymentRefundedAutomaticallyEmail } from "@/emails/payment-refunded-automatically";
import { PlanEndedEmail } from "@/emails/plan-ended";
import { PlanHeldSettledEmail } from "@/emails/plan-held-settled";
import { PlanRenewalHeldEmail } from "@/emails/plan-renewal-held";
import { SignUpAttemptEmail } from "@/emails/sign-up-attempt";
import { EmailChangeConfirmEmail } from "@/emails/email-change-confirm";
import { EmailChangeNoticeEmail } from "@/emails/email-change-notice";
import { EmailChangeTakenEmail } from "@/emails/email-change-taken";
import { StudioTestMessage } from "@/emails/studio-test-message";
import { ThreadMessageEmail } from "@/emails/thread-message";
import StaffInvitationEmail from "@/emails/staff-invitation";
import TransferCodeEmail from "@/emails/transfer-code";
import TechnicianVisitEmail from "@/emails/technician-visit";
import VerifyEmail from "@/emails/verify-email";
import VisitInviteEmail from "@/emails/visit-invite";
import VisitReminderEmail from "@/emails/visit-reminder";
import VisitSummaryEmail from "@/emails/visit-summary";
import type { StudioContext } from "@/lib/auth/guards";
import { notFound } from "@/lib/errors";
import { assertAdmin } from "./index";

type Template = ComponentType<never> & { PreviewProps?: Record<string, unknown> };

/** The care reminder as a refresh task's first step sends it: with the refresh offer and the plans that fit. */
const CareReminderWithOffer = Object.assign((p: CareReminderProps) => <CareReminder {...p} />, {
  PreviewProps: { ...CareReminder.PreviewProps, offer: REFRESH_OFFER_PREVIEW } satisfies CareReminderProps,
});

const TEMPLATES: { slug: string; name: string; audience: "owner" | "staff" | "anyone"; when: string; component: Template }[] = [
  { slug: "care-reminder", name: "Care reminder", audience: "owner", when: "Before, on and after a care task's due date (with a refresh offer on refresh tasks).", component: CareReminder as Template },
  { slug: "care-reminder-offer", name: "Care reminder with a refresh offer", audience: "owner", when: "The first reminder of a refresh task: the priced refresh visit, and your care plans that fit the piece with what each would have saved over the owner's last year of logged care.", component: CareReminderWithOffer as Template },
  { slug: "hand-over", name: "Hand-over", audience: "owner", when: "At delivery, to the buyer: the piece's finish, first care, warranty, a one-tap link to register it, and your care plans that fit it.", component: HandOverEmail as Template },
  { slug: "plan-grace", name: "Care plan payment failed", audience: "owner", when: "When a care plan's renewal payment fails: the grace period before the plan lapses.", component: PlanGraceEmail as Template },
  { slug: "plan-paid-after-hand-on", name: "Care plan payment held", audience: "owner", when: "When a care plan is paid after its buyer handed the piece on (the plan can't start), and again when the studio pays it back.", component: PlanPaidAfterHandOnEmail as Template },
  { slug: "plan-visit", name: "Care plan visit", audience: "owner", when: "Ahead of a care plan's included visit: its price under the plan and the times offered.", component: PlanVisitEmail as Template },
  { slug: "plan-renewal-held", name: "Care plan renewal being checked", audience: "owner", when: "When a care plan's renewal is charged at an amount that isn't the plan's price: the studio checks it before it counts.", component: PlanRenewalHeldEmail as Template },
  { slug: "plan-held-settled", name: "Care plan payment settled", audience: "owner", when: "When staff keep a held care plan payment or pay back what isn't owed.", component: PlanHeldSettledEmail as Template },
  { slug: "plan-ended", name: "Care plan ended", audience: "owner", when: "When a care plan is cancelled, lapses or ends because the piece changed hands, with any refund.", component: PlanEndedEmail as Template },
  { slug: "claim-received", name: "Claim received", audience: "anyone", when: "When an owner files a claim (to the owner and to the studio).", component: ClaimReceivedEmail as Template },
  { slug: "claim-message", name: "Claim message", audience: "anyone", when: "When the studio or the owner writes on a claim.", component: ClaimMessageEmail as Template },
  { slug: "claim-decision", name: "Claim decision", audience: "owner", when: "When staff accept or decline a claim.", component: ClaimDecisionEmail as Template },
  { slug: "job-quote", name: "Repair quote", audience: "owner", when: "When staff send a repair job's quote.", component: JobQuoteEmail as Template },
  { slug: "payment-receipt", name: "Payment receipt", audience: "owner", when: "When a repair is paid online.", component: PaymentReceiptEmail as Template },
  { slug: "refund-issued", name: "Refund issued", audience: "owner", when: "When the studio refunds a payment.", component: RefundIssuedEmail as Template },
  { slug: "job-refund", name: "Money given back", audience: "owner", when: "When staff give back all or part of a paid repair's payment; the job stays as it is.", component: JobRefundEmail as Template },
  { slug: "payment-refunded-automatically", name: "Extra payment refunded", audience: "anyone", when: "When a payment for an older quote or a second payment for the same repair is refunded on its own (to the owner and to the studio).", component: PaymentRefundedAutomaticallyEmail as Template },
  { slug: "thread-message", name: "Message", audience: "anyone", when: "When the studio or an owner writes in a conversation that isn't about a claim.", component: ThreadMessageEmail as Template },
  { slug: "transfer-code", name: "Transfer code", audience: "owner", when: "When an owner passes a piece on.", component: TransferCodeEmail as Template },
  { slug: "piece-released", name: "Piece released", audience: "staff", when: "When an owner releases a piece, to the studio's address or its admins: who released it, and any claim, repair or visit left open on it.", component: PieceReleasedEmail as Template },
  { slug: "visit-invite", name: "Visit booked, moved or cancelled", audience: "owner", when: "When a visit is booked, moved or cancelled (with a calendar file).", component: VisitInviteEmail as Template },
  { slug: "visit-reminder", name: "Visit tomorrow", audience: "owner", when: "About 24 hours before a booked visit.", component: VisitReminderEmail as Template },
  { slug: "visit-summary", name: "Visit report", audience: "owner", when: "When the technician files the visit's report.", component: VisitSummaryEmail as Template },
  { slug: "technician-visit", name: "Technician's visit", audience: "staff", when: "To the technician when a visit is booked, moved, handed to them or taken off their calendar (with a calendar file).", component: TechnicianVisitEmail as Template },
  { slug: "staff-invitation", name: "Team invitation", audience: "staff", when: "When an admin invites someone to the studio.", component: StaffInvitationEmail as Template },
  { slug: "verify-email", name: "Verify e-mail", audience: "anyone", when: "After sign-up, to confirm the address.", component: VerifyEmail as Template },
  { slug: "sign-up-attempt", name: "Sign-up with a known address", audience: "anyone", when: "When someone signs up with an e-mail address that already has an account.", component: SignUpAttemptEmail as Template },
  { slug: "email-change-confirm", name: "New e-mail address: confirm", audience: "anyone", when: "When an owner asks to move their account to another address; sent to that address.", component: EmailChangeConfirmEmail as Template },
  { slug: "email-change-notice", name: "New e-mail address: notice", audience: "anyone", when: "To the old address, when a change of address is asked for and when it is made.", component: EmailChangeNoticeEmail as Template },
  { slug: "email-change-taken", name: "New e-mail address: already in use", audience: "anyone", when: "To an address that already has an account, when another account asks to move to it.", component: EmailChangeTakenEmail as Template },
  { slug: "studio-test-message", name: "Test message", audience: "staff", when: "When an admin sends a test message from the mail settings.", component: StudioTestMessage as Template },
  { slug: "password-reset", name: "Password reset", audience: "anyone", when: "When someone asks to reset their password.", component: PasswordResetEmail as Template },
];

export type EmailTemplateInfo = { slug: string; name: string; audience: string; when: string };

export function listEmailTemplates(ctx: StudioContext): EmailTemplateInfo[] {
  assertAdmin(ctx);
  return TEMPLATES.map(({ slug, name, audience, when }) => ({ slug, name, audience, when }));
}

/** One template rendered with its PreviewProps: the HTML part and the plain-text part. */
export async function renderEmailPreview(ctx: StudioContext, slug: string): Promise<EmailTemplateInfo & { html: string; text: string }> {
  assertAdmin(ctx);
  const t = TEMPLATES.find((x) => x.slug === slug);
  if (!t) throw notFound("No e-mail template by that name.");
  const Component = t.component as ComponentType<Record<string, unknown>>;
  const element = <Component {...(t.component.PreviewProps ?? {})} />;
  const [html, text] = await Promise.all([render(element), render(element, { plainText: true })]);
  return { slug: t.slug, name: t.name, audience: t.audience, when: t.when, html, text };
}
