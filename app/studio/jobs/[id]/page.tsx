import type { Metadata } from "next";
import Link from "next/link";
import { StaffJobActions } from "@/components/jobs/job-actions";
import { JobPayments } from "@/components/jobs/job-payments";
import { FinishRefundButton, JobRefundForm } from "@/components/jobs/job-refund";
import { QuoteBuilder } from "@/components/jobs/quote-builder";
import { QuoteDraftProvider } from "@/components/jobs/quote-draft";
import { QuoteSummary } from "@/components/jobs/quote-summary";
import { Card, PageHeader } from "@/components/ui/card";
import { Notice } from "@/components/ui/notice";
import { StatusBadge } from "@/components/ui/status";
import { requireStaff } from "@/lib/auth/guards";
import { forPage } from "@/lib/auth/page";
import { formatInstant } from "@/lib/format";
import { cautionsFor } from "@/lib/care/cautions";
import { FINISH_CLASS_LABELS, type CareTaskKind } from "@/lib/care/vocabulary";
import { currencyExponent } from "@/lib/care/quote";
import { jobFigures } from "@/lib/repairs/figures";
import { getStudioJob } from "@/lib/repairs/jobs";
import { checkoutCloseWords, handedOnWords } from "@/lib/repairs/handed-on";
import { priceListOf } from "@/lib/repairs/price-list";
import { alsoSurfaceLabel, topOnlyWords, unsizedWords } from "@/lib/repairs/pricing";
import { refundableOf, refundRows, refundsOfJob } from "@/lib/repairs/refund-rows";
import { canMove, coverWords, JOB_STATE_TONES, jobStateLabel, jobTotalLabel, paymentCounts, QUOTE_EDITABLE, receiptPayment } from "@/lib/repairs/states";
import { ButtonLink } from "@/components/ui/button";
import { visitOfJob } from "@/lib/visits/job-visit";
import { localDate } from "@/lib/care/dates";
import { VisitPhotoGrid } from "@/components/visits/visit-photo-grid";

export const metadata: Metadata = { title: "Repair job" };

