import { CLAIM_STATE_LABELS_OWNER, CLAIM_STATE_LABELS_STAFF } from "@/lib/claims/labels";
import type { ClaimState } from "@/lib/claims/states";
import { cn } from "@/components/ui/cn";
import { SpriteIcon } from "@/components/ui/sprite-icon";
import type { SpriteIconName } from "@/components/ui/sprite-names";

const LOOK: Record<ClaimState, { icon: SpriteIconName; tone: string }> = {
  submitted: { icon: "inbox", tone: "border-resin/40 bg-resin-soft text-resin-dark" },
  in_review: { icon: "scan-search", tone: "border-line bg-card text-ink" },
  awaiting_owner: { icon: "message-circle-question-mark", tone: "border-warn/40 bg-warn-soft text-warn" },
  accepted: { icon: "circle-check", tone: "border-ok/40 bg-ok-soft text-ok" },
  declined: { icon: "circle-x", tone: "border-danger/30 bg-danger-soft text-danger" },
  repair_booked: { icon: "wrench", tone: "border-resin/40 bg-resin-soft text-resin-dark" },
  closed: { icon: "archive", tone: "border-line bg-paper text-muted" },
};

/** A claim state as a word and an icon (colour only supports them). */
export function StateBadge({ state, audience, className }: { state: ClaimState; audience: "owner" | "staff"; className?: string }) {
  const { icon, tone } = LOOK[state];
  const label = (audience === "owner" ? CLAIM_STATE_LABELS_OWNER : CLAIM_STATE_LABELS_STAFF)[state];
  return (
    <span className={cn("inline-flex items-center gap-1.5 rounded-full border px-2.5 py-1 text-sm font-medium whitespace-nowrap", tone, className)}>
      <SpriteIcon name={icon} className="size-4" />
      {label}
    </span>
  );
}
