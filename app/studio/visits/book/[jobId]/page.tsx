import type { Metadata } from "next";
import Link from "next/link";
import { PageHeader } from "@/components/ui/card";
import { Notice } from "@/components/ui/notice";
import { SlotPicker } from "@/components/visits/slot-picker";
import { requireStaff } from "@/lib/auth/guards";
import { forPage } from "@/lib/auth/page";
import { bookingContext } from "@/lib/visits/service";

export const metadata: Metadata = { title: "Book a visit" };

export default async function StaffBookVisitPage({ params }: { params: Promise<{ jobId: string }> }) {
  const { jobId } = await params;
  const b = await forPage(async () => bookingContext({ kind: "staff", ctx: await requireStaff() }, jobId));
  return (
    <>
      <PageHeader title={b.visit ? "Move the visit" : "Book a visit"} lead={`${b.job.title} · ${b.piece.title}`} />
      {b.bookable ? (
        <SlotPicker
          jobId={b.job.id}
          timeZone={b.studio.timeZone}
          durationMin={b.durationMin}
          pieceAddress={b.piece.address}
          studioLabel={b.studio.address ? `${b.studio.name}, ${b.studio.address}` : b.studio.name}
          visit={b.visit ? { id: b.visit.id, when: b.visit.when, locationKind: b.visit.locationKind, technicianId: b.visit.technicianId } : null}
          doneHref="/studio/visits"
          audience="staff"
          leadTimeHours={0}
          cutoffHours={b.rules.ownerChangeCutoffHours}
        />
      ) : (
        <Notice tone="info" title="Nothing to book">Visits are booked for paid or covered jobs.</Notice>
      )}
      <p className="mt-6 text-sm">
        <Link className="text-resin underline" href={`/studio/jobs/${b.job.id}`}>Back to the job</Link>
      </p>
    </>
  );
}
