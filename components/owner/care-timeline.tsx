import Link from "next/link";
import { cn } from "@/components/ui/cn";
import { SpriteIcon } from "@/components/ui/sprite-icon";
import { formatDate, relativeDays } from "@/lib/format";
import type { CareLogView, TaskView } from "@/lib/owner/pieces";
import { TaskStatus, statusDotClass } from "./task-status";

/** Where a task's clock started, in words: who did the care that restarted it, or the finish coat, or delivery. */
function clockWords(t: TaskView, careLog: readonly Pick<CareLogView, "taskKind" | "doneOn" | "source" | "mine">[]): string {
  if (t.clockSource === "layer") return "the last finish coat";
  if (t.clockSource === "delivery") return "delivery";
  const entry = careLog.find((e) => e.taskKind === t.kind && e.doneOn === t.clockFrom);
  if (!entry) return "the care log";
  if (entry.source === "visit") return "done at a studio visit";
  if (entry.source === "studio") return "recorded by the studio";
  return entry.mine ? "your care log" : "the care log";
}

/** The care schedule as a timeline: the soonest task first, each with its due date and why. */
export function CareTimeline({ tasks, careLog = [] }: { tasks: TaskView[]; careLog?: readonly Pick<CareLogView, "taskKind" | "doneOn" | "source" | "mine">[] }) {
  return (
    <ol className="relative space-y-4 border-l-2 border-line pl-6" aria-label="Care schedule">
      {tasks.map((t) => (
        <li key={t.key} className="relative">
          <span aria-hidden className={cn("absolute -left-[33px] top-1.5 size-4 rounded-full border-2 border-card", statusDotClass(t.status, t.daysUntilDue))} />
          <div className="rounded-xl border border-line bg-card p-4">
            <div className="flex flex-wrap items-center gap-2">
              <h3 className="font-semibold">{t.label}</h3>
              <span className="text-sm text-muted">{`· ${t.surfaceLabel}`}</span>
              <TaskStatus status={t.status} daysUntilDue={t.daysUntilDue} className="ml-auto" />
            </div>
            <p className="mt-1 text-sm">
              {t.status === "overdue" ? "Was due " : "Due "}
              <strong>{formatDate(t.dueOn)}</strong> <span className="text-muted">{`(${relativeDays(t.daysUntilDue)})`}</span>
            </p>
            <p className="mt-1 text-sm text-muted">
              {`Every ${t.interval}; counted from ${formatDate(t.clockFrom)} (${clockWords(t, careLog)}).`}
            </p>
            <details className="mt-2 text-sm">
              <summary className="flex min-h-11 cursor-pointer items-center font-medium text-resin">Why this date</summary>
              <ul className="list-disc space-y-1 pl-5 text-muted">
                {t.reasons.map((r, i) => (
                  <li key={i}>{r}</li>
                ))}
              </ul>
            </details>
            <Link
              href={t.logUrl}
              className="mt-2 inline-flex min-h-11 w-full items-center justify-center gap-2 rounded-lg border border-line bg-paper px-4 text-sm font-semibold text-ink hover:border-resin hover:text-resin sm:w-auto"
            >
              <SpriteIcon name="clipboard-check" className="size-4" />
              I did this
              <span className="sr-only">{`: ${t.label.toLowerCase()}, ${t.surfaceLabel.toLowerCase()}`}</span>
            </Link>
          </div>
        </li>
      ))}
    </ol>
  );
}