export default async function StudioJobPage({ params }: { params: Promise<{ id: string }> }) {
  const { id } = await params;
  const ctx = await forPage(requireStaff);
  const view = await forPage(async () => getStudioJob(ctx, id));
  const { visit } = visitOfJob(ctx, id);
  const { job, piece, owner, payments, products, studio, unsized, topOnly, sizeFields } = view;
  const q = job.quoteInput;
  const initial = { title: job.title, tasks: q.tasks ?? [], repairs: q.repairs ?? [], productIds: q.productIds ?? [], coats: q.coats ?? 1, travel: q.travel ?? false, coveredPct: job.coveredPct, notes: job.notes, areasM2: q.areasM2 ?? {}, alsoSurfaces: q.alsoSurfaces ?? {} };
  const figures = jobFigures(job, studio);
  const editable = QUOTE_EDITABLE.includes(job.state);
  const paid = payments.some(paymentCounts);
  // A refund marked but not yet taken by the payment service (it could not be reached): staff can ask again.
  const refundOwed = job.state === "cancelled" && payments.some((p) => p.refundReason && !p.refundRequestedAt && p.status !== "refunded");
  const refunds = refundsOfJob(job);
  const refundable = refundableOf(job, payments, refunds);
  const refunded = refundRows(payments, refunds, studio.timeZone, studio.country);
  const handedOn = handedOnWords(job, piece, owner?.name ?? null);
  // Payment pages a release of the piece asked Stripe to close: one paid first, or one Stripe refused to close.
  const closeWords = checkoutCloseWords(studio.id, job.id, studio.timeZone, owner?.name ?? null);
  return (
    <>
      <PageHeader
        title={job.title}
        lead={`${piece.title} · ${owner ? owner.name : "no registered owner"}`}
        actions={<StatusBadge label={jobStateLabel(job)} tone={JOB_STATE_TONES[job.state]} />}
      />
      {job.claimId ? (
        <p className="-mt-4 mb-4 text-sm">
          <Link href={`/studio/claims/${job.claimId}`} className="inline-flex min-h-11 items-center text-resin underline">
            The claim this repair is for
          </Link>
        </p>
      ) : null}
      {handedOn || closeWords.length ? (
        <Notice tone={closeWords.length ? "warn" : "info"} title="The piece changed hands" className="mb-4">
          {handedOn ? <p>{handedOn}</p> : null}
          {closeWords.map((w) => (
            <p key={w}>{w}</p>
          ))}
        </Notice>
      ) : null}
      <QuoteDraftProvider>
      <div className="grid gap-6 lg:grid-cols-[3fr_2fr]">
        <Card className="space-y-4">
          <h2 className="font-semibold">Quote</h2>
          <QuoteBuilder
            jobId={job.id}
            initial={initial}
            lines={job.lines.map(({ kind, source, ref, description, quantity, unit, unitPriceMinor, proposed }) => ({ kind, source, ...(ref ? { ref } : {}), description, quantity, unit, unitPriceMinor, proposed }))}
            editable={editable}
            coveredField={coverWords(job).field}
            unsized={unsized.map(unsizedWords)}
            topOnly={topOnly.map((w) => ({ task: w.task, words: topOnlyWords(w), choices: w.surfaces.filter((s) => s !== "top").map((s) => ({ surface: s, label: alsoSurfaceLabel(s, w.areasM2[s], studio.unitSystem) })) }))}
            sizeFields={sizeFields}
            units={studio.unitSystem}
            currency={job.currency}
            country={studio.country}
            exponent={currencyExponent(job.currency)}
            repairs={priceListOf(studio).map((r) => ({ key: r.key, label: r.label }))}
            products={products.map((p) => ({ id: p.id, name: p.name, finishClassLabel: FINISH_CLASS_LABELS[p.finishClass] }))}
          />
          <Notice tone="warn" title="Work safely">
            <ul className="space-y-1">
              {cautionsFor({
                tasks: initial.tasks as CareTaskKind[],
                applying: products.filter((p) => initial.productIds.includes(p.id)).map((p) => p.finishClass),
                hasResin: piece.resinKind !== "none",
                audience: "technician",
              }).map((c) => (
                <li key={c.key}>
                  <strong>{c.title}.</strong> {c.text}
                </li>
              ))}
            </ul>
          </Notice>
        </Card>
        <div className="space-y-6">
          <Card className="space-y-4">
            <QuoteSummary figures={figures} showProposed totalLabel={jobTotalLabel(job.state, paid)} />
            <StaffJobActions
              jobId={job.id}
              canSend={["draft", "quoted"].includes(job.state) && Boolean(owner)}
              canCancel={canMove(job.state, "cancelled")}
              paid={paid}
              refundOwed={refundOwed}
            />
            {job.quoteVersion ? <p className="text-sm text-muted">Quote sent {job.quoteVersion} time{job.quoteVersion === 1 ? "" : "s"}.</p> : null}
            {receiptPayment(payments) ? (
              <a className="text-sm text-resin underline" href={`/api/jobs/${job.id}/receipt`}>
                Download the receipt (PDF)
              </a>
            ) : null}
          </Card>
          {["paid", "covered", "scheduled"].includes(job.state) || visit ? (
            <Card className="space-y-3">
              <h2 className="font-semibold">Visit</h2>
              {visit && visit.state !== "cancelled" ? (
                <p className="text-sm">
                  {visit.state === "done" ? "Done: " : ""}
                  <strong>{visit.when}</strong> with {visit.technicianName} · {visit.location}
                </p>
              ) : (
                <p className="text-sm text-muted">No visit booked.</p>
              )}
              {visit?.state === "booked" ? (
                // The technician's sheet for that day: where the report is filed (the office may file it before the visit starts, with a reason).
                <Link className="inline-flex min-h-11 items-center text-sm text-resin underline" href={`/studio/today?date=${localDate(Date.parse(visit.start), studio.timeZone)}&technician=${visit.technicianId}`}>
                  Open the visit sheet to file the report
                </Link>
              ) : null}
              {visit?.state === "done" ? <p className="text-sm text-muted">{visit.signedOffAt ? "The owner signed off the work." : "Waiting for the owner's sign-off (a link in the report mail)."}</p> : null}
              {visit?.photos.length ? <VisitPhotoGrid photos={visit.photos} label="Photos from the visit" /> : null}
              {["paid", "covered", "scheduled"].includes(job.state) ? (
                <ButtonLink variant={job.state === "scheduled" ? "secondary" : "primary"} href={`/studio/visits/book/${job.id}`}>
                  {job.state === "scheduled" ? "Move or cancel the visit" : "Book a visit"}
                </ButtonLink>
              ) : null}
            </Card>
          ) : null}
          {refundable || refunded.length ? (
            <Card className="space-y-3">
              <h2 className="font-semibold">Money given back</h2>
              {refunded.length ? (
                <ul className="space-y-2 text-sm">
                  {refunded.map((r, i) => (
                    <li key={i} className="flex justify-between gap-3">
                      <span>
                        {r.on ? r.on : "Being paid back"}
                        <br />
                        <span className="text-muted">{r.why}</span>
                        {r.pendingId ? (
                          <>
                            <span className="block text-muted">The payment service hasn’t confirmed this refund yet. Asking again can’t give it back twice.</span>
                            <FinishRefundButton jobId={job.id} refundId={r.pendingId} />
                          </>
                        ) : null}
                      </span>
                      <span className="shrink-0 font-semibold">{r.amount}</span>
                    </li>
                  ))}
                </ul>
              ) : null}
              {refundable && refundable.refundableMinor > 0 ? (
                <JobRefundForm
                  jobId={job.id}
                  version={job.version}
                  refundableMinor={refundable.refundableMinor}
                  currency={refundable.payment.currency}
                  exponent={currencyExponent(refundable.payment.currency)}
                  country={studio.country}
                  stateLabel={jobStateLabel(job)}
                />
              ) : refundable ? (
                <p className="text-sm text-muted">Everything paid for this job has been given back.</p>
              ) : null}
            </Card>
          ) : null}
          <Card className="space-y-2">
            <h2 className="font-semibold">Payments</h2>
            <JobPayments currentQuoteVersion={job.quoteVersion} country={studio.country} payments={payments.map((p) => ({ ...p, openedOn: formatInstant(p.createdAt, studio.timeZone) }))} />
          </Card>
          <p className="text-sm">
            <Link className="text-resin underline" href={`/studio/pieces/${piece.id}`}>Open the piece record</Link>
          </p>
        </div>
      </div>
      </QuoteDraftProvider>
    </>
  );
}
