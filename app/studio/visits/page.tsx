import type { Metadata } from "next";
import Link from "next/link";
import { ButtonLink } from "@/components/ui/button";
import { Card, PageHeader } from "@/components/ui/card";
import { Notice } from "@/components/ui/notice";
import { WeekCalendar } from "@/components/visits/week-calendar";
import { requireStaff } from "@/lib/auth/guards";
import { forPage } from "@/lib/auth/page";
import { jobStateLabel } from "@/lib/repairs/states";
import { calendarWeek, jobsAwaitingVisit } from "@/lib/visits/list";
import { listTechnicians } from "@/lib/visits/technicians";

export const metadata: Metadata = { title: "Visits" };
export const dynamic = "force-dynamic";

export default async function StudioVisitsPage({ searchParams }: { searchParams: Promise<Record<string, string | undefined>> }) {
  const { week } = await searchParams;
  const ctx = await forPage(requireStaff);
  const { today, monday } = calendarWeek(ctx, week);
  const technicians = listTechnicians(ctx).map(({ id, name }) => ({ id, name }));
  const waiting = jobsAwaitingVisit(ctx);
  return (
    <>
      <PageHeader title="Visits" lead="The team's week of touch-up visits." actions={<ButtonLink variant="secondary" href="/studio/technicians">Working hours</ButtonLink>} />
      <div className="space-y-6">
        {technicians.length === 0 ? (
          <Notice tone="info" title="No technicians yet">
            Visits are booked with a technician, at times their working hours leave free.{" "}
            {ctx.role === "admin" ? (
              <>
                <Link className="font-medium text-resin underline" href="/studio/team">
                  Invite a technician
                </Link>
                ; once they have joined, set their hours on the Working hours page.
              </>
            ) : (
              "Ask an admin to invite one; once they have joined, set their hours on the Working hours page."
            )}
          </Notice>
        ) : null}
        {waiting.length ? (
          <Card className="space-y-2">
            <h2 className="font-semibold">Waiting for a visit</h2>
            <ul className="divide-y divide-line">
              {waiting.map((j) => (
                <li key={j.id} className="flex flex-wrap items-center justify-between gap-2 py-2">
                  <span>
                    <Link className="font-medium text-resin underline" href={`/studio/jobs/${j.id}`}>{j.title}</Link>
                    <span className="block text-sm text-muted">
                      {j.pieceTitle} · {j.ownerName ?? "no owner"} · {jobStateLabel(j)}
                    </span>
                  </span>
                  <ButtonLink href={`/studio/visits/book/${j.id}`}>Book a visit</ButtonLink>
                </li>
              ))}
            </ul>
          </Card>
        ) : null}
        <WeekCalendar timeZone={ctx.studio.timeZone} technicians={technicians} initialMonday={monday} today={today} />
      </div>
    </>
  );
}
