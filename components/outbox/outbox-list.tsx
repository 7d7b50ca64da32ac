"use client";

import { useState } from "react";
import type { OutboxMessage } from "@/lib/mail/outbox";
import { cn } from "@/components/ui/cn";
import { formatInstant } from "@/lib/format";

/** The studio's sent mail, newest first; times in the studio's zone. */
export function OutboxList({ messages, timeZone }: { messages: OutboxMessage[]; timeZone: string }) {
  const [openId, setOpenId] = useState<string | null>(messages[0]?.id ?? null);
  const [view, setView] = useState<"html" | "text">("html");
  const open = messages.find((m) => m.id === openId);
  return (
    <div className="grid gap-4 lg:grid-cols-[22rem_1fr]">
      <ul className="max-h-[70vh] divide-y divide-line overflow-y-auto rounded-xl border border-line bg-card">
        {messages.map((m) => (
          <li key={m.id}>
            <button
              type="button"
              onClick={() => setOpenId(m.id)}
              aria-current={m.id === openId}
              className={cn("block w-full px-4 py-3 text-left hover:bg-resin-soft", m.id === openId && "bg-resin-soft")}
            >
              <span className="block truncate font-medium">{m.subject}</span>
              <span className="block truncate text-sm text-muted">{m.to.join(", ")}</span>
              <span className="block text-sm text-muted">{formatInstant(m.receivedAt, timeZone, { time: true })}</span>
            </button>
          </li>
        ))}
      </ul>
      {open ? (
        <section aria-label="Message" className="space-y-3 rounded-xl border border-line bg-card p-4">
          <div>
            <h2 className="font-semibold">{open.subject}</h2>
            <p className="text-sm text-muted">To {open.to.join(", ")}</p>
            {open.attachments.length ? (
              <p className="text-sm text-muted">Attachments: {open.attachments.map((a) => a.filename).join(", ")}</p>
            ) : null}
          </div>
          <div role="tablist" aria-label="Part" className="flex gap-2">
            {(["html", "text"] as const).map((v) => (
              <button key={v} role="tab" aria-selected={view === v} type="button" onClick={() => setView(v)} className={cn("min-h-11 rounded-md px-3 text-sm", view === v ? "bg-resin text-white" : "border border-line")}>
                {v === "html" ? "Formatted" : "Plain text"}
              </button>
            ))}
          </div>
          {view === "html" ? (
            <iframe title="Message body" sandbox="" srcDoc={open.html} className="h-[60vh] w-full rounded-lg border border-line bg-white" />
          ) : (
            <pre className="max-h-[60vh] overflow-auto whitespace-pre-wrap rounded-lg border border-line bg-white p-3 text-sm">{open.text}</pre>
          )}
        </section>
      ) : null}
    </div>
  );
}
