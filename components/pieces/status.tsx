import type { CareTaskStatus } from "@/lib/care/vocabulary";
import { cn } from "@/components/ui/cn";
import { SpriteIcon } from "@/components/ui/sprite-icon";
import type { SpriteIconName } from "@/components/ui/sprite-names";
import { formatDate } from "@/lib/format";

// States are a word and an icon, never colour alone.

const CARE: Record<CareTaskStatus, { word: string; icon: SpriteIconName; cls: string }> = {
  upcoming: { word: "Upcoming", icon: "clock", cls: "text-muted" },
  due: { word: "Due soon", icon: "alarm-clock", cls: "text-warn" },
  overdue: { word: "Overdue", icon: "triangle-alert", cls: "text-danger" },
  done: { word: "Up to date", icon: "circle-check", cls: "text-ok" },
};

export function CareStatus({ status, className }: { status: CareTaskStatus; className?: string }) {
  const { word, icon, cls } = CARE[status];
  return (
    <span className={cn("inline-flex items-center gap-1 text-sm font-medium", cls, className)}>
      <SpriteIcon name={icon} className="size-4 shrink-0" />
      {word}
    </span>
  );
}

export function RegistrationStatus({ registered, className }: { registered: boolean; className?: string }) {
  return (
    <span className={cn("inline-flex items-center gap-1 text-sm", registered ? "text-ok" : "text-muted", className)}>
      <SpriteIcon name={registered ? "user-check" : "user-round"} className="size-4 shrink-0" />
      {registered ? "Registered" : "Not registered"}
    </span>
  );
}

export function WarrantyStatus({ active, endsOn, className }: { active: boolean; endsOn: string | null; className?: string }) {
  return (
    <span className={cn("inline-flex items-center gap-1 text-sm", active ? "text-ink" : "text-muted", className)}>
      <SpriteIcon name={active ? "shield-check" : "shield-off"} className="size-4 shrink-0" />
      {endsOn ? (active ? `Warranty to ${formatDate(endsOn)}` : `Warranty ended ${formatDate(endsOn)}`) : "No warranty on record"}
    </span>
  );
}
