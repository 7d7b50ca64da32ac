import { cn } from "@/components/ui/cn";
import { SpriteIcon } from "@/components/ui/sprite-icon";
import type { SpriteIconName } from "@/components/ui/sprite-names";
import type { CareTaskStatus } from "@/lib/care/vocabulary";
import { OWNER_TASK_STATE_WORDS, ownerTaskState, type OwnerTaskState } from "@/lib/owner/format";

const LOOK: Record<OwnerTaskState, { icon: SpriteIconName; cls: string; dot: string }> = {
  now: { icon: "triangle-alert", cls: "border-danger/30 bg-danger-soft text-danger", dot: "bg-danger" },
  soon: { icon: "bell-ring", cls: "border-warn/30 bg-warn-soft text-warn", dot: "bg-warn" },
  plan: { icon: "calendar-clock", cls: "border-line bg-paper text-ink", dot: "bg-muted" },
  later: { icon: "circle-check", cls: "border-ok/30 bg-ok-soft text-ok", dot: "bg-ok" },
};

/** A care task's state as words saying what to do and an icon, never colour alone. */
export function TaskStatus({ status, daysUntilDue, className }: { status: CareTaskStatus; daysUntilDue: number; className?: string }) {
  const state = ownerTaskState(status, daysUntilDue);
  const { icon, cls } = LOOK[state];
  return (
    <span className={cn("inline-flex items-center gap-1 rounded-full border px-2 py-0.5 text-xs font-semibold", cls, className)}>
      <SpriteIcon name={icon} className="size-3.5" />
      {OWNER_TASK_STATE_WORDS[state]}
    </span>
  );
}

export function statusDotClass(status: CareTaskStatus, daysUntilDue: number): string {
  return LOOK[ownerTaskState(status, daysUntilDue)].dot;
}
