"use client";

import { useMutation, useQuery, useQueryClient } from "@tanstack/react-query";
import { useState } from "react";
import { toast } from "sonner";
import { apiJson, isApiError } from "@/components/api-client";
import { Button } from "@/components/ui/button";
import { Card } from "@/components/ui/card";
import { cn } from "@/components/ui/cn";
import { Notice } from "@/components/ui/notice";
import { SpriteIcon } from "@/components/ui/sprite-icon";
import type { SpriteIconName } from "@/components/ui/sprite-names";
import type { LedgerListRow, UpcomingRow } from "@/lib/reminders/staff";
import { formatDate, formatInstant } from "@/lib/format";
import { loadRefusalWords } from "@/components/forms/use-refreshing-mutation";

type View = "upcoming" | "ledger";
type Filters = { status: string; kind: string; step: string; q: string };

const KINDS: [string, string][] = [
  ["reoil", "Re-oil"],
  ["topcoat_refresh", "Topcoat refresh"],
  ["rewax", "Re-wax"],
  ["film_inspect", "Inspect film finish"],
  ["resin_polish", "Polish and inspect resin"],
  ["reoil_charred", "Re-oil charred surface"],
  ["annual_check", "Annual clean and check"],
];
const STEPS: [string, string][] = [
  ["before_14d", "14 days before"],
  ["due_day", "On the due date"],
  ["after_30d", "30 days after"],
];
const STEP_WORDS = Object.fromEntries(STEPS) as Record<string, string>;

type Badge = { icon: SpriteIconName; word: string; tone: string };
const STATUS: Record<string, Badge> = {
  queued: { icon: "hourglass", word: "Sending", tone: "text-resin" },
  sent: { icon: "circle-check", word: "Sent", tone: "text-ok" },
  failed: { icon: "circle-exclamation-point", word: "Failed", tone: "text-danger" },
  skipped: { icon: "skip-forward", word: "Skipped", tone: "text-muted" },
  cancelled: { icon: "ban", word: "Cancelled", tone: "text-muted" },
  scheduled: { icon: "clock", word: "Scheduled", tone: "text-resin" },
  piece_paused: { icon: "circle-pause", word: "Paused for this piece", tone: "text-warn" },
  owner_unsubscribed: { icon: "user-x", word: "Owner unsubscribed", tone: "text-warn" },
  address_unconfirmed: { icon: "user-x", word: "Address not confirmed", tone: "text-warn" },
};

function StatusBadge({ status }: { status: string }) {
  const b = STATUS[status] ?? { icon: "clock", word: status, tone: "text-ink" };
  return (
    <span className={cn("inline-flex items-center gap-1.5 text-sm font-medium", b.tone)}>
      <SpriteIcon name={b.icon} className="size-4" />
      {b.word}
    </span>
  );
}

type Resent = { status: string; error?: string };

/** A resend that the mail server refused again answers 502 with what it said: shown, not thrown. */
const resendReminder = (id: string) =>
  apiJson<Resent>(`/api/reminders/${id}/resend`, { method: "POST" }).catch((e: unknown) => {
    if (isApiError(e) && e.status === 502 && e.body.status === "failed") return e.body as Resent;
    throw e;
  });


