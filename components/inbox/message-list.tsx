import { cn } from "@/components/ui/cn";

/** A message as the page shows it: the time already written in the reader's zone (lib/owner/format). */
export type ShownMessage = { id: string; mine: boolean; who: string; when: string; byEmail: boolean; body: string };

/** A thread's messages, oldest first; the reader's own on the right. */
export function MessageList({ messages, empty }: { messages: ShownMessage[]; empty: string }) {
  if (messages.length === 0) return <p className="text-sm text-muted">{empty}</p>;
  return (
    <ol className="space-y-2">
      {messages.map((m) => (
        <li key={m.id} className={cn("max-w-[90%] rounded-xl border p-3", m.mine ? "ml-auto border-resin/30 bg-resin-soft" : "border-line bg-card")}>
          <p className="text-xs text-muted">
            {m.who} · {m.when}
            {m.byEmail ? " · by e-mail" : ""}
          </p>
          <p className="mt-1 whitespace-pre-wrap break-words">{m.body}</p>
        </li>
      ))}
    </ol>
  );
}
