import type { Metadata } from "next";
import Link from "next/link";
import { StaffPlanActions, type StaffPlanAction } from "@/components/plans/staff-plan-actions";
import { FinishTransferButton, HeldPaymentActions } from "@/components/plans/staff-plan-money";
import { Card, PageHeader } from "@/components/ui/card";
import { requireStaff } from "@/lib/auth/guards";
import { forPage } from "@/lib/auth/page";
import { formatInstant, formatMoney, formatZone } from "@/lib/format";
import { studioPlanDetail } from "@/lib/plans/cancel";
import { heldSettledForStaff } from "@/lib/plans/held";
import { studioPlanRow } from "@/lib/plans/overview";
import { planPriceWords } from "@/lib/plans/price-words";

export const metadata: Metadata = { title: "Care plan" };

const monthsWord = (n: number) => (n === 1 ? "one unused month" : `${n} unused months`);

export default async function StudioPlanPage({ params }: { params: Promise<{ id: string }> }) {
  const { id } = await params;
  const { ctx, detail } = await forPage(async () => {
    const ctx = await requireStaff();
    return { ctx, detail: studioPlanDetail(ctx, id) };
  });
  const row = studioPlanRow(ctx, id);
  const sub = detail.subscription;
  const tz = ctx.studio.timeZone;
  const money = (minor: number) => formatMoney(minor, sub.currency, ctx.studio.country);
  const day = (at: Date | number) => `${formatInstant(at, tz)} (${formatZone(tz)})`;
  const settled = detail.held ? null : heldSettledForStaff(sub, tz);
  const q = detail.cancel.quote;
  const action: StaffPlanAction = q
    ? {
        kind: "cancel",
        subscriptionId: sub.id,
        version: sub.version,
        refundMinor: q.refundMinor,
        endsOn: day(q.endsAt),
        refundWords:
          q.refundMinor > 0
            ? `${money(q.refundMinor)} goes back for ${monthsWord(q.months)}${sub.paidBy === "card" ? ", to the owner's card" : "; the studio pays it back, as the plan was paid by other means"}.`
            : "Nothing is paid back under this plan's terms.",
      }
    : detail.cancel.canUndo
      ? { kind: "keep", subscriptionId: sub.id, version: sub.version }
      : { kind: "none" };

  return (
    <>
      <PageHeader title={row ? `${row.planName} on ${row.pieceTitle}` : "Care plan"} lead={row ? `${row.stateLabel} · ${row.ownerName ?? "no owner"} · ${sub.paidBy === "card" ? "paid by card" : "paid by other means"}` : undefined} />
      <div className="grid gap-4 lg:grid-cols-2">
        <Card className="space-y-2">
          <h2 className="font-display text-xl font-semibold">The plan</h2>
          <p className="text-sm">
            {row ? planPriceWords(row, ctx.studio.country, tz) : money(sub.amountMinor)}
          </p>
          {sub.periodEnd ? <p className="text-sm">Paid to {day(sub.periodEnd)}.</p> : null}
          {sub.state === "ending" && (sub.endsAt ?? sub.periodEnd) ? <p className="text-sm">Cancelled: it ends on {day((sub.endsAt ?? sub.periodEnd)!)}.</p> : null}
          {detail.refund ? <p className="text-sm">Refund on cancellation: {money(detail.refund.amountMinor)}.</p> : null}
          {detail.refundRefused ? <p className="text-sm" data-testid="plan-refund-refused">{detail.refundRefused}</p> : null}
          {row ? (
            <p className="text-sm">
              <Link href={`/studio/pieces/${row.pieceId}`} className="underline underline-offset-2 hover:text-resin">
                Open the piece
              </Link>
            </p>
          ) : null}
          <FinishTransferButton subscriptionId={sub.id} words={detail.transferPending} timeZone={tz} />
          <StaffPlanActions action={action} />
        </Card>
        <Card className="space-y-2">
          <h2 className="font-display text-xl font-semibold">Payments held</h2>
          {detail.held ? (
            <HeldPaymentActions subscriptionId={sub.id} held={detail.held} />
          ) : settled ? (
            <p className="text-sm">{settled}</p>
          ) : (
            <p className="text-sm text-muted">None waiting. A card payment whose amount isn&apos;t the plan&apos;s price is held here for you to check instead of renewing the plan.</p>
          )}
        </Card>
      </div>
    </>
  );
}