/** Send times in the studio's zone, named ("3 December 2026, 09:00 PST"). */
export function RemindersBoard({ timeZone }: { timeZone: string }) {
  const when = (ms: string | number | Date | null) => (ms ? formatInstant(new Date(ms), timeZone, { time: true }) : "—");
  const [view, setView] = useState<View>("upcoming");
  const [filters, setFilters] = useState<Filters>({ status: "", kind: "", step: "", q: "" });
  const qc = useQueryClient();
  const params = new URLSearchParams({ view, ...Object.fromEntries(Object.entries(filters).filter(([k, v]) => v && (view === "ledger" || k !== "status"))) });
  const query = useQuery({
    queryKey: ["reminders", view, filters],
    queryFn: ({ signal }) => apiJson<{ rows: (UpcomingRow | LedgerListRow)[] }>(`/api/reminders?${params}`, { signal }),
  });
  const pause = useMutation({
    mutationFn: (v: { pieceId: string; paused: boolean }) => apiJson<{ remindersPaused: boolean }>("/api/reminders/pause", { method: "POST", json: v }),
    onSuccess: (r) => {
      toast.success(r.remindersPaused ? "Reminders paused for this piece." : "Reminders resumed for this piece.");
      void qc.invalidateQueries({ queryKey: ["reminders"] });
    },
    onError: (e) => toast.error(e.message),
  });
  const resend = useMutation({
    mutationFn: resendReminder,
    onSuccess: (r) => {
      if (r.status === "sent") toast.success("Sent again.");
      else toast.error(`Still failing: ${r.error}`);
      void qc.invalidateQueries({ queryKey: ["reminders"] });
    },
    onError: (e) => toast.error(e.message),
  });
  const set = (k: keyof Filters) => (e: { target: { value: string } }) => setFilters((f) => ({ ...f, [k]: e.target.value }));
  const select = "min-h-11 rounded-lg border border-line bg-white px-3 text-sm";

  return (
    <div className="space-y-4">
      <div role="tablist" aria-label="Reminders" className="flex gap-2">
        {(
          [
            ["upcoming", "Next 30 days"],
            ["ledger", "Sent, failed and skipped"],
          ] as const
        ).map(([v, label]) => (
          <button key={v} type="button" role="tab" aria-selected={view === v} onClick={() => setView(v)} className={cn("min-h-11 rounded-md px-3 text-sm font-medium", view === v ? "bg-resin text-white" : "border border-line bg-card")}>
            {label}
          </button>
        ))}
      </div>
      <form className="flex flex-wrap items-end gap-3" onSubmit={(e) => e.preventDefault()} aria-label="Filters">
        <label className="space-y-1 text-sm">
          <span className="block font-medium">Search</span>
          <input type="search" value={filters.q} onChange={set("q")} placeholder="Piece or owner" className={cn(select, "w-56")} />
        </label>
        {view === "ledger" ? (
          <label className="space-y-1 text-sm">
            <span className="block font-medium">Status</span>
            <select value={filters.status} onChange={set("status")} className={select}>
              <option value="">Any</option>
              {["sent", "failed", "skipped", "cancelled", "queued"].map((s) => (
                <option key={s} value={s}>{STATUS[s]!.word}</option>
              ))}
            </select>
          </label>
        ) : null}
        <label className="space-y-1 text-sm">
          <span className="block font-medium">Task</span>
          <select value={filters.kind} onChange={set("kind")} className={select}>
            <option value="">Any</option>
            {KINDS.map(([v, l]) => (
              <option key={v} value={v}>{l}</option>
            ))}
          </select>
        </label>
        <label className="space-y-1 text-sm">
          <span className="block font-medium">Reminder</span>
          <select value={filters.step} onChange={set("step")} className={select}>
            <option value="">Any</option>
            {STEPS.map(([v, l]) => (
              <option key={v} value={v}>{l}</option>
            ))}
          </select>
        </label>
      </form>

      {query.isError ? <Notice tone="error" title="Couldn't load reminders">{loadRefusalWords(query.error)}</Notice> : null}
      {query.isPending ? <Card aria-busy="true">Loading…</Card> : null}
      {query.data && query.data.rows.length === 0 ? <Card>{view === "upcoming" ? "Nothing goes out in the next 30 days." : "No reminders match."}</Card> : null}
      {query.data && query.data.rows.length > 0 ? (
        // Below md each row is a card of stacked lines, so a phone reads it without scrolling sideways;
        // the table's columns come back from md up.
        <div className="relative overflow-x-auto rounded-xl border border-line bg-card">
          <table className="block w-full text-left text-sm md:table md:min-w-[48rem]">
            <thead className="hidden border-b border-line text-muted md:table-header-group">
              <tr>
                <th scope="col" className="px-3 py-2 font-medium">{view === "upcoming" ? "Goes out" : "Updated"}</th>
                <th scope="col" className="px-3 py-2 font-medium">Piece · owner</th>
                <th scope="col" className="px-3 py-2 font-medium">Task</th>
                <th scope="col" className="px-3 py-2 font-medium">Reminder</th>
                <th scope="col" className="px-3 py-2 font-medium">Status</th>
                <th scope="col" className="px-3 py-2 font-medium"><span className="sr-only">Actions</span></th>
              </tr>
            </thead>
            <tbody className="block divide-y divide-line md:table-row-group">
              {view === "upcoming"
                ? (query.data.rows as UpcomingRow[]).map((r) => (
                    <tr key={`${r.taskKey}:${r.step}`} className={ROW}>
                      <td className={cn(CELL, "tabular-nums")}><span className="md:hidden">Goes out </span>{formatDate(r.on, { short: true })}</td>
                      <td className={CELL}>
                        <span className="font-medium">{r.pieceTitle}</span>
                        <span className="block text-muted">{r.ownerName}</span>
                      </td>
                      <td className={CELL}>{r.taskLabel} <span className="block text-muted">due {formatDate(r.dueOn, { short: true })}</span></td>
                      <td className={CELL}>{STEP_WORDS[r.step]}</td>
                      <td className={CELL}><StatusBadge status={r.state} /></td>
                      <td className={cn(CELL, "md:text-right")}>
                        <PauseButton paused={r.remindersPaused} busy={pause.isPending} onClick={() => pause.mutate({ pieceId: r.pieceId, paused: !r.remindersPaused })} />
                      </td>
                    </tr>
                  ))
                : (query.data.rows as LedgerListRow[]).map((r) => (
                    <tr key={r.id} className={ROW}>
                      {/* The row's one time: for a sent reminder its sending (lib/reminders/deliver.ts stamps sent_at and
                          updated_at alike), so it is not written again under the status. */}
                      <td className={cn(CELL, "tabular-nums")}><span className="md:hidden">Updated </span>{when(r.updatedAt)}</td>
                      <td className={CELL}>
                        <span className="font-medium">{r.pieceTitle}</span>
                        <span className="block text-muted">{r.ownerName} · {r.ownerEmail}</span>
                      </td>
                      <td className={CELL}>{r.taskLabel} <span className="block text-muted">due {formatDate(r.dueOn, { short: true })}</span></td>
                      <td className={CELL}>{STEP_WORDS[r.step]}</td>
                      <td className={CELL}>
                        <StatusBadge status={r.status} />
                        {r.status === "failed" ? (
                          <span className="block max-w-xs text-xs text-muted">
                            {r.lastError}
                            {r.nextAttemptAt ? ` Next try ${when(r.nextAttemptAt)}.` : " No automatic retry."}
                          </span>
                        ) : null}
                      </td>
                      <td className={cn(CELL, "space-y-1 md:text-right")}>
                        {r.status === "failed" ? (
                          <Button variant="secondary" disabled={resend.isPending} onClick={() => resend.mutate(r.id)}>
                            <SpriteIcon name="rotate-cw" className="size-4" /> Resend
                          </Button>
                        ) : null}
                        <PauseButton paused={r.remindersPaused} busy={pause.isPending} onClick={() => pause.mutate({ pieceId: r.pieceId, paused: !r.remindersPaused })} />
                      </td>
                    </tr>
                  ))}
            </tbody>
          </table>
        </div>
      ) : null}
    </div>
  );
}

/** A row: a card of stacked lines below md, a table row from md up. */
const ROW = "block py-2 md:table-row md:py-0";
const CELL = "block px-3 py-0.5 md:table-cell md:py-2";

function PauseButton({ paused, busy, onClick }: { paused: boolean; busy: boolean; onClick: () => void }) {
  return (
    <Button variant="ghost" disabled={busy} onClick={onClick}>
      {paused ? <SpriteIcon name="circle-play" className="size-4" /> : <SpriteIcon name="circle-pause" className="size-4" />}
      {paused ? "Resume reminders" : "Pause reminders"}
    </Button>
  );
}
