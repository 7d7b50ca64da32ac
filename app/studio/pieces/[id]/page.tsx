import type { Metadata } from "next";
import Link from "next/link";
import { FinishStackEditor } from "@/components/pieces/finish-stack-editor";
import { formatAreaBoth, formatDate, formatInstant, formatLargeVolume, formatLengthBoth } from "@/lib/format";
import { howWorkedOut, whyNow } from "@/lib/reminders/content";
import { PhotoUploader, PieceActions } from "@/components/pieces/piece-actions";
import { CareStatus, RegistrationStatus, WarrantyStatus } from "@/components/pieces/status";
import { ButtonLink } from "@/components/ui/button";
import { HandoverCard } from "@/components/clients/handover-card";
import { Card, PageHeader } from "@/components/ui/card";
import { Notice } from "@/components/ui/notice";
import { SpriteIcon } from "@/components/ui/sprite-icon";
import { VisitPhotoGrid } from "@/components/visits/visit-photo-grid";
import { requireStaff, requireStudioMember } from "@/lib/auth/guards";
import { forPage } from "@/lib/auth/page";
import { getSpecies } from "@/lib/care/species";
import { FINISH_CLASS_LABELS, PIECE_KIND_LABELS, RESIN_LABELS, SUN_LABELS, USE_LABELS } from "@/lib/care/vocabulary";
import { localDate } from "@/lib/care/dates";
import { careBasics } from "@/lib/pieces/care-basics";
import { cardCodeStatus } from "@/lib/pieces/card-status";
import { handoverStatus } from "@/lib/pieces/handover";
import { piecePage } from "@/lib/pieces/registry";
import { visitPhotosOf } from "@/lib/visits/photos";

export const metadata: Metadata = { title: "Piece" };

const HISTORY_WORDS: Record<string, string> = { "layer.added": "Added", "layer.updated": "Edited", "layer.moved": "Moved", "layer.removed": "Removed" };

function Row({ label, children }: { label: string; children: React.ReactNode }) {
  return (
    <div className="grid grid-cols-[9rem_1fr] gap-2 py-1.5 text-sm">
      <dt className="text-muted">{label}</dt>
      <dd>{children}</dd>
    </div>
  );
}

