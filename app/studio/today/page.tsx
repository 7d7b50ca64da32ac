import type { Metadata } from "next";
import Link from "next/link";
import { Card, PageHeader } from "@/components/ui/card";
import { Notice } from "@/components/ui/notice";
import { SpriteIcon } from "@/components/ui/sprite-icon";
import { StatusBadge } from "@/components/ui/status";
import { VisitPhotoGrid } from "@/components/visits/visit-photo-grid";
import { VisitReportForm } from "@/components/visits/visit-report-form";
import { FinishStack } from "@/components/ui/finish-stack";
import { requireStudioMember } from "@/lib/auth/guards";
import { forPage } from "@/lib/auth/page";
import { addDays } from "@/lib/care/dates";
import { getSpecies } from "@/lib/care/species";
import type { Surface } from "@/lib/care/vocabulary";
import { CLAIM_CATEGORY_LABELS } from "@/lib/claims/labels";
import { formatAndList, formatArea, formatClock, formatDate, formatVolume } from "@/lib/format";
import { technicianDay } from "@/lib/visits/technician-day";

export const metadata: Metadata = { title: "My day" };
export const dynamic = "force-dynamic";

/** Where a product goes, completing "for 2 coats on …". */
const ON_SURFACE: Record<Surface, string> = { top: "this top", base: "the base", edges: "the edges" };

const dayTitle = (date: string) => formatDate(date, { weekday: "long" });

