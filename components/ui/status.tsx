import { CircleCheck, CircleDashed, CircleDot, CircleSlash, Clock, type LucideIcon } from "lucide-react";
import { cn } from "./cn";

export type StatusTone = "neutral" | "progress" | "waiting" | "ok" | "stopped";

const TONES: Record<StatusTone, { className: string; Icon: LucideIcon }> = {
  neutral: { className: "border-line bg-card text-ink", Icon: CircleDashed },
  progress: { className: "border-resin/30 bg-resin-soft text-resin-dark", Icon: CircleDot },
  waiting: { className: "border-warn/30 bg-warn-soft text-warn", Icon: Clock },
  ok: { className: "border-ok/30 bg-ok-soft text-ok", Icon: CircleCheck },
  stopped: { className: "border-line bg-paper text-muted", Icon: CircleSlash },
};

/** A state as a word with an icon, never a colour alone. */
export function StatusBadge({ label, tone }: { label: string; tone: StatusTone }) {
  const { className, Icon } = TONES[tone];
  return (
    <span className={cn("inline-flex items-center gap-1.5 rounded-full border px-2.5 py-1 text-xs font-semibold", className)}>
      <Icon aria-hidden className="size-3.5" />
      {label}
    </span>
  );
}
