import type { Metadata } from "next";
import Link from "next/link";
import { ResolveUnmatched } from "@/components/inbox/thread-controls";
import { Card, PageHeader } from "@/components/ui/card";
import { cn } from "@/components/ui/cn";
import { StatusBadge } from "@/components/ui/status";
import { requireStaff } from "@/lib/auth/guards";
import { forPage } from "@/lib/auth/page";
import { listInbox } from "@/lib/messages/service";
import { ABOUT_LABELS, THREAD_STATE_WORDS, UNMATCHED_WORDS } from "@/lib/messages/words";
import { formatInstant, formatWait } from "@/lib/format";
import { INBOX_VIEWS, inboxQuerySchema } from "@/lib/validation/messages";

export const metadata: Metadata = { title: "Inbox" };
export const dynamic = "force-dynamic";

const VIEW_LABELS: Record<(typeof INBOX_VIEWS)[number], string> = { waiting: "Open", mine: "Assigned to me", all: "All", done: "Done", unmatched: "Unmatched e-mail" };
const EMPTY: Record<(typeof INBOX_VIEWS)[number], string> = {
  waiting: "Nothing open. Owners' messages about their claims, repair jobs and visits appear here, and their e-mailed replies too.",
  mine: "Nothing is assigned to you.",
  all: "No conversations yet.",
  done: "Nothing marked done yet.",
  unmatched: "No unmatched e-mail. Replies that can't be tied to a conversation (another sender, a changed address) are kept here.",
};

export default async function InboxPage({ searchParams }: { searchParams: Promise<Record<string, string | undefined>> }) {
  const query = await searchParams;
  const ctx = await forPage(requireStaff);
  const inbox = listInbox(ctx, inboxQuerySchema.parse(query));
  const at = (iso: string) => formatInstant(new Date(iso), inbox.timeZone, { time: true });
  return (
    <>
      <PageHeader title="Inbox" lead={inbox.unread === 0 ? "Every message from an owner, oldest waiting first." : `${inbox.unread} unread. Every message from an owner, oldest waiting first.`} />
      <nav aria-label="Inbox views" className="mb-4">
        <ul className="flex flex-wrap gap-1">
          {INBOX_VIEWS.map((v) => (
            <li key={v}>
              <Link
                href={v === "waiting" ? "/studio/inbox" : `/studio/inbox?view=${v}`}
                aria-current={inbox.view === v ? "page" : undefined}
                className={cn("flex min-h-11 items-center rounded-md px-3 text-sm font-medium hover:bg-resin-soft", inbox.view === v && "bg-resin-soft text-resin-dark")}
              >
                {VIEW_LABELS[v]}
              </Link>
            </li>
          ))}
        </ul>
      </nav>
      {inbox.view === "unmatched" ? (
        inbox.unmatched.length === 0 ? (
          <p className="text-muted">{EMPTY.unmatched}</p>
        ) : (
          <ul className="space-y-3" aria-label="Unmatched e-mail">
            {inbox.unmatched.map((u) => (
              <li key={u.id}>
                <Card className="space-y-2">
                  <p className="text-sm text-muted">
                    From {u.fromEmail || "an unknown sender"} · received {at(u.receivedAt)}
                  </p>
                  <p className="font-semibold">{u.subject || "(no subject)"}</p>
                  <p className="text-sm">{UNMATCHED_WORDS[u.reason]}</p>
                  <p className="line-clamp-6 whitespace-pre-wrap break-words text-sm">{u.body}</p>
                  <div className="flex flex-wrap items-center gap-3">
                    {u.threadId ? (
                      <Link href={`/studio/inbox/${u.threadId}`} className="inline-flex min-h-11 items-center text-resin underline">
                        Open the conversation it was meant for
                      </Link>
                    ) : null}
                    <ResolveUnmatched id={u.id} />
                  </div>
                </Card>
              </li>
            ))}
          </ul>
        )
      ) : inbox.threads.length === 0 ? (
        <p className="text-muted">{EMPTY[inbox.view]}</p>
      ) : (
        <ul className="space-y-3" aria-label="Conversations">
          {inbox.threads.map((t) => (
            <li key={t.id}>
              <Card className={cn("space-y-1", t.state === "unread" && "border-resin")}>
                <div className="flex flex-wrap items-center gap-2">
                  <Link href={`/studio/inbox/${t.id}`} className="font-semibold text-resin underline">
                    {t.ownerName} · {t.pieceTitle}
                  </Link>
                  <StatusBadge label={THREAD_STATE_WORDS[t.state]} tone={t.state === "unread" ? "waiting" : t.state === "done" ? "ok" : "progress"} />
                </div>
                <p className="text-sm text-muted">
                  {ABOUT_LABELS[t.about]}
                  {t.waitingSince && t.waitedMs !== null ? ` · waiting ${formatWait(t.waitedMs)}, since ${at(t.waitingSince)}` : ` · last message ${at(t.lastMessageAt)}`}
                  {t.assignedToName ? ` · assigned to ${t.assignedToName}` : ""}
                </p>
                <p className="line-clamp-2 text-sm">{t.preview}</p>
              </Card>
            </li>
          ))}
        </ul>
      )}
    </>
  );
}
