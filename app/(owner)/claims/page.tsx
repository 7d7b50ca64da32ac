import type { Metadata } from "next";
import Link from "next/link";
import { StateBadge } from "@/components/claims/state-badge";
import { Card, PageHeader } from "@/components/ui/card";
import { requireUser } from "@/lib/auth/guards";
import { forPage } from "@/lib/auth/page";
import { CLAIM_CATEGORY_LABELS, decisionText } from "@/lib/claims/labels";
import { formatInstant } from "@/lib/format";
import { ownerClaimsOverview } from "@/lib/claims/list";

export const metadata: Metadata = { title: "My claims" };
export const dynamic = "force-dynamic";

export default async function OwnerClaimsPage() {
  const { claims, pieces, timeZone } = await forPage(async () => {
    const user = await requireUser();
    return { ...ownerClaimsOverview(user), timeZone: user.timeZone };
  });
  return (
    <>
      <PageHeader title="My claims" lead="Damage or a defect you reported to a studio, and where each report stands." />
      {claims.length === 0 ? (
        <Card className="mb-6 text-muted">You haven&apos;t reported any damage.</Card>
      ) : (
        <ul className="mb-8 space-y-3">
          {claims.map((c) => (
            <li key={c.id}>
              <Link href={`/claims/${c.id}`} className="block rounded-xl border border-line bg-card p-4 hover:border-resin">
                <div className="flex flex-wrap items-center justify-between gap-2">
                  <span className="font-display text-lg font-semibold">{c.pieceTitle}</span>
                  <StateBadge state={c.state} audience="owner" />
                </div>
                <p className="mt-1 text-sm text-muted">
                  {CLAIM_CATEGORY_LABELS[c.category]} · {c.studioName} · filed {formatInstant(c.createdAt, timeZone)} · {c.photos} photo{c.photos === 1 ? "" : "s"}
                  {/* A declined claim's badge already says so; an accepted one's says only "Accepted", so the line adds how. */}
                  {c.decision && c.decision !== "declined" ? ` · ${decisionText(c.decision, c.coveredPct)}` : ""}
                </p>
              </Link>
            </li>
          ))}
        </ul>
      )}
      {pieces.length > 0 ? (
        <section aria-labelledby="report-heading" className="space-y-3">
          <h2 id="report-heading" className="font-display text-xl font-semibold">
            Report damage
          </h2>
          <ul className="space-y-2">
            {pieces.map((p) => (
              <li key={p.id}>
                <Link href={`/pieces/${p.id}/claim/new?from=claims`} className="flex min-h-11 items-center justify-between rounded-lg border border-line bg-card px-4 py-3 hover:border-resin">
                  <span>
                    {p.title} <span className="text-sm text-muted">· {p.studioName}</span>
                  </span>
                  <span aria-hidden className="text-resin">→</span>
                </Link>
              </li>
            ))}
          </ul>
        </section>
      ) : null}
    </>
  );
}
