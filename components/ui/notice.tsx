import type { ReactNode } from "react";
import { cn } from "./cn";
import { SpriteIcon } from "./sprite-icon";
import type { SpriteIconName } from "./sprite-names";

const tones = {
  info: { box: "border-resin/30 bg-resin-soft text-ink", icon: "info", label: "Note" },
  ok: { box: "border-ok/30 bg-ok-soft text-ink", icon: "circle-check", label: "Done" },
  warn: { box: "border-warn/30 bg-warn-soft text-ink", icon: "triangle-alert", label: "Caution" },
  error: { box: "border-danger/30 bg-danger-soft text-ink", icon: "circle-exclamation-point", label: "Problem" },
} as const satisfies Record<string, { box: string; icon: SpriteIconName; label: string }>;

/** A message with an icon and a word, never colour alone. */
export function Notice({ tone = "info", title, children, className }: { tone?: keyof typeof tones; title?: string; children?: ReactNode; className?: string }) {
  const { box, icon, label } = tones[tone];
  return (
    <div role={tone === "error" ? "alert" : "status"} className={cn("flex gap-3 rounded-lg border p-3 text-sm", box, className)}>
      <SpriteIcon name={icon} className="mt-0.5 size-5 shrink-0" />
      <div className="space-y-1">
        <p className="font-semibold">{title ?? label}</p>
        {children ? <div className="text-ink/90">{children}</div> : null}
      </div>
    </div>
  );
}
