import type { Metadata } from "next";
import Link from "next/link";
import { Suspense } from "react";
import { PieceConversations } from "@/app/(owner)/_conversations/owner-conversations";
import { CareTimeline } from "@/components/owner/care-timeline";
import { FinishStack } from "@/components/ui/finish-stack";
import { FlashToast } from "@/components/owner/flash-toast";
import { ButtonLink } from "@/components/ui/button";
import { Card } from "@/components/ui/card";
import { SpriteIcon } from "@/components/ui/sprite-icon";
import { CarePlanSection } from "./care-plan-section";
import { requireUser } from "@/lib/auth/guards";
import { forPage } from "@/lib/auth/page";
import { formatDate, formatInstant, formatTimeLeft } from "@/lib/format";
import { getMyPiece, ownedPieceShell } from "@/lib/owner/pieces";
import { visitPhotosOf } from "@/lib/visits/photos";
import { VisitPhotoGrid } from "@/components/visits/visit-photo-grid";
import type { CautionKey } from "@/lib/care/cautions";
import type { SpriteIconName } from "@/components/ui/sprite-names";
import { exclusionLabel, WARRANTY_STATUS_LABELS, type WarrantyLineStatus } from "@/lib/owner/warranty";
import { ownerActor } from "@/lib/auth/actor";

export const metadata: Metadata = { title: "Piece" };

// Icons come from the sprite (components/ui/sprite-icon.tsx): this page shows about twenty, and as
// lucide-react components they were a quarter of its elements.
const WARRANTY_ICON: Record<WarrantyLineStatus, SpriteIconName> = { active: "shield-check", ended: "shield-x", not_transferred: "shield-off" };
const CAUTION_ICON: Record<CautionKey, SpriteIconName> = {
  oily_rags: "flame",
  fine_dust: "wind",
  epoxy_skin: "hand",
  polishing_heat: "thermometer-sun",
  heat_on_resin: "thermometer-sun",
  ventilation: "wind",
  product_label: "triangle-alert",
  heavy_top: "hard-hat",
  electrics: "zap",
};
const SURFACE_WORDS: Record<string, string> = { top: "top", base: "base", edges: "edges", whole_piece: "whole piece" };
// The guide's lists are fixed texts, never reordered on the page: their items are keyed by position. A
// text as its own key would travel twice in the page's payload (the key and the words). Sentences built
// from parts are one template string: each separate text part is a value of its own in the payload and
// a text node (with a <!-- --> between neighbours) in the HTML.

function Section({ id, title, children }: { id: string; title: string; children: React.ReactNode }) {
  return (
    <section id={id} aria-labelledby={`${id}-title`} className="scroll-mt-4 space-y-3">
      <h2 id={`${id}-title`} className="font-display text-2xl font-semibold">
        {title}
      </h2>
      {children}
    </section>
  );
}

