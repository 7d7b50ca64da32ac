import { BellRing, CalendarClock, CircleCheck, TriangleAlert } from "lucide-react";
import { cn } from "@/components/ui/cn";
import type { CareTaskStatus } from "@/lib/care/vocabulary";

const STATUS = {
  overdue: { word: "Overdue", Icon: TriangleAlert, cls: "border-danger/30 bg-danger-soft text-danger" },
  due: { word: "Due soon", Icon: BellRing, cls: "border-warn/30 bg-warn-soft text-warn" },
  upcoming: { word: "Upcoming", Icon: CalendarClock, cls: "border-line bg-paper text-ink" },
  done: { word: "Up to date", Icon: CircleCheck, cls: "border-ok/30 bg-ok-soft text-ok" },
} as const;

/** A care task's state as a word and an icon, never colour alone (DESIGN.md §10). */
export function TaskStatus({ status, className }: { status: CareTaskStatus; className?: string }) {
  const { word, Icon, cls } = STATUS[status];
  return (
    <span className={cn("inline-flex items-center gap-1 rounded-full border px-2 py-0.5 text-xs font-semibold", cls, className)}>
      <Icon aria-hidden className="size-3.5" />
      {word}
    </span>
  );
}

export function statusDotClass(status: CareTaskStatus): string {
  return { overdue: "bg-danger", due: "bg-warn", upcoming: "bg-muted", done: "bg-ok" }[status];
}
