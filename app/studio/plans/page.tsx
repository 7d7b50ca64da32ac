import type { Metadata } from "next";
import Link from "next/link";
import { Card, PageHeader } from "@/components/ui/card";
import { requireStaff } from "@/lib/auth/guards";
import { forPage } from "@/lib/auth/page";
import { formatInstant } from "@/lib/format";
import { listStudioPlans } from "@/lib/plans/overview";
import { planPriceWords } from "@/lib/plans/price-words";

export const metadata: Metadata = { title: "Care plans" };

export default async function StudioPlansPage({ searchParams }: { searchParams: Promise<{ renewals?: string }> }) {
  const ctx = await forPage(requireStaff);
  const { renewals } = await searchParams;
  const plans = listStudioPlans(ctx, { renewalsDue: renewals === "due" });
  return (
    <>
      <PageHeader title="Care plans" lead={renewals === "due" ? "Plans that renew in the next 30 days." : "Every plan owners bought or you started, newest first."} />
      <Card>
        {plans.length === 0 ? (
          <p className="text-muted">No plans yet. Owners buy plans from their piece&apos;s page; you can start one from a client&apos;s page.</p>
        ) : (
          <ul className="divide-y divide-line">
            {plans.map((p) => (
              <li key={p.id} className="py-2">
                <Link href={`/studio/plans/${p.id}`} className="font-medium text-resin underline underline-offset-2">
                  {p.pieceTitle}
                </Link>
                <p className="text-sm text-muted">
                  {p.planName} · {p.stateLabel} · {p.ownerName ?? "no owner"} · {planPriceWords(p, ctx.studio.country, ctx.studio.timeZone)}
                  {p.periodEnd ? ` · paid to ${formatInstant(p.periodEnd, ctx.studio.timeZone)}` : ""} · {p.paidBy === "card" ? "by card" : "paid by other means"}
                </p>
              </li>
            ))}
          </ul>
        )}
      </Card>
    </>
  );
}
