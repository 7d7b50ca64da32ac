import type { Metadata } from "next";
import Link from "next/link";
import { PageHeader } from "@/components/ui/card";
import { Notice } from "@/components/ui/notice";
import { SlotPicker } from "@/components/visits/slot-picker";
import { requireUser } from "@/lib/auth/guards";
import { forPage } from "@/lib/auth/page";
import { bookingContext } from "@/lib/visits/service";

export const metadata: Metadata = { title: "Book your visit" };

export default async function OwnerBookVisitPage({ params }: { params: Promise<{ id: string }> }) {
  const { id } = await params;
  const user = await forPage(requireUser);
  const b = await forPage(async () => bookingContext({ kind: "owner", user }, id));
  return (
    <>
      <PageHeader title={b.visit ? "Change your visit" : "Book your visit"} lead={`${b.job.title} · ${b.piece.title} · ${b.studio.name}`} />
      {b.bookable ? (
        <SlotPicker
          jobId={b.job.id}
          timeZone={b.studio.timeZone}
          durationMin={b.durationMin}
          pieceAddress={b.piece.address}
          studioLabel={b.studio.address ? `${b.studio.name}, ${b.studio.address}` : b.studio.name}
          visit={b.visit ? { id: b.visit.id, when: b.visit.when, locationKind: b.visit.locationKind, technicianId: b.visit.technicianId } : null}
          doneHref={`/jobs/${b.job.id}`}
          audience="owner"
          leadTimeHours={b.rules.leadTimeHours}
          cutoffHours={b.rules.ownerChangeCutoffHours}
        />
      ) : (
        <Notice tone="info" title="Nothing to book yet">A visit can be booked once the job is paid or covered.</Notice>
      )}
      <p className="mt-6 text-sm">
        <Link className="text-resin underline" href={`/jobs/${b.job.id}`}>Back to the job</Link>
      </p>
    </>
  );
}
