import Link from "next/link";
import { PageHeader } from "@/components/ui/card";
import { Notice } from "@/components/ui/notice";
import { SlotPicker } from "@/components/visits/slot-picker";
import type { bookingContext } from "@/lib/visits/job-visit";

const WORDS = {
  owner: { book: "Book your visit", change: "Change your visit", none: ["Nothing to book yet", "A visit can be booked once the job is paid or covered."] },
  staff: { book: "Book a visit", change: "Move the visit", none: ["Nothing to book", "Visits are booked for paid or covered jobs."] },
} as const;

/** The booking page of a job's visit, for its owner or for staff booking on their behalf. */
export function BookVisit({ b, audience }: { b: ReturnType<typeof bookingContext>; audience: "owner" | "staff" }) {
  const w = WORDS[audience];
  const jobHref = audience === "owner" ? `/jobs/${b.job.id}` : `/studio/jobs/${b.job.id}`;
  return (
    <>
      <PageHeader title={b.visit ? w.change : w.book} lead={[b.job.title, b.piece.title, audience === "owner" ? b.studio.name : null].filter(Boolean).join(" · ")} />
      {b.bookable ? (
        <SlotPicker
          jobId={b.job.id}
          timeZone={b.studio.timeZone}
          durationMin={b.durationMin}
          pieceAddress={b.piece.address}
          studioLabel={b.studio.address ? `${b.studio.name}, ${b.studio.address}` : b.studio.name}
          visit={b.visit ? { id: b.visit.id, when: b.visit.when, locationKind: b.visit.locationKind, technicianId: b.visit.technicianId } : null}
          doneHref={audience === "owner" ? jobHref : "/studio/visits"}
          audience={audience}
          leadTimeHours={b.rules.leadTimeHours}
          cutoffHours={b.rules.ownerChangeCutoffHours}
        />
      ) : (
        <Notice tone="info" title={w.none[0]}>
          {w.none[1]}
        </Notice>
      )}
      <p className="mt-6 text-sm">
        <Link className="text-resin underline" href={jobHref}>
          Back to the job
        </Link>
      </p>
    </>
  );
}
