import { AlarmClock, CircleCheck, Clock, ShieldCheck, ShieldOff, TriangleAlert, UserCheck, UserRound } from "lucide-react";
import type { CareTaskStatus } from "@/lib/care/vocabulary";
import { cn } from "@/components/ui/cn";
import { formatDate } from "@/lib/format";

// States are a word and an icon, never colour alone.

const CARE: Record<CareTaskStatus, { word: string; Icon: typeof Clock; cls: string }> = {
  upcoming: { word: "Upcoming", Icon: Clock, cls: "text-muted" },
  due: { word: "Due soon", Icon: AlarmClock, cls: "text-warn" },
  overdue: { word: "Overdue", Icon: TriangleAlert, cls: "text-danger" },
  done: { word: "Up to date", Icon: CircleCheck, cls: "text-ok" },
};

export function CareStatus({ status, className }: { status: CareTaskStatus; className?: string }) {
  const { word, Icon, cls } = CARE[status];
  return (
    <span className={cn("inline-flex items-center gap-1 text-sm font-medium", cls, className)}>
      <Icon aria-hidden className="size-4 shrink-0" />
      {word}
    </span>
  );
}

export function RegistrationStatus({ registered, className }: { registered: boolean; className?: string }) {
  const Icon = registered ? UserCheck : UserRound;
  return (
    <span className={cn("inline-flex items-center gap-1 text-sm", registered ? "text-ok" : "text-muted", className)}>
      <Icon aria-hidden className="size-4 shrink-0" />
      {registered ? "Registered" : "Not registered"}
    </span>
  );
}

export function WarrantyStatus({ active, endsOn, className }: { active: boolean; endsOn: string | null; className?: string }) {
  const Icon = active ? ShieldCheck : ShieldOff;
  return (
    <span className={cn("inline-flex items-center gap-1 text-sm", active ? "text-ink" : "text-muted", className)}>
      <Icon aria-hidden className="size-4 shrink-0" />
      {endsOn ? (active ? `Warranty to ${formatDate(endsOn)}` : `Warranty ended ${formatDate(endsOn)}`) : "No warranty on record"}
    </span>
  );
}
