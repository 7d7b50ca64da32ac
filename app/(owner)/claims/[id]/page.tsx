import type { Metadata } from "next";
import Link from "next/link";
import { MessageThread } from "@/components/claims/message-thread";
import { OwnerAddPhotos } from "@/components/claims/owner-add-photos";
import { PhotoGallery } from "@/components/claims/photo-gallery";
import { StateBadge } from "@/components/claims/state-badge";
import { Card } from "@/components/ui/card";
import { Notice } from "@/components/ui/notice";
import { requireUser } from "@/lib/auth/guards";
import { forPage } from "@/lib/auth/page";
import { CLAIM_CATEGORY_LABELS, decisionText } from "@/lib/claims/labels";
import { formatDate, formatInstant } from "@/lib/format";
import { getOwnerClaim } from "@/lib/claims/view-claim";
import { OPEN_STATES } from "@/lib/claims/states";

export const metadata: Metadata = { title: "Claim" };
export const dynamic = "force-dynamic";

export default async function OwnerClaimPage({ params }: { params: Promise<{ id: string }> }) {
  const { id } = await params;
  const user = await forPage(requireUser);
  const { claim, piece, studio, photos, messages, repair, mayWrite } = await forPage(async () => getOwnerClaim(user, id));
  const open = OPEN_STATES.includes(claim.state);
  return (
    <div className="space-y-6">
      <p className="text-sm">
        <Link href="/claims" className="inline-flex min-h-11 items-center text-resin underline">
          ← My claims
        </Link>
      </p>
      <header className="space-y-2">
        <h1 className="font-display text-3xl font-semibold tracking-tight">{piece.title}</h1>
        <div className="flex flex-wrap items-center gap-2">
          <StateBadge state={claim.state} audience="owner" />
          <span className="text-sm text-muted">
            {CLAIM_CATEGORY_LABELS[claim.category]} · filed {formatInstant(claim.createdAt, user.timeZone)} with {studio.name}
          </span>
        </div>
      </header>
      {!mayWrite ? (
        // Handed on: the photo picker and the message box were offered and refused every try (403).
        <Notice tone="info" title="You handed this piece on">
          This claim stays here for you to read. Only the piece&apos;s owner adds photos or messages; to reach {studio.name} about it, write to them
          {studio.email ? (
            <>
              {" at "}
              <a className="break-all underline" href={`mailto:${studio.email}`}>
                {studio.email}
              </a>
            </>
          ) : null}
          .
        </Notice>
      ) : claim.state === "awaiting_owner" ? (
        <Notice tone="warn" title="The studio needs your reply">
          Read their question below and answer with a message — add photos if they asked for them.
        </Notice>
      ) : null}
      {claim.decision ? (
        <Card className="space-y-1" aria-label="Decision">
          <p className="font-display text-xl font-semibold">{decisionText(claim.decision, claim.coveredPct)}</p>
          <p>{claim.decisionWords}</p>
          {claim.decisionReason ? <p className="whitespace-pre-wrap">“{claim.decisionReason}”</p> : null}
          <p className="text-sm text-muted">Decided {claim.decidedAt ? formatInstant(claim.decidedAt, user.timeZone) : "—"}</p>
        </Card>
      ) : null}
      {repair ? (
        <section aria-labelledby="repair-heading">
          <Card className="space-y-2">
            <h2 id="repair-heading" className="font-display text-xl font-semibold">
              The repair
            </h2>
            <p>{repair.stage}</p>
            {repair.jobId ? (
              <Link href={`/jobs/${repair.jobId}`} className="inline-flex min-h-11 items-center text-resin underline">
                Open the repair
              </Link>
            ) : null}
          </Card>
        </section>
      ) : null}
      <section className="space-y-3" aria-labelledby="photos-heading">
        <h2 id="photos-heading" className="font-display text-xl font-semibold">
          Photos
        </h2>
        <PhotoGallery photos={photos} />
        {/* Kept while the claim is open, full or not: its button says when there is no room left, and why the last
            pick left photos out stays on screen (it went with the picker when the claim filled up). */}
        {open && mayWrite ? <OwnerAddPhotos claimId={claim.id} existing={photos.length} /> : null}
      </section>
      <Card className="space-y-1">
        <h2 className="font-semibold">What you reported</h2>
        <p className="text-sm text-muted">Noticed {formatDate(claim.noticedOn)}</p>
        <p className="whitespace-pre-wrap">{claim.description}</p>
      </Card>
      <MessageThread claimId={claim.id} messages={messages} audience="owner" studioName={studio.name} timeZone={user.timeZone} canWrite={mayWrite && claim.state !== "closed"} />
    </div>
  );
}
