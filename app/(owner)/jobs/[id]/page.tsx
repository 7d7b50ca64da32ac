import type { Metadata } from "next";
import { JobConversation } from "@/app/(owner)/_conversations/owner-conversations";
import { ApproveAndPay, OwnerCancelJob } from "@/components/jobs/job-actions";
import { QuoteSummary } from "@/components/jobs/quote-summary";
import { Card, PageHeader } from "@/components/ui/card";
import { Notice } from "@/components/ui/notice";
import { StatusBadge } from "@/components/ui/status";
import { requireUser } from "@/lib/auth/guards";
import { forPage } from "@/lib/auth/page";
import { getOwnerJob } from "@/lib/repairs/jobs";
import { asSentence, refundsOfJob } from "@/lib/repairs/refund-rows";
import { syncReturnedCheckout } from "@/lib/repairs/payment";
import { coverWords, JOB_STATE_TONES, OWNER_CAN_DECLINE, OWNER_REFUND_REASON_LABELS, jobIsCovered, jobStateLabel, jobTotalLabel, paymentCounts, receiptPayment } from "@/lib/repairs/states";
import { formatInstant, formatMoney } from "@/lib/format";
import { jobFigures } from "@/lib/repairs/figures";
import { ButtonLink } from "@/components/ui/button";
import { visitOfJob } from "@/lib/visits/job-visit";
import { VisitPhotoGrid } from "@/components/visits/visit-photo-grid";
import Link from "next/link";
import { ownerActor } from "@/lib/auth/actor";
import { ownerActsOnJob } from "@/lib/repairs/owner-reach";

export const metadata: Metadata = { title: "Repair" };

