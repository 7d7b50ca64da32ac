import Link from "next/link";
import { MessageForm } from "@/components/inbox/message-form";
import { MessageList } from "@/components/inbox/message-list";
import { Card } from "@/components/ui/card";
import { requireUser } from "@/lib/auth/guards";
import { ownerConversations, ownerJobConversation } from "@/lib/messages/service";
import type { MessageView } from "@/lib/messages/store";
import { formatInstant } from "@/lib/format";

// The owner's side of conversations, included once on the job page and once on the piece page.
// (The claim page has its own, lib/claims; the messages are the same thread.)

function shown(messages: MessageView[], timeZone: string, studioName: string) {
  return messages.map((m) => ({
    id: m.id,
    mine: m.author === "owner",
    who: m.author === "owner" ? "You" : `${m.authorName} · ${studioName}`,
    when: formatInstant(new Date(m.createdAt), timeZone, { time: true }),
    byEmail: m.source === "email",
    body: m.body,
  }));
}

/** Messages with the studio about a repair job (and its visits), and a form to write one. */
export async function JobConversation({ jobId, studioName }: { jobId: string; studioName: string }) {
  const user = await requireUser();
  const { canWrite, messages } = ownerJobConversation(user, jobId);
  return (
    <section aria-labelledby="job-messages-heading" className="space-y-3">
      <h2 id="job-messages-heading" className="font-display text-xl font-semibold">
        Messages with {studioName}
      </h2>
      {/* Without the form (a former owner's record), the empty list doesn't invite them to ask. */}
      <MessageList messages={shown(messages, user.timeZone, studioName)} empty={canWrite ? "No messages yet. Ask the studio anything about this repair." : "No messages."} />
      {canWrite ? <MessageForm endpoint={`/api/threads?about=job&id=${encodeURIComponent(jobId)}`} label={`Message to ${studioName}`} sentText={`Message sent to ${studioName}.`} /> : null}
      {canWrite ? <p className="text-sm text-muted">You can also answer the studio&apos;s e-mails by replying to them.</p> : null}
    </section>
  );
}

/** Every conversation about one of the owner's pieces, newest first, each with a link to answer it. */
export async function PieceConversations({ pieceId, studioName }: { pieceId: string; studioName: string }) {
  const user = await requireUser();
  const conversations = ownerConversations(user, { pieceId });
  if (conversations.length === 0) return null;
  return (
    <section aria-labelledby="piece-messages-heading" className="space-y-3">
      <h2 id="piece-messages-heading" className="font-display text-xl font-semibold">
        Messages with {studioName}
      </h2>
      <ul className="space-y-3">
        {conversations.map((c) => {
          const last = c.messages.at(-1);
          return (
            <li key={c.threadId}>
              <Card className="space-y-1">
                <Link href={c.href} className="inline-flex min-h-11 items-center font-semibold text-resin underline">
                  {c.title}
                </Link>
                {last ? (
                  <p className="text-sm text-muted">
                    {last.author === "owner" ? "You" : last.authorName} · {formatInstant(new Date(last.createdAt), user.timeZone, { time: true })}
                  </p>
                ) : null}
                {last ? <p className="line-clamp-2 text-sm">{last.body}</p> : null}
              </Card>
            </li>
          );
        })}
      </ul>
    </section>
  );
}
