import type { Metadata } from "next";
import Link from "next/link";
import { CoveragePanel } from "@/components/claims/coverage-panel";
import { CreateRepairJobButton } from "@/components/claims/create-job-button";
import { MessageThread } from "@/components/claims/message-thread";
import { formatDate, formatInstant, formatSize, formatThickness, type TopShape, type UnitSystem, formatWait } from "@/lib/format";
import { PhotoGallery } from "@/components/claims/photo-gallery";
import { DecisionForm, ReviewButton } from "@/components/claims/staff-actions";
import { StateBadge } from "@/components/claims/state-badge";
import { Card } from "@/components/ui/card";
import { Notice } from "@/components/ui/notice";
import { requireStaff } from "@/lib/auth/guards";
import { forPage } from "@/lib/auth/page";
import { CARE_LOG_SOURCE_WORDS, CARE_TASK_LABELS, FINISH_CLASS_LABELS, PIECE_KIND_LABELS, RESIN_LABELS, SUN_LABELS, SURFACE_LABELS, USE_LABELS } from "@/lib/care/vocabulary";
import { getSpecies } from "@/lib/care/species";
import { SUGGESTION_LABELS } from "@/lib/claims/coverage-words";
import { CLAIM_CATEGORY_LABELS, decisionText } from "@/lib/claims/labels";
import { getStaffClaim } from "@/lib/claims/view-claim";
import { clientIdForOwner } from "@/lib/clients/get";
import { claimHandedOnNotes } from "@/lib/repairs/handed-on";
import { handedOnRefusal } from "@/lib/repairs/jobs";

export const metadata: Metadata = { title: "Claim" };
export const dynamic = "force-dynamic";

const ANSWER_WORD = { yes: "Yes", no: "No", unsure: "Not sure" } as const;
const QUESTION_WORD = { heat: "Heat nearby", chemicals: "Spills or chemicals", impact: "Knock or impact", usedOutdoors: "Used outdoors", directSun: "Direct sun" } as const;

/** The piece record's size for staff: the studio's units first, the other in brackets, then the thickness. */
function size(p: TopShape & { thicknessMm: number | null }, units: UnitSystem) {
  const other: UnitSystem = units === "metric" ? "imperial" : "metric";
  const mine = formatSize(p, units);
  const known = mine !== formatSize({ ...p, shapeKind: "" }, units);
  const top = known && p.shapeKind !== "measured" ? `${mine} (${formatSize(p, other).replace(/^(Round|Oval), /, "")})` : mine;
  return p.thicknessMm ? `${top}, ${formatThickness(p.thicknessMm, units)} thick` : top;
}

