import { Archive, CircleCheck, CircleX, Inbox, MessageCircleQuestion, ScanSearch, Wrench, type LucideIcon } from "lucide-react";
import { CLAIM_STATE_LABELS_OWNER, CLAIM_STATE_LABELS_STAFF } from "@/lib/claims/labels";
import type { ClaimState } from "@/lib/claims/states";
import { cn } from "@/components/ui/cn";

const LOOK: Record<ClaimState, { Icon: LucideIcon; tone: string }> = {
  submitted: { Icon: Inbox, tone: "border-resin/40 bg-resin-soft text-resin-dark" },
  in_review: { Icon: ScanSearch, tone: "border-line bg-card text-ink" },
  awaiting_owner: { Icon: MessageCircleQuestion, tone: "border-warn/40 bg-warn-soft text-warn" },
  accepted: { Icon: CircleCheck, tone: "border-ok/40 bg-ok-soft text-ok" },
  declined: { Icon: CircleX, tone: "border-danger/30 bg-danger-soft text-danger" },
  repair_booked: { Icon: Wrench, tone: "border-resin/40 bg-resin-soft text-resin-dark" },
  closed: { Icon: Archive, tone: "border-line bg-paper text-muted" },
};

/** A claim state as a word and an icon (colour only supports them). */
export function StateBadge({ state, audience, className }: { state: ClaimState; audience: "owner" | "staff"; className?: string }) {
  const { Icon, tone } = LOOK[state];
  const label = (audience === "owner" ? CLAIM_STATE_LABELS_OWNER : CLAIM_STATE_LABELS_STAFF)[state];
  return (
    <span className={cn("inline-flex items-center gap-1.5 rounded-full border px-2.5 py-1 text-sm font-medium whitespace-nowrap", tone, className)}>
      <Icon aria-hidden className="size-4" />
      {label}
    </span>
  );
}