export default async function OwnerPiecePage({ params }: { params: Promise<{ id: string }> }) {
  const { id } = await params;
  const user = await forPage(requireUser);
  const piece = await forPage(async () => getMyPiece(user, id));
  // Sections that are empty for most pieces ask their full queries only when the piece has something for them.
  const has = ownedPieceShell(user, id)?.has;
  const visitPhotos = has?.visits ? visitPhotosOf(ownerActor(user), { pieceId: id }) : [];
  const wood = piece.species.secondary ? `${piece.species.primary} and ${piece.species.secondary}` : piece.species.primary;
  const facts: [string, string][] = [
    ["Wood", wood],
    ["Top", piece.size],
    ...(piece.thickness ? ([["Thickness", piece.thickness]] as [string, string][]) : []),
    ...(piece.resin.kind === "none"
      ? []
      : ([["Resin", `${piece.resin.label}${piece.resin.tint ? `, ${piece.resin.tint}` : ""}${piece.resin.pouredOn ? ` (poured ${formatDate(piece.resin.pouredOn)})` : ""}`]] as [string, string][])),
    ["Base", [piece.base.material, piece.base.finish].filter((x) => x && x !== "—").join(", ") || "—"],
    ["Use", piece.use],
    ["Sun", piece.sun],
    ["Delivered", formatDate(piece.deliveredOn)],
    ...(piece.registeredAt ? ([["Registered", formatInstant(piece.registeredAt, piece.timeZone)]] as [string, string][]) : []),
  ];
  return (
    <article className="space-y-10">
      <Suspense>
        <FlashToast />
      </Suspense>
      <header className="space-y-3">
        <p className="text-sm font-medium text-muted">
          <Link href="/pieces" className="inline-flex min-h-11 items-center underline-offset-2 hover:underline">
            ← My pieces
          </Link>
        </p>
        <h1 className="font-display text-3xl font-semibold leading-tight tracking-tight">{piece.title}</h1>
        <p className="text-muted">
          {`${piece.kindLabel} · made by ${piece.studio.name}`}
        </p>
        {/* Actions on this piece. The claims area adds its "Report damage" link here. */}
        {/* Four actions: two by two from a tablet up (three across left the fourth alone on a row of its own). */}
        <div data-slot="piece-actions" className="grid grid-cols-1 gap-2 pt-1 sm:grid-cols-2">
          <ButtonLink href={piece.schedule.tasks[0] ? piece.schedule.tasks.find((t) => t.status !== "done")?.logUrl ?? piece.schedule.tasks[0].logUrl : `/pieces/${piece.id}/log`}>
            <SpriteIcon name="clipboard-check" className="size-4" />
            Log care
          </ButtonLink>
          <a
            href={piece.certificateUrl}
            download
            className="inline-flex min-h-11 items-center justify-center gap-2 rounded-lg border border-line bg-card px-4 py-2 text-sm font-semibold text-ink hover:border-resin hover:text-resin"
          >
            <SpriteIcon name="file-down" className="size-4" />
            Warranty certificate (PDF)
          </a>
          <ButtonLink href={`/pieces/${piece.id}/transfer`} variant="secondary">
            <SpriteIcon name="handshake" className="size-4" />
            Selling or giving it away?
          </ButtonLink>
          <ButtonLink href={`/pieces/${piece.id}/claim/new`} variant="secondary">
            Report damage
          </ButtonLink>
        </div>
      </header>

      {piece.guide.curing ? (
        <section role="status" aria-label="Curing" className="space-y-2 rounded-xl border border-resin/30 bg-resin-soft p-4">
          <p className="flex items-center gap-2 font-semibold">
            <SpriteIcon name="hourglass" className="size-5 shrink-0 text-resin" />
            {` ${piece.guide.curing.title}`}
          </p>
          <ul className="list-disc space-y-1 pl-5 text-sm">
            {piece.guide.curing.lines.map((l, i) => (
              <li key={i}>{l}</li>
            ))}
          </ul>
          <p className="text-sm text-muted">{piece.guide.curing.closing}</p>
        </section>
      ) : null}

      <Section id="schedule" title="Care schedule">
        <p className="text-sm text-muted">{`Today is ${formatDate(piece.schedule.today)} where you are. Each date counts from the last care of that kind.`}</p>
        <CareTimeline tasks={piece.schedule.tasks} careLog={piece.careLog} />
      </Section>

      <Section id="made-of" title="What it's made of">
        <Card className="p-0">
          <dl className="divide-y divide-line">
            {facts.map(([k, v]) => (
              <div key={k} className="grid grid-cols-[7rem_1fr] gap-3 px-4 py-2.5 text-sm">
                <dt className="text-muted">{k}</dt>
                <dd className="min-w-0 break-words">{v}</dd>
              </div>
            ))}
          </dl>
        </Card>
        <h3 className="pt-2 text-lg font-semibold">How it was finished</h3>
        <FinishStack layers={piece.layers} wood={wood} empty="The studio has not recorded a finish stack for this piece." />
      </Section>

      <Section id="guide" title="Care guide for this piece">
        <div role="note" aria-label="Cautions" className="space-y-2 rounded-xl border border-warn/30 bg-warn-soft p-4">
          <p className="flex items-center gap-2 font-semibold">
            <SpriteIcon name="triangle-alert" className="size-5 text-warn" /> Cautions
          </p>
          <ul className="space-y-3 text-sm">
            {piece.guide.cautions.map((c) => {
              return (
                <li key={c.key} className="flex gap-2">
                  <SpriteIcon name={CAUTION_ICON[c.key]} className="mt-0.5 size-4 shrink-0 text-warn" />
                  <span>
                    <strong>{`${c.title}.`}</strong>{` ${c.text}`}
                  </span>
                </li>
              );
            })}
          </ul>
        </div>
        <Card className="space-y-2">
          <h3 className="flex items-center gap-2 text-lg font-semibold">
            <SpriteIcon name="droplets" className="size-5 text-resin" />
            {piece.guide.outdoor ? "Outdoors, day to day" : "Where it stands"}
          </h3>
          <ul className="list-disc space-y-1 pl-5 text-sm">
            {piece.guide.placement.map((x, i) => (
              <li key={i}>{x}</li>
            ))}
          </ul>
        </Card>
        {piece.guide.sections.map((s) => (
          <Card key={s.finishClass} className="space-y-3">
            <div>
              <h3 className="text-lg font-semibold">{s.title}</h3>
              <p className="text-sm text-muted">
                {`On the ${s.surfaces.join(" and ")} · care task: ${s.task.toLowerCase()}`}
              </p>
            </div>
            <div>
              <h4 className="text-sm font-semibold">Every day</h4>
              <ul className="list-disc space-y-1 pl-5 text-sm">
                {s.everyday.map((x, i) => (
                  <li key={i}>{x}</li>
                ))}
              </ul>
            </div>
            <div>
              <h4 className="text-sm font-semibold">{`When the ${s.task.toLowerCase()} is due`}</h4>
              <ol className="list-decimal space-y-1 pl-5 text-sm">
                {s.steps.map((x, i) => (
                  <li key={i}>{x}</li>
                ))}
              </ol>
            </div>
            <div>
              <h4 className="text-sm font-semibold">What to use</h4>
              <ul className="list-disc space-y-1 pl-5 text-sm">
                {s.use.map((x, i) => (
                  <li key={i}>{x}</li>
                ))}
              </ul>
              <p className="mt-2 rounded-lg bg-resin-soft px-3 py-2 text-sm">
                <strong>How much: </strong>
                {s.quantity.text ?? s.quantity.why}
              </p>
            </div>
            <div>
              <h4 className="text-sm font-semibold">Avoid</h4>
              <ul className="list-disc space-y-1 pl-5 text-sm">
                {s.avoid.map((x, i) => (
                  <li key={i}>{x}</li>
                ))}
              </ul>
            </div>
          </Card>
        ))}
        <Card className="space-y-2">
          <h3 className="text-lg font-semibold">The yearly clean and check</h3>
          <ol className="list-decimal space-y-1 pl-5 text-sm">
            {piece.guide.annualCheck.map((x, i) => (
              <li key={i}>{x}</li>
            ))}
          </ol>
        </Card>
      </Section>

      <Section id="warranty" title="Warranty">
        {piece.warranty.lines.length === 0 ? (
          <Card>
            <p>{`No warranty terms were recorded for this piece. Ask ${piece.studio.name}${piece.studio.email ? ` (${piece.studio.email})` : ""}.`}</p>
          </Card>
        ) : (
          <>
            <p className="text-sm text-muted">
              {`${piece.warranty.termsName}: ${piece.studio.name}'s terms as they stood when the piece was delivered. Terms run from the delivery date.${piece.warranty.isOriginalOwner ? "" : " You are not the first owner: lines that don't pass to a new owner have ended for the piece."}`}
            </p>
            <ul className="space-y-3">
              {piece.warranty.lines.map((l) => {
                return (
                  <li key={l.category} className="rounded-xl border border-line bg-card p-4">
                    <div className="flex flex-wrap items-start gap-2">
                      <h3 className="min-w-0 flex-1 font-semibold">{l.label}</h3>
                      <span
                        className={`inline-flex items-center gap-1 rounded-full border px-2 py-0.5 text-xs font-semibold ${l.status === "active" ? "border-ok/30 bg-ok-soft text-ok" : "border-line bg-paper text-muted"}`}
                      >
                        <SpriteIcon name={WARRANTY_ICON[l.status]} className="size-3.5" />
                        {WARRANTY_STATUS_LABELS[l.status]}
                      </span>
                    </div>
                    <p className="mt-1 text-sm">
                      {l.status === "active" ? (
                        <>
                          <strong>{`${formatTimeLeft(l.daysLeft)} left`}</strong>
                          {` · until ${formatDate(l.endsOn)} `}
                        </>
                      ) : l.status === "ended" ? (
                        `Ended ${formatDate(l.endsOn)} `
                      ) : (
                        `Covered the first owner until ${formatDate(l.endsOn)} `
                      )}
                      <span className="text-muted">{`(${l.termMonths} months from delivery)`}</span>
                    </p>
                    {l.status === "active" ? (
                      <div
                        className="mt-2 h-2 overflow-hidden rounded-full bg-line"
                        role="meter"
                        aria-label={`Time left on ${l.label}`}
                        aria-valuemin={0}
                        aria-valuemax={100}
                        aria-valuenow={l.timeLeftPct}
                        aria-valuetext={`${formatTimeLeft(l.daysLeft)} left`}
                        data-time-left-pct={l.timeLeftPct}
                      >
                        <div className="h-full bg-resin" style={{ width: `${l.timeLeftPct}%` }} />
                      </div>
                    ) : null}
                    <p className="mt-2 text-sm text-muted">
                      {`${l.transfersToNewOwner ? "Passes to a new owner." : "Stays with the first owner."}${l.exclusions.length ? ` Not covered: ${l.exclusions.map(exclusionLabel).join(", ")}.` : ""}${l.careLogRequired ? " Logging care when it falls due keeps this line whole." : ""}`}
                    </p>
                  </li>
                );
              })}
            </ul>
          </>
        )}
      </Section>

      {has?.plans ? <CarePlanSection user={user} pieceId={piece.id} timeZone={piece.timeZone} /> : null}

      {visitPhotos.length ? (
        <Section id="visit-photos" title="Photos from studio visits">
          <VisitPhotoGrid photos={visitPhotos} label="Photos taken at studio visits" />
        </Section>
      ) : null}

      <Section id="care-log" title="Care log">
        {piece.careLog.length === 0 ? (
          <Card>
            <p className="text-muted">Nothing logged yet. When you care for the piece, tap “I did this” on the task — its next date moves on.</p>
          </Card>
        ) : (
          <ul className="space-y-2">
            {piece.careLog.map((e) => (
              <li key={e.id} className="flex items-start gap-3 rounded-xl border border-line bg-card p-3">
                <div className="min-w-0 flex-1 text-sm">
                  <p className="font-semibold">
                    {`${e.label} `}<span className="font-normal text-muted">{`· ${formatDate(e.doneOn)}`}</span>
                  </p>
                  <p className="text-muted">
                    {`${e.byLabel}${e.surface ? ` · ${SURFACE_WORDS[e.surface] ?? e.surface}` : ""}${e.productUsed ? ` · ${e.productUsed}` : ""}`}
                  </p>
                  {e.notes ? <p className="mt-1 break-words">{e.notes}</p> : null}
                  {e.photoUrl ? (
                    <a href={e.photoUrl} className="mt-1 inline-flex min-h-11 items-center text-resin underline underline-offset-2">
                      View the photo
                    </a>
                  ) : null}
                </div>
                {e.mine ? (
                  <Link
                    href={`/pieces/${piece.id}/log/${e.id}`}
                    className="inline-flex min-h-11 min-w-11 items-center justify-center gap-1 rounded-lg border border-line px-3 text-sm font-medium hover:border-resin hover:text-resin"
                  >
                    <SpriteIcon name="pencil" className="size-4" />
                    Edit<span className="sr-only">{` the ${e.label.toLowerCase()} entry of ${formatDate(e.doneOn)}`}</span>
                  </Link>
                ) : null}
              </li>
            ))}
          </ul>
        )}
      </Section>
      {has?.conversations ? <PieceConversations pieceId={piece.id} studioName={piece.studio.name} /> : null}
    </article>
  );
}