export default async function StudioClaimPage({ params }: { params: Promise<{ id: string }> }) {
  const { id } = await params;
  const v = await forPage(async () => {
    const ctx = await requireStaff();
    const found = getStaffClaim(ctx, id);
    return { ...found, ownerClientId: clientIdForOwner(ctx, found.owner.id) };
  });
  const { claim, piece, owner, coverage } = v;
  // The piece changed hands since the claim was filed: no job can be opened from it (lib/repairs/jobs.ts).
  const handedOn = handedOnRefusal("claim", { ownerId: owner.id }, piece);
  // Who follows the claim up once its owner has handed the piece on (lib/repairs/handed-on.ts): the studio.
  // The "No repair job" box then says only that no job can be opened; the notice says the rest.
  const { changedHands, noJob } = claimHandedOnNotes({ state: claim.state, ownerId: owner.id }, piece, owner.name, !!v.repair, handedOn);
  const a = claim.answers;
  const room = a.room;
  const waited = claim.waitMs;
  return (
    <div className="space-y-6">
      <p className="text-sm">
        <Link href="/studio/claims" className="inline-flex min-h-11 items-center text-resin underline">
          ← Claims
        </Link>
      </p>
      <header className="flex flex-wrap items-start justify-between gap-3">
        <div className="space-y-2">
          <h1 className="font-display text-3xl font-semibold tracking-tight">
            {CLAIM_CATEGORY_LABELS[claim.category]} · {piece.title}
          </h1>
          <p className="text-sm text-muted">
            {v.ownerClientId ? (
              <Link href={`/studio/clients/${v.ownerClientId}`} className="text-resin underline">
                {owner.name}
              </Link>
            ) : (
              owner.name
            )}{" "}
            ({owner.email}) · filed {formatInstant(new Date(claim.createdAt), v.studio.timeZone, { time: true })} ·{" "}
            {claim.firstAnsweredAt ? `first answer in ${formatWait(waited)}` : `waiting ${formatWait(waited)} for a first answer`}
          </p>
        </div>
        <StateBadge state={claim.state} audience="staff" />
      </header>
      {changedHands ? (
        <Notice tone="info" title="The piece changed hands">
          {changedHands}
        </Notice>
      ) : null}

      <div className="grid gap-6 lg:grid-cols-[minmax(0,3fr)_minmax(0,2fr)]">
        <div className="space-y-6">
          <section className="space-y-3" aria-labelledby="photos-heading">
            <h2 id="photos-heading" className="font-display text-xl font-semibold">
              Photos ({v.photos.length})
            </h2>
            <PhotoGallery photos={v.photos} />
          </section>
          <Card className="space-y-3">
            <h2 className="font-semibold">The owner&apos;s report</h2>
            <p className="text-sm text-muted">Noticed {formatDate(claim.noticedOn)}</p>
            <p className="whitespace-pre-wrap">{claim.description}</p>
            <dl className="grid grid-cols-[auto_1fr] gap-x-4 gap-y-1 text-sm">
              {(Object.keys(QUESTION_WORD) as (keyof typeof QUESTION_WORD)[]).map((k) => (
                <div key={k} className="contents">
                  <dt className="text-muted">{QUESTION_WORD[k]}</dt>
                  <dd>{ANSWER_WORD[a[k]]}</dd>
                </div>
              ))}
              <dt className="text-muted">Room</dt>
              <dd>
                {room && room.driestRh != null
                  ? `Driest ${room.driestTemp} °${room.unit} / ${room.driestRh} % RH, dampest ${room.dampestTemp} °${room.unit} / ${room.dampestRh} % RH${room.dailySwingPct != null ? `, up to ${room.dailySwingPct} % RH in a day` : ""}`
                  : "Not known"}
              </dd>
            </dl>
          </Card>
          <MessageThread claimId={claim.id} messages={v.messages} audience="staff" studioName={v.studio.name} timeZone={v.studio.timeZone} canWrite={claim.state !== "closed"} canAskForInfo={claim.state === "in_review" && v.ownerMayAnswer} writeNote={v.ownerMayAnswer ? undefined : `${owner.name} no longer holds the piece: they get your message by e-mail and can read it here, but can't reply.`} />
        </div>

        <div className="space-y-6">
          <Card className="space-y-3" aria-labelledby="decide-heading">
            <h2 id="decide-heading" className="font-display text-xl font-semibold">
              {claim.decision ? "Decision" : "Next step"}
            </h2>
            {claim.decision ? (
              <div className="space-y-1">
                <p className="text-lg font-semibold">{decisionText(claim.decision, claim.coveredPct)}</p>
                {claim.decisionReason ? <p className="whitespace-pre-wrap">“{claim.decisionReason}”</p> : null}
                <p className="text-sm text-muted">
                  Decided {claim.decidedAt ? formatInstant(claim.decidedAt, v.studio.timeZone) : "—"}; the check suggested “{claim.suggestion?.suggestion ? SUGGESTION_LABELS[claim.suggestion.suggestion] : "—"}”.
                </p>
              </div>
            ) : null}
            {claim.state === "submitted" ? <p className="text-sm text-muted">Start the review to decide, or to ask the owner something and wait for their answer. A message sent now leaves the claim new.</p> : null}
            {claim.state === "awaiting_owner" ? <p className="text-sm text-muted">Waiting for the owner&apos;s reply; their reply puts the claim back in review.</p> : null}
            <ReviewButton claimId={claim.id} state={claim.state} version={claim.version} />
            {claim.state === "in_review" ? (
              <DecisionForm claimId={claim.id} version={claim.version} suggestion={coverage.check?.suggestion ?? null} suggestedPct={coverage.check?.suggestedCoveredPct ?? null} />
            ) : null}
          </Card>
          {claim.state !== "declined" && (claim.decision || v.repair) ? (
            <section aria-labelledby="repair-heading">
              <Card className="space-y-2">
                <h2 id="repair-heading" className="font-display text-xl font-semibold">
                  Repair
                </h2>
                {v.repair ? (
                  <>
                    <p>
                      <Link href={`/studio/jobs/${v.repair.jobId}`} className="font-medium text-resin underline">
                        {v.repair.title}
                      </Link>{" "}
                      · {v.repair.stateLabel}
                    </p>
                    {v.repair.visit ? (
                      <p className="text-sm text-muted">
                        {v.repair.visit.state === "done" ? "Visit done" : "Visit booked"}: {v.repair.visit.when}
                      </p>
                    ) : null}
                  </>
                ) : noJob ? (
                  <Notice tone="warn" title="No repair job for this claim">
                    {noJob}
                  </Notice>
                ) : claim.state === "accepted" ? (
                  <>
                    <p className="text-sm text-muted">Create the repair job to price the work and send the owner a quote.</p>
                    <CreateRepairJobButton claimId={claim.id} />
                  </>
                ) : null}
              </Card>
            </section>
          ) : null}
          <CoveragePanel coverage={coverage} />
          <Card className="space-y-2">
            <h2 className="font-display text-xl font-semibold">Piece record</h2>
            <dl className="grid grid-cols-[auto_1fr] gap-x-4 gap-y-1 text-sm">
              <dt className="text-muted">Kind</dt>
              <dd>{PIECE_KIND_LABELS[piece.kind]}</dd>
              <dt className="text-muted">Size</dt>
              <dd>{size(piece, v.studio.unitSystem)}</dd>
              <dt className="text-muted">Species</dt>
              <dd>
                {getSpecies(piece.primarySpeciesId)?.commonName ?? piece.primarySpeciesId}
                {piece.secondarySpeciesId ? ` with ${getSpecies(piece.secondarySpeciesId)?.commonName ?? piece.secondarySpeciesId}` : ""}
              </dd>
              <dt className="text-muted">Resin</dt>
              <dd>
                {RESIN_LABELS[piece.resinKind]}
                {piece.resinTint ? `, ${piece.resinTint}` : ""}
                {piece.resinPouredOn ? `, poured ${formatDate(piece.resinPouredOn)}` : ""}
              </dd>
              <dt className="text-muted">Use</dt>
              <dd>
                {USE_LABELS[piece.use]} · {SUN_LABELS[piece.sun]}
              </dd>
              <dt className="text-muted">Delivered</dt>
              <dd>{formatDate(piece.deliveredOn)}</dd>
              {piece.internalNotes ? (
                <>
                  <dt className="text-muted">Notes</dt>
                  <dd>{piece.internalNotes}</dd>
                </>
              ) : null}
            </dl>
            <Link href={`/studio/pieces/${piece.id}`} className="inline-flex min-h-11 items-center text-sm text-resin underline">
              Open the piece record
            </Link>
          </Card>
          <Card className="space-y-2">
            <h2 className="font-display text-xl font-semibold">Finish stack</h2>
            {v.layers.length === 0 ? (
              <p className="text-sm text-muted">No finish layers recorded.</p>
            ) : (
              <ol className="space-y-1">
                {[...v.layers].reverse().map((l) => (
                  <li key={l.id} className="rounded-md border border-line bg-paper px-3 py-2 text-sm">
                    <span className="font-medium">{FINISH_CLASS_LABELS[l.finishClass]}</span> · {SURFACE_LABELS[l.surface]} · {l.coats} coat{l.coats === 1 ? "" : "s"} · {formatDate(l.appliedOn, { short: true })}
                    {l.productLabel ? <span className="block text-muted">{l.productLabel}{l.batchLot ? `, lot ${l.batchLot}` : ""}</span> : null}
                  </li>
                ))}
              </ol>
            )}
          </Card>
          <Card className="space-y-2">
            <h2 className="font-display text-xl font-semibold">Care log</h2>
            {v.careLog.length === 0 ? (
              <p className="text-sm text-muted">Nothing logged.</p>
            ) : (
              <ul className="space-y-1 text-sm">
                {v.careLog.map((e) => (
                  <li key={e.id}>
                    {formatDate(e.doneOn, { short: true })} · {CARE_TASK_LABELS[e.taskKind]}
                    {e.surface ? ` (${SURFACE_LABELS[e.surface].toLowerCase()})` : ""} · {CARE_LOG_SOURCE_WORDS[e.source]}
                    {e.productUsed ? ` · ${e.productUsed}` : ""}
                  </li>
                ))}
              </ul>
            )}
          </Card>
          <Notice tone="info" title="Before any repair">
            Follow the finish manufacturers&apos; instructions and local codes; anything electrical in a piece (lights, motorised frames) is for a licensed
            electrician. Heavy tops need two people to lift.
          </Notice>
        </div>
      </div>
    </div>
  );
}