export default async function OwnerJobPage({ params, searchParams }: { params: Promise<{ id: string }>; searchParams: Promise<Record<string, string | undefined>> }) {
  const { id } = await params;
  const query = await searchParams;
  const user = await forPage(requireUser);
  // Back from the payment page: settle with Stripe now instead of waiting for the webhook.
  if (query.checkout === "success" && query.session_id && query.session_id.length < 200) {
    await syncReturnedCheckout(user, id, query.session_id).catch((e: unknown) => console.error("checkout sync failed", e));
  }
  const { job, piece, studio, payments, planName } = await forPage(async () => getOwnerJob(user, id));
  // Money the studio gave back on a job that stays as it is, each with its reason (lib/repairs/refunds.ts).
  const givenBack = refundsOfJob(job);
  const { visit } = visitOfJob(ownerActor(user), id);
  // A former owner's paid repair is their record only (lib/repairs/owner-reach.ts): booking answered "not found".
  const acts = ownerActsOnJob(job, piece);
  const paid = payments.some(paymentCounts);
  // Every payment given back, whoever started it: the product's own refunds and the studio's when it cancels a paid job.
  const refunded = payments.flatMap((p) => (p.refundReason !== null ? [{ ...p, reason: p.refundReason }] : []));
  const returnedRefunded = refunded.some((p) => p.checkoutSessionId === query.session_id);
  return (
    <>
      <p className="mb-2 text-sm">
        <Link href="/jobs" className="inline-flex min-h-11 items-center text-resin underline">
          ← My repairs
        </Link>
      </p>
      <PageHeader title={job.title} lead={`${piece.title} · ${studio.name}`} actions={<StatusBadge label={jobStateLabel(job)} tone={JOB_STATE_TONES[job.state]} />} />
      <div className="space-y-4">
        {job.claimId ? (
          <Link href={`/claims/${job.claimId}`} className="inline-flex min-h-11 items-center text-resin underline">
            The claim this repair is for
          </Link>
        ) : null}
        {query.checkout === "success" && job.state === "paid" ? (
          <Notice tone="ok" title="Paid — thank you">Your receipt is on its way by e-mail. You can book your visit below.</Notice>
        ) : null}
        {refunded.map((p) => (
          <Notice key={p.id} tone="info" title="Payment refunded">
            {givenBack.some((r) => r.paymentId === p.id)
              ? `We refunded the rest of your payment, ${formatMoney(p.amountMinor - givenBack.filter((r) => r.paymentId === p.id).reduce((sum, r) => sum + r.amountMinor, 0), p.currency, studio.country)}`
              : `We refunded your payment of ${formatMoney(p.amountMinor, p.currency, studio.country)} in full`}
            : {OWNER_REFUND_REASON_LABELS[p.reason]}. Refunds usually show on
            your statement within 5–10 business days.
          </Notice>
        ))}
        {givenBack.map((r) => (
          <Notice key={r.id} tone="info" title={`${studio.name} gave back ${formatMoney(r.amountMinor, r.currency, studio.country)}`}>
            {r.refundedAt ? `On ${formatInstant(r.refundedAt, user.timeZone || studio.timeZone, { time: true })}, to the card you paid with` : "It is on its way to the card you paid with"}. Their reason: {asSentence(r.reason)} Refunds usually show on your statement within 5–10
            business days.
          </Notice>
        ))}
        {query.checkout === "success" && job.state !== "paid" && !returnedRefunded ? (
          <Notice tone="info" title="Confirming your payment">Stripe is still confirming the payment. Reload this page in a moment.</Notice>
        ) : null}
        {query.checkout === "cancelled" && job.state === "approved" ? (
          <Notice tone="warn" title="Payment not completed">Your card was not charged. You can try again, with the same card or another one.</Notice>
        ) : null}
        {!acts ? (
          <Notice tone="info" title="You handed this piece on">
            This repair and its receipt stay here for you. Its visits are for the piece&apos;s new owner to book.
          </Notice>
        ) : null}
        {acts && job.state === "covered" ? <Notice tone="ok" title={coverWords(job, planName).yours}>There is nothing to pay. You can book your visit below.</Notice> : null}
        {acts && (job.state === "paid" || job.state === "covered" || job.state === "scheduled" || visit?.state === "done") ? (
          <Card className="space-y-3">
            <h2 className="font-semibold">Your visit</h2>
            {visit && visit.state !== "cancelled" ? (
              <p>
                {visit.state === "done" ? "Done: " : ""}
                <strong>{visit.when}</strong> with {visit.technicianName}
                <br />
                <span className="text-sm text-muted">{visit.location}</span>
              </p>
            ) : (
              <p className="text-muted">No visit booked yet. Pick a time that suits you.</p>
            )}
            {visit?.photos.length ? <VisitPhotoGrid photos={visit.photos} label="Photos from the visit" /> : null}
            {job.state === "scheduled" ? (
              <ButtonLink variant="secondary" href={`/jobs/${job.id}/book`}>Change or cancel the visit</ButtonLink>
            ) : job.state === "paid" || job.state === "covered" ? (
              <ButtonLink href={`/jobs/${job.id}/book`}>Book your visit</ButtonLink>
            ) : null}
          </Card>
        ) : null}
        <Card className="space-y-3">
          <QuoteSummary figures={jobFigures(job, studio)} totalLabel={jobTotalLabel(job.state, paid)} />
          {receiptPayment(payments) ? (
            <a className="inline-block text-sm text-resin underline" href={`/api/jobs/${job.id}/receipt`}>
              Download your receipt (PDF)
            </a>
          ) : null}
        </Card>
        {OWNER_CAN_DECLINE.includes(job.state) ? (
          <div className="flex flex-col gap-3 sm:flex-row">
            <ApproveAndPay jobId={job.id} label={job.state === "quoted" ? "Approve and pay" : "Pay now"} quoteVersion={job.quoteVersion} totalMinor={job.totalMinor} />
            <OwnerCancelJob jobId={job.id} />
          </div>
        ) : null}
        {jobIsCovered(job) ? null : <p className="text-sm text-muted">Payment is handled by Stripe; Grainward never sees your card number.</p>}
        <JobConversation jobId={job.id} studioName={studio.name} />
      </div>
    </>
  );
}
