import { cn } from "./cn";
import { SpriteIcon } from "./sprite-icon";
import type { SpriteIconName } from "./sprite-names";

export type StatusTone = "neutral" | "progress" | "waiting" | "ok" | "stopped";

const TONES: Record<StatusTone, { className: string; icon: SpriteIconName }> = {
  neutral: { className: "border-line bg-card text-ink", icon: "circle-dashed" },
  progress: { className: "border-resin/30 bg-resin-soft text-resin-dark", icon: "circle-dot" },
  waiting: { className: "border-warn/30 bg-warn-soft text-warn", icon: "clock" },
  ok: { className: "border-ok/30 bg-ok-soft text-ok", icon: "circle-check" },
  stopped: { className: "border-line bg-paper text-muted", icon: "circle-slash" },
};

/** A state as a word with an icon, never a colour alone. */
export function StatusBadge({ label, tone }: { label: string; tone: StatusTone }) {
  const { className, icon } = TONES[tone];
  return (
    <span className={cn("inline-flex items-center gap-1.5 rounded-full border px-2.5 py-1 text-xs font-semibold", className)}>
      <SpriteIcon name={icon} className="size-3.5" />
      {label}
    </span>
  );
}
