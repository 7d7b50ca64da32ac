import { BellRing, CalendarClock, CircleCheck, TriangleAlert } from "lucide-react";
import { cn } from "@/components/ui/cn";
import type { CareTaskStatus } from "@/lib/care/vocabulary";
import { OWNER_TASK_STATE_WORDS, ownerTaskState, type OwnerTaskState } from "@/lib/owner/format";

const LOOK: Record<OwnerTaskState, { Icon: typeof CircleCheck; cls: string; dot: string }> = {
  now: { Icon: TriangleAlert, cls: "border-danger/30 bg-danger-soft text-danger", dot: "bg-danger" },
  soon: { Icon: BellRing, cls: "border-warn/30 bg-warn-soft text-warn", dot: "bg-warn" },
  plan: { Icon: CalendarClock, cls: "border-line bg-paper text-ink", dot: "bg-muted" },
  later: { Icon: CircleCheck, cls: "border-ok/30 bg-ok-soft text-ok", dot: "bg-ok" },
};

/** A care task's state as words saying what to do and an icon, never colour alone. */
export function TaskStatus({ status, daysUntilDue, className }: { status: CareTaskStatus; daysUntilDue: number; className?: string }) {
  const state = ownerTaskState(status, daysUntilDue);
  const { Icon, cls } = LOOK[state];
  return (
    <span className={cn("inline-flex items-center gap-1 rounded-full border px-2 py-0.5 text-xs font-semibold", cls, className)}>
      <Icon aria-hidden className="size-3.5" />
      {OWNER_TASK_STATE_WORDS[state]}
    </span>
  );
}

export function statusDotClass(status: CareTaskStatus, daysUntilDue: number): string {
  return LOOK[ownerTaskState(status, daysUntilDue)].dot;
}
