import type { Metadata } from "next";
import Link from "next/link";
import { CareLogForm } from "@/components/owner/care-log-form";
import { TaskStatus } from "@/components/owner/task-status";
import { Card, PageHeader } from "@/components/ui/card";
import { requireUser } from "@/lib/auth/guards";
import { forPage } from "@/lib/auth/page";
import { getLogForm } from "@/lib/owner/care-log";
import { formatDate } from "@/lib/format";

export const metadata: Metadata = { title: "Log care" };

// The stable "I did this" URL: /pieces/[id]/log?task=<careSchedule task key> (care reminders link here).
export default async function LogCarePage({ params, searchParams }: { params: Promise<{ id: string }>; searchParams: Promise<Record<string, string | undefined>> }) {
  const { id } = await params;
  const { task } = await searchParams;
  const data = await forPage(async () => getLogForm(await requireUser(), id, { taskKey: task }));
  const chosen = data.chosen;
  return (
    <>
      <p className="text-sm font-medium text-muted">
        <Link href={`/pieces/${data.piece.id}`} className="inline-flex min-h-11 items-center hover:underline">
          ← {data.piece.title}
        </Link>
      </p>
      <PageHeader title="I did this" lead="Log the care you gave the piece. Its next date moves on from the day you did it." />
      {chosen ? (
        <Card className="mb-4 space-y-1 text-sm">
          <div className="flex flex-wrap items-center gap-2">
            <span className="font-semibold">
              {chosen.label} — {chosen.surfaceLabel.toLowerCase()}
            </span>
            <TaskStatus status={chosen.status} daysUntilDue={chosen.daysUntilDue} />
          </div>
          <p className="text-muted">
            {chosen.status === "overdue" ? "Was due" : "Due"} {formatDate(chosen.dueOn)}. {chosen.reasons[0]}
          </p>
        </Card>
      ) : null}
      <Card>
        <CareLogForm
          pieceId={data.piece.id}
          tasks={data.tasks}
          today={data.today}
          defaults={{ taskKind: chosen?.kind ?? "annual_check", surface: chosen?.surface ?? "whole_piece", doneOn: data.today, productUsed: "", notes: "" }}
        />
      </Card>
    </>
  );
}