export default async function StudioPiecePage({ params }: { params: Promise<{ id: string }> }) {
  const { id } = await params;
  const d = await forPage(() => piecePage(id));
  const visitPhotos = await forPage(async () => visitPhotosOf(await requireStudioMember(), { pieceId: id }));
  const handover = await forPage(async () => handoverStatus(await requireStaff(), id));
  const card = await forPage(async () => {
    const ctx = await requireStaff();
    return { ...cardCodeStatus(ctx, id), timeZone: ctx.studio.timeZone };
  });
  const p = d.piece;
  const u = d.unitSystem;
  const species = [p.primarySpeciesId, p.secondarySpeciesId].filter(Boolean).map((s) => getSpecies(s!)?.commonName ?? s);
  const basics = careBasics(d.layers.map((l) => l.finishClass), p.resinKind, p.use);
  const size =
    p.shapeKind === "round"
      ? `Round, Ø ${formatLengthBoth(p.diameterMm, u)}`
      : p.shapeKind === "measured"
        ? "Irregular, measured area"
        : `${p.shapeKind === "oval" ? "Oval" : "Rectangle"}, ${formatLengthBoth(p.lengthMm, u)} × ${formatLengthBoth(p.widthMm, u)}`;

  return (
    <>
      <PageHeader
        title={p.title}
        lead={`${PIECE_KIND_LABELS[p.kind]} · delivered ${formatDate(p.deliveredOn)}${p.archivedAt ? " · archived" : ""}`}
        actions={
          <ButtonLink href={`/studio/pieces/${p.id}/edit`} variant="secondary">
            <SpriteIcon name="pencil" className="size-4" /> Edit record
          </ButtonLink>
        }
      />
      <div className="grid gap-4 lg:grid-cols-3">
        <div className="space-y-4 lg:col-span-2">
          <Card>
            <h2 className="mb-2 font-display text-xl font-semibold">Summary</h2>
            <dl className="divide-y divide-line">
              <Row label="Shape and size">{size}</Row>
              <Row label="Top area">{formatAreaBoth(d.area?.m2, u)}</Row>
              <Row label="Thickness">{formatLengthBoth(p.thicknessMm, u)}</Row>
              <Row label="Species">{species.join(" + ")}</Row>
              <Row label="Resin">
                {RESIN_LABELS[p.resinKind]}
                {p.resinKind !== "none" ? ` · poured ${p.resinPouredOn ? formatDate(p.resinPouredOn) : "—"} · ${formatLargeVolume(p.resinVolumeMl, u)}${p.resinTint ? ` · ${p.resinTint}` : ""}` : ""}
              </Row>
              <Row label="Base">{[p.baseMaterial, p.baseFinish].filter((x) => x && x !== "—").join(", ") || "—"}</Row>
              <Row label="Use and sun">
                {USE_LABELS[p.use]} · {SUN_LABELS[p.sun]}
              </Row>
              <Row label="Delivered">
                {formatDate(p.deliveredOn)}
                {p.deliveryAddress ? ` · ${p.deliveryAddress}` : ""}
              </Row>
              {p.internalNotes ? <Row label="Internal notes">{p.internalNotes}</Row> : null}
            </dl>
          </Card>

          <Card>
            <h2 className="mb-1 font-display text-xl font-semibold">Finish stack</h2>
            <p className="mb-4 text-sm text-muted">Outermost layer on top, the wood at the bottom. Adding, moving or removing a layer recomputes the care schedule; the audit log keeps the stack&apos;s history.</p>
            <FinishStackEditor pieceId={p.id} layers={d.layers} products={d.products} members={d.members} today={d.today} />
            {d.history.length ? (
              <details className="mt-4 text-sm">
                <summary className="min-h-11 cursor-pointer py-2 font-semibold">Stack history ({d.history.length})</summary>
                <ol className="space-y-1">
                  {d.history.map((h, i) => {
                    const after = (h.data.after ?? h.data.before) as { surface?: string; finishClass?: string; position?: number } | undefined;
                    return (
                      <li key={i} className="text-muted">
                        {formatInstant(h.createdAt, card.timeZone)} · {HISTORY_WORDS[h.action] ?? h.action} {after?.finishClass ? (FINISH_CLASS_LABELS[after.finishClass as keyof typeof FINISH_CLASS_LABELS] ?? after.finishClass).toLowerCase() : null} on the {after?.surface}
                        {h.action === "layer.moved" ? ` (to position ${(after?.position ?? 0) + 1})` : ""} · {h.actorName ?? "someone"}
                      </li>
                    );
                  })}
                </ol>
              </details>
            ) : null}
          </Card>

          <Card>
            <h2 className="mb-3 font-display text-xl font-semibold">Care schedule</h2>
            {d.scheduleError ? <Notice tone="warn">The care schedule could not be computed: {d.scheduleError}</Notice> : null}
            {d.schedule ? (
              <ol className="space-y-3">
                {d.schedule.tasks.map((t) => (
                  <li key={t.key} className="rounded-lg border border-line p-3">
                    <div className="flex flex-wrap items-center justify-between gap-2">
                      <p className="font-semibold">
                        {t.label} <span className="font-normal text-muted">({t.surface === "whole_piece" ? "whole piece" : t.surface})</span>
                      </p>
                      <span className="flex items-center gap-3 text-sm">
                        <CareStatus status={t.status} /> due {formatDate(t.dueOn)}
                      </span>
                    </div>
                    <ul className="mt-1 list-disc pl-5 text-sm text-muted">
                      {whyNow(t, { use: p.use, sun: p.sun }, "studio").map((r) => (
                        <li key={r}>{r}</li>
                      ))}
                    </ul>
                    <details className="mt-1 text-sm">
                      <summary className="flex min-h-11 cursor-pointer items-center font-medium text-resin">How this was worked out</summary>
                      <ul className="list-disc pl-5 text-muted">
                        {howWorkedOut(t).map((r, i) => (
                          <li key={i}>{r}</li>
                        ))}
                      </ul>
                    </details>
                  </li>
                ))}
              </ol>
            ) : null}
            {d.schedule?.notes.length ? <p className="mt-2 text-sm text-muted">A finish layer or care log entry dated after today was left out of this schedule.</p> : null}
          </Card>

          <Card>
            <h2 className="mb-3 font-display text-xl font-semibold">Timeline</h2>
            <ol className="relative space-y-3 border-l-2 border-line pl-4">
              {d.timeline.map((e, i) => (
                <li key={i} className="text-sm">
                  <span className="absolute -left-[7px] mt-1.5 size-3 rounded-full border-2 border-card bg-resin" aria-hidden />
                  <span className="font-medium">{formatDate(e.on, { short: true })}</span> · <span className="text-muted">{e.kind === "layer" ? "finish" : e.kind}</span> · {e.text}
                </li>
              ))}
            </ol>
          </Card>
        </div>

        <div className="space-y-4">
          <Card className="space-y-3">
            <h2 className="font-display text-xl font-semibold">Registration</h2>
            <RegistrationStatus registered={!!d.owner} />
            <p className="text-sm">
              {d.owner ? (
                <>
                  {p.clientId ? (
                    <Link href={`/studio/clients/${p.clientId}`} className="text-resin underline">
                      {d.owner.name}
                    </Link>
                  ) : (
                    d.owner.name
                  )}{" "}
                  · {d.owner.email}
                  {p.registeredAt ? ` · since ${formatInstant(p.registeredAt, card.timeZone)}` : ""}
                </>
              ) : (
                "Waiting for the owner to register with the code on the drawer card."
              )}
            </p>
            <div className="rounded-lg border border-line bg-paper p-3 text-sm">
              <p className="text-muted">Current registration code</p>
              <p className="font-mono text-lg font-semibold tracking-wider" aria-label="Current registration code">
                {card.code ?? "Can't be read — reissue the code to get a new one"}
              </p>
              <p className="text-muted">{d.owner ? "Already used by its owner." : "Read it to a caller who can't find the card; they type it on the Register a piece page."}</p>
            </div>
            {card.releasedAt ? (
              <Notice tone="warn" title={`Released by its owner on ${formatDate(localDate(card.releasedAt, card.timeZone))}`}>
                <p>The code on the old drawer card no longer works. The next owner registers with the new code above — print a new card to go with the piece.</p>
                <a href={`/api/pieces/${p.id}/card.pdf`} target="_blank" rel="noopener" className="mt-2 inline-flex min-h-11 items-center gap-2 font-semibold text-resin underline">
                  New drawer card with the new code (PDF)
                </a>
              </Notice>
            ) : null}
            <WarrantyStatus active={d.underWarranty} endsOn={d.warrantyEndsOn} />
            <PieceActions pieceId={p.id} registered={!!d.owner || !!p.registeredAt} archived={!!p.archivedAt} />
          </Card>

          <HandoverCard pieceId={p.id} status={handover} />

          <Card className="space-y-3">
            <h2 className="font-display text-xl font-semibold">Photos</h2>
            {d.photos.length ? (
              <ul className="grid grid-cols-2 gap-2">
                {d.photos.map((ph) => (
                  <li key={ph.id}>
                    <a href={ph.url} target="_blank" rel="noopener">
                      {/* eslint-disable-next-line @next/next/no-img-element -- served by our authorized file route */}
                      <img src={ph.thumbUrl} alt={`Photo of ${p.title}`} width={ph.width} height={ph.height} className="aspect-square w-full rounded-lg border border-line object-cover" />
                    </a>
                  </li>
                ))}
              </ul>
            ) : (
              <p className="text-sm text-muted">No photos yet.</p>
            )}
            <PhotoUploader pieceId={p.id} />
          </Card>

          {visitPhotos.length ? (
            <Card className="space-y-3">
              <h2 className="font-display text-xl font-semibold">Visit photos</h2>
              <VisitPhotoGrid photos={visitPhotos} label="Photos taken at visits" />
            </Card>
          ) : null}

          <Card className="space-y-2 text-sm">
            <h2 className="font-display text-xl font-semibold">Care basics on the card</h2>
            <ul className="list-disc space-y-1 pl-5">
              {basics.basics.map((b, i) => (
                <li key={i}>{b}</li>
              ))}
            </ul>
            {basics.cautions.map((c, i) => (
              <Notice key={i} tone="warn" title={i === 0 && basics.hasOil ? "Oily rags" : "Caution"}>
                {c}
              </Notice>
            ))}
          </Card>
        </div>
      </div>
    </>
  );
}
