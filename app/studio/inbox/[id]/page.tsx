import type { Metadata } from "next";
import Link from "next/link";
import { MessageForm } from "@/components/inbox/message-form";
import { MessageList } from "@/components/inbox/message-list";
import { RefreshOnce } from "@/components/inbox/refresh-once";
import { ThreadControls } from "@/components/inbox/thread-controls";
import { Card } from "@/components/ui/card";
import { StatusBadge } from "@/components/ui/status";
import { requireStaff } from "@/lib/auth/guards";
import { forPage } from "@/lib/auth/page";
import { getThread } from "@/lib/messages/service";
import { ABOUT_LABELS, THREAD_STATE_WORDS } from "@/lib/messages/words";
import { formatInstant, formatWait } from "@/lib/format";

export const metadata: Metadata = { title: "Conversation" };
export const dynamic = "force-dynamic";

export default async function InboxThreadPage({ params }: { params: Promise<{ id: string }> }) {
  const { id } = await params;
  // Opening a conversation here is what takes it out of unread.
  const t = await forPage(async () => getThread(await requireStaff(), id, { markRead: true }));
  const at = (iso: string) => formatInstant(new Date(iso), t.timeZone, { time: true });
  const ownerName = t.owner?.name ?? "Former owner";
  return (
    <div className="space-y-6">
      {t.openedNow ? <RefreshOnce /> : null}
      <p className="text-sm">
        <Link href="/studio/inbox" className="inline-flex min-h-11 items-center text-resin underline">
          ← Inbox
        </Link>
      </p>
      <header className="space-y-2">
        <h1 className="font-display text-3xl font-semibold tracking-tight">
          {ownerName} · {t.piece.title}
        </h1>
        <div className="flex flex-wrap items-center gap-2 text-sm text-muted">
          <StatusBadge label={THREAD_STATE_WORDS[t.thread.state]} tone={t.thread.state === "done" ? "ok" : "progress"} />
          <Link href={t.subjectHref} className="inline-flex min-h-11 items-center text-resin underline">
            Open the {ABOUT_LABELS[t.thread.about].toLowerCase()}
          </Link>
          {t.owner ? <span>{t.owner.email}</span> : null}
          {t.thread.waitingSince && t.thread.waitedMs !== null ? (
            <span>
              Waiting {formatWait(t.thread.waitedMs)}, since {at(t.thread.waitingSince)}
            </span>
          ) : null}
        </div>
      </header>
      <Card>
        <ThreadControls threadId={t.thread.id} state={t.thread.state} assignedToId={t.thread.assignedToId} staff={t.staff} />
      </Card>
      <section aria-labelledby="messages-heading" className="space-y-3">
        <h2 id="messages-heading" className="font-display text-xl font-semibold">
          Messages
        </h2>
        <MessageList
          empty="No messages yet."
          messages={t.messages.map((m) => ({ id: m.id, mine: m.author === "staff", who: m.author === "staff" ? m.authorName : `${m.authorName || ownerName} · owner`, when: at(m.createdAt), byEmail: m.source === "email", body: m.body }))}
        />
        {t.owner ? (
          <MessageForm endpoint={`/api/threads/${t.thread.id}/messages`} label={`Reply to ${ownerName}`} sentText={`Reply sent to ${ownerName}.`} submitText="Send reply" />
        ) : (
          <p className="text-sm text-muted">This piece has no owner on record any more, so there is nobody to reply to.</p>
        )}
      </section>
    </div>
  );
}
