import Link from "next/link";
import { SpriteIcon } from "@/components/ui/sprite-icon";

/** The studio header's way into the inbox, with the number of conversations nobody has opened yet. */
export function InboxLink({ unread }: { unread: number }) {
  return (
    <Link href="/studio/inbox" className="flex min-h-11 items-center gap-1.5 rounded-md px-3 text-sm font-medium text-ink hover:bg-resin-soft">
      <SpriteIcon name="inbox" className="size-4" />
      Inbox
      {unread > 0 ? (
        <span className="rounded-full bg-resin px-2 py-0.5 text-xs font-semibold text-white">
          {unread}
          <span className="sr-only"> unread</span>
        </span>
      ) : null}
    </Link>
  );
}
