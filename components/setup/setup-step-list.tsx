import Link from "next/link";
import { cn } from "@/components/ui/cn";
import { SpriteIcon } from "@/components/ui/sprite-icon";
import type { SetupItem } from "@/lib/studio/setup";

/** The set-up's steps in order, each marked done or not, the current one highlighted. */
export function SetupStepList({ items, current }: { items: SetupItem[]; current?: string }) {
  return (
    <nav aria-label="Set-up steps">
      <ol className="space-y-1">
        {items.map((i, n) => (
          <li key={i.key}>
            <Link
              href={i.href}
              aria-current={i.key === current ? "step" : undefined}
              className={cn("flex min-h-11 items-center gap-2 rounded-lg px-3 text-sm", i.key === current ? "bg-resin-soft font-semibold text-resin-dark" : "text-ink hover:bg-resin-soft/60")}
            >
              {i.done ? <SpriteIcon name="circle-check" className="size-4 shrink-0 text-ok" /> : <SpriteIcon name="circle" className="size-4 shrink-0 text-muted" />}
              <span>
                {n + 1}. {i.label}
                <span className="sr-only">{i.done ? " (done)" : " (not done yet)"}</span>
              </span>
            </Link>
          </li>
        ))}
      </ol>
    </nav>
  );
}
