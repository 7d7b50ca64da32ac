import type { Metadata } from "next";
import Link from "next/link";
import { ChevronLeft, ChevronRight, Clock, MapPin, PackageCheck, TriangleAlert } from "lucide-react";
import { Card, PageHeader } from "@/components/ui/card";
import { Notice } from "@/components/ui/notice";
import { StatusBadge } from "@/components/ui/status";
import { VisitReportForm } from "@/components/visits/visit-report-form";
import { FinishStack } from "@/components/ui/finish-stack";
import { requireStudioMember } from "@/lib/auth/guards";
import { forPage } from "@/lib/auth/page";
import { addDays } from "@/lib/care/dates";
import { getSpecies } from "@/lib/care/species";
import type { FinishClass } from "@/lib/care/vocabulary";
import { formatVolume } from "@/lib/owner/format";
import { formatClock } from "@/lib/visits/format";
import { technicianDay } from "@/lib/visits/service";

export const metadata: Metadata = { title: "My day" };
export const dynamic = "force-dynamic";

function dayTitle(date: string) {
  return new Intl.DateTimeFormat("en-GB", { dateStyle: "full", timeZone: "UTC" }).format(new Date(`${date}T12:00:00Z`));
}

export default async function TechnicianDayPage({ searchParams }: { searchParams: Promise<Record<string, string | undefined>> }) {
  const q = await searchParams;
  const ctx = await forPage(requireStudioMember);
  const day = await forPage(async () => technicianDay(ctx, { date: q.date, technicianId: q.technician }));
  const tz = day.timeZone;
  const nav = (date: string) => `/studio/today?date=${date}${q.technician ? `&technician=${q.technician}` : ""}`;
  return (
    <div className="mx-auto max-w-2xl">
      <PageHeader title={day.date === day.today ? "My day" : "Visits"} lead={dayTitle(day.date)} />
      <nav aria-label="Day" className="mb-5 flex items-center justify-between gap-2">
        <Link href={nav(addDays(day.date, -1))} className="inline-flex min-h-11 items-center gap-1 rounded-lg border border-line bg-card px-3 text-sm font-semibold">
          <ChevronLeft aria-hidden className="size-4" /> Previous day
        </Link>
        {day.date !== day.today ? (
          <Link href={nav(day.today)} className="inline-flex min-h-11 items-center px-2 text-sm font-semibold text-resin underline">
            Today
          </Link>
        ) : null}
        <Link href={nav(addDays(day.date, 1))} className="inline-flex min-h-11 items-center gap-1 rounded-lg border border-line bg-card px-3 text-sm font-semibold">
          Next day <ChevronRight aria-hidden className="size-4" />
        </Link>
      </nav>
      {day.items.length === 0 ? (
        <Card>
          <p className="font-semibold">No visits booked for you on this day.</p>
          <p className="text-muted">Booked touch-up visits are listed here in order, with the address and what to bring.</p>
        </Card>
      ) : (
        <ol className="space-y-6">
          {day.items.map((item, i) => {
            const wood = getSpecies(item.piece.primarySpeciesId)?.commonName ?? "Wood";
            const firstBring = item.bring[0]?.finishClass as FinishClass | undefined;
            return (
              <li key={item.visit.id}>
                <Card className="space-y-4 p-4">
                  <div className="flex flex-wrap items-start justify-between gap-2">
                    <div>
                      <p className="flex items-center gap-1.5 text-sm font-semibold text-resin">
                        <Clock aria-hidden className="size-4" />
                        {i + 1}. {formatClock(Date.parse(item.visit.start), tz)}–{formatClock(Date.parse(item.visit.end), tz)}
                      </p>
                      <h2 className="font-display text-xl font-semibold">{item.piece.title}</h2>
                      <p className="text-sm text-muted">
                        {item.job.title}
                        {item.ownerName ? ` · ${item.ownerName}` : ""}
                      </p>
                    </div>
                    <StatusBadge label={item.visit.state === "done" ? "Report filed" : "To do"} tone={item.visit.state === "done" ? "ok" : "progress"} />
                  </div>
                  <p className="flex gap-2 break-words">
                    <MapPin aria-hidden className="mt-0.5 size-5 shrink-0 text-resin" />
                    <span>
                      <span className="font-semibold">{item.visit.locationKind === "studio" ? "At the studio: " : ""}</span>
                      {item.visit.location}
                    </span>
                  </p>
                  {item.job.tasks.length ? <p className="text-sm">Tasks: {item.job.tasks.join(", ")}</p> : null}

                  <section className="space-y-2">
                    <h3 className="font-semibold">Finish stack</h3>
                    <FinishStack layers={item.layers} wood={wood} compact empty="No finish stack on record — look before you start." />
                  </section>

                  <section className="space-y-2">
                    <h3 className="flex items-center gap-1.5 font-semibold">
                      <PackageCheck aria-hidden className="size-5" /> What to bring
                    </h3>
                    {item.bring.length ? (
                      <ul className="space-y-1 text-sm">
                        {item.bring.map((b) => (
                          <li key={b.product} className="rounded-lg bg-paper px-3 py-2">
                            <span className="font-semibold">{b.product}</span> ({b.classLabel}) — {formatVolume(b.ml, ctx.studio.unitSystem)} for {b.coats} coat{b.coats === 1 ? "" : "s"} on this top
                            {b.containers ? <span className="block text-muted">Open: {b.containers}</span> : null}
                          </li>
                        ))}
                      </ul>
                    ) : (
                      <p className="text-sm text-muted">No finish product on the job; bring the inspection kit.</p>
                    )}
                  </section>

                  <section className="space-y-2">
                    <h3 className="flex items-center gap-1.5 font-semibold">
                      <TriangleAlert aria-hidden className="size-5 text-warn" /> Cautions
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
                        Signed off by {item.report.signOffName}.
                      </Notice>
                    ) : item.visit.state === "booked" ? (
                      <VisitReportForm visitId={item.visit.id} products={day.products} today={day.today} defaultClass={firstBring} initialPhotos={item.photos.map((p) => ({ id: p.id, kind: p.kind, thumbUrl: `/api/files/${p.id}?thumb=1` }))} />
                    ) : null}
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