export default async function TechnicianDayPage({ searchParams }: { searchParams: Promise<Record<string, string | undefined>> }) {
  const q = await searchParams;
  const ctx = await forPage(requireStudioMember);
  const day = await forPage(async () => technicianDay(ctx, { date: q.date, technicianId: q.technician }));
  const tz = day.timeZone;
  const staff = ctx.role !== "technician";
  const nav = (date: string) => `/studio/today?date=${date}${q.technician ? `&technician=${q.technician}` : ""}`;
  return (
    <div className="mx-auto max-w-2xl">
      <PageHeader
        title={day.otherTechnicianName ? `${day.otherTechnicianName}'s visits` : day.date === day.today ? "My day" : "Visits"}
        lead={dayTitle(day.date)}
      />
      <nav aria-label="Day" className="mb-5 flex items-center justify-between gap-2">
        <Link href={nav(addDays(day.date, -1))} className="inline-flex min-h-11 items-center gap-1 rounded-lg border border-line bg-card px-3 text-sm font-semibold">
          <SpriteIcon name="chevron-left" className="size-4" /> Previous day
        </Link>
        {day.date !== day.today ? (
          <Link href={nav(day.today)} className="inline-flex min-h-11 items-center px-2 text-sm font-semibold text-resin underline">
            Today
          </Link>
        ) : null}
        <Link href={nav(addDays(day.date, 1))} className="inline-flex min-h-11 items-center gap-1 rounded-lg border border-line bg-card px-3 text-sm font-semibold">
          Next day <SpriteIcon name="chevron-right" className="size-4" />
        </Link>
      </nav>
      {day.items.length === 0 ? (
        <Card>
          <p className="font-semibold">No visits booked for {day.otherTechnicianName ?? "you"} on this day.</p>
          <p className="text-muted">Booked touch-up visits are listed here in order, with the address and what to bring.</p>
        </Card>
      ) : (
        <ol className="space-y-6">
          {day.items.map((item, i) => {
            const wood = getSpecies(item.piece.primarySpeciesId)?.commonName ?? "Wood";
            return (
              <li key={item.visit.id}>
                <Card className="space-y-4 p-4">
                  <div className="flex flex-wrap items-start justify-between gap-2">
                    <div>
                      <p className="flex items-center gap-1.5 text-sm font-semibold text-resin">
                        <SpriteIcon name="clock" className="size-4" />
                        {i + 1}. {formatClock(Date.parse(item.visit.start), tz)}–{formatClock(Date.parse(item.visit.end), tz, { named: true })}
                      </p>
                      <h2 className="font-display text-xl font-semibold">{item.piece.title}</h2>
                      <p className="text-sm text-muted">
                        {staff ? (
                          <Link href={`/studio/jobs/${item.job.id}`} className="text-resin underline">
                            {item.job.title}
                          </Link>
                        ) : (
                          item.job.title
                        )}
                        {item.claim && staff ? (
                          <>
                            {" · "}
                            <Link href={`/studio/claims/${item.claim.id}`} className="text-resin underline">
                              the claim
                            </Link>
                          </>
                        ) : null}
                      </p>
                    </div>
                    <StatusBadge label={item.visit.state === "done" ? "Report filed" : "To do"} tone={item.visit.state === "done" ? "ok" : "progress"} />
                  </div>
                  <p className="flex gap-2 break-words">
                    <SpriteIcon name="map-pin" className="mt-0.5 size-5 shrink-0 text-resin" />
                    <span>
                      <span className="font-semibold">{item.visit.locationKind === "studio" ? "At the studio: " : ""}</span>
                      <a href={item.visit.mapsUrl} className="text-resin underline" target="_blank" rel="noopener noreferrer">
                        {item.visit.location}
                      </a>
                      <span className="block text-sm text-muted">Opens the address in a map.</span>
                    </span>
                  </p>
                  {item.ownerName ? (
                    <p className="flex flex-wrap items-center gap-x-2 gap-y-1">
                      <SpriteIcon name="phone" className="size-5 shrink-0 text-resin" />
                      <span className="font-semibold">{item.ownerName}</span>
                      {item.ownerPhone ? (
                        <a href={`tel:${item.ownerPhone.tel}`} className="inline-flex min-h-11 items-center text-resin underline" aria-label={`Call ${item.ownerName}, ${item.ownerPhone.display}`}>
                          {item.ownerPhone.display}
                        </a>
                      ) : (
                        <span className="text-sm text-muted">No phone number on record; the studio office has their e-mail.</span>
                      )}
                    </p>
                  ) : null}
                  {item.job.tasks.length ? <p className="text-sm">Tasks: {item.job.tasks.join(", ")}</p> : null}
                  {item.job.notes ? (
                    <section className="space-y-1">
                      <h3 className="font-semibold">Notes for you</h3>
                      <p className="whitespace-pre-wrap rounded-lg bg-paper px-3 py-2 text-sm">{item.job.notes}</p>
                    </section>
                  ) : null}
                  {item.claim ? (
                    <section className="space-y-2">
                      <h3 className="font-semibold">What the owner reported</h3>
                      <p className="text-sm text-muted">
                        {CLAIM_CATEGORY_LABELS[item.claim.category]} · noticed {formatDate(item.claim.noticedOn)}
                      </p>
                      <p className="whitespace-pre-wrap text-sm">{item.claim.description}</p>
                      {item.claim.photos.length ? <VisitPhotoGrid photos={item.claim.photos.map((p) => ({ id: p.id, thumbUrl: p.thumbUrl, url: p.url, label: "Owner's photo" }))} /> : null}
                    </section>
                  ) : null}

                  <section className="space-y-2">
                    <h3 className="font-semibold">Finish stack</h3>
                    <FinishStack layers={item.layers} wood={wood} compact empty="No finish stack on record — look before you start." />
                  </section>

                  <section className="space-y-2">
                    <h3 className="flex items-center gap-1.5 font-semibold">
                      <SpriteIcon name="package-check" className="size-5" /> What to bring
                    </h3>
                    {item.bring.length ? (
                      <ul className="space-y-1 text-sm">
                        {item.bring.map((b) => (
                          <li key={b.product} className="rounded-lg bg-paper px-3 py-2">
                            <span className="font-semibold">{b.product}</span> ({b.classLabel}) —{" "}
                            {b.amount ? `${formatVolume(b.amount.exactMl, ctx.studio.unitSystem)} for` : "for"} {b.coats} coat{b.coats === 1 ? "" : "s"} on {formatAndList([b.amountFor, ...b.alsoFor].map((s) => ON_SURFACE[s]))}
                            {b.amount?.containers ? <span className="block text-muted">Open: {b.amount.containers}</span> : null}
                            {b.amount ? null : (
                              <span className="block text-muted">
                                The piece&apos;s record has no size for {formatAndList(b.unsized.map((s) => ON_SURFACE[s]))}, so no amount is worked out. Measure it on site: one coat takes about {formatVolume(b.perArea.exactMl, ctx.studio.unitSystem)} for each {formatArea(b.perArea.areaM2, ctx.studio.unitSystem)}.
                              </span>
                            )}
                            <span className="block text-muted">
                              Cure: light use after {b.cure.lightUseHours} h, full use after {b.cure.fullCureDays} days. Tell the owner.
                            </span>
                          </li>
                        ))}
                      </ul>
                    ) : (
                      <p className="text-sm text-muted">No finish product on the job; bring the inspection kit.</p>
                    )}
                  </section>

                  <section className="space-y-2">
                    <h3 className="flex items-center gap-1.5 font-semibold">
                      <SpriteIcon name="triangle-alert" className="size-5 text-warn" /> Cautions
                    </h3>
                    <ul className="list-disc space-y-1 pl-5 text-sm">
                      {item.cautions.map((c) => (
                        <li key={c.key}>
                          <strong>{c.title}.</strong> {c.text}
                        </li>
                      ))}
                    </ul>
                  </section>

                  <section className="space-y-3 border-t border-line pt-4">
                    <h3 className="font-semibold">Visit report</h3>
                    {item.report ? (
                      <Notice tone="ok" title="Report filed">
                        {item.report.work}
                        <br />
                        {item.report.signedOffAt
                          ? "The owner signed off the work."
                          : item.report.typedName
                            ? `Name noted at the visit: ${item.report.typedName}.`
                            : "Waiting for the owner to sign off from the report mail."}
                        {item.report.earlyReason ? (
                          <>
                            <br />
                            Filed before the start: {item.report.earlyReason}
                          </>
                        ) : null}
                      </Notice>
                    ) : item.visit.state === "booked" ? (
                      <VisitReportForm
                        visitId={item.visit.id}
                        name={`${item.piece.title}, ${formatClock(Date.parse(item.visit.start), tz)}`}
                        products={day.products}
                        today={day.today}
                        defaultLayers={item.defaultLayers}
                        addLayerClass={item.addLayerClass}
                        early={item.visit.started ? null : { startsAt: item.visit.when, asStaff: staff }}
                        initialPhotos={item.photos.map((p) => ({ id: p.id, kind: p.kind, thumbUrl: `/api/files/${p.id}?thumb=1` }))}
                      />
                    ) : null}
                    {item.report && item.photos.length ? <VisitPhotoGrid photos={item.photos.map((p) => ({ id: p.id, thumbUrl: `/api/files/${p.id}?thumb=1`, url: `/api/files/${p.id}`, label: p.kind === "before" ? "Before" : "After" }))} /> : null}
                  </section>
                </Card>
              </li>
            );
          })}
        </ol>
      )}
    </div>
  );
}
