"use client";

import { useQuery, useQueryClient } from "@tanstack/react-query";
import { useMemo, useState } from "react";
import { toast } from "sonner";
import { ConfirmDialog } from "@/components/ui/confirm-dialog";
import { Button } from "@/components/ui/button";
import { Notice } from "@/components/ui/notice";
import { cn } from "@/components/ui/cn";
import { SpriteIcon } from "@/components/ui/sprite-icon";
import { apiJson, isApiError } from "@/components/api-client";
import { useRefreshingMutation } from "@/components/forms/use-refreshing-mutation";
import type { SlotView } from "@/lib/visits/slots";
import { formatDate, formatDuration, formatZone, zoneAbbreviation } from "@/lib/format";
import { loadRefusalWords } from "@/components/forms/use-refreshing-mutation";

type Props = {
  jobId: string;
  timeZone: string;
  durationMin: number;
  pieceAddress: string;
  studioLabel: string;
  /** The booked visit, when this page moves it. */
  visit: { id: string; when: string; locationKind: "owner" | "studio"; technicianId: string } | null;
  /** Where to go after booking, moving or cancelling. */
  doneHref: string;
  /** Owners see the studio's notice period; staff book on the owner's behalf. */
  audience: "owner" | "staff";
  leadTimeHours: number;
  cutoffHours: number;
};

const DAY = 86_400_000;

const dayHeading = (date: string) => formatDate(date, { weekday: "long", year: false });

/** Free times for a job's visit, day by day, two weeks at a time; book (or move) with one tap. */
export function SlotPicker(p: Props) {
  const client = useQueryClient();
  const [page, setPage] = useState(0);
  const [location, setLocation] = useState<"owner" | "studio">(p.visit?.locationKind ?? (p.pieceAddress ? "owner" : "studio"));
  const [chosen, setChosen] = useState<SlotView | null>(null);
  const [confirmCancel, setConfirmCancel] = useState(false);
  const [fresh, setFresh] = useState<string | null>(null);
  const [day, setDay] = useState<string | null>(null);
  const [base] = useState(() => Date.now());
  const from = new Date(base + page * 14 * DAY).toISOString();
  const to = new Date(base + (page + 1) * 14 * DAY).toISOString();
  const key = ["slots", p.jobId, from, to];
  const slots = useQuery({
    queryKey: key,
    queryFn: () => apiJson<{ slots: SlotView[] }>(`/api/jobs/${p.jobId}/slots?from=${encodeURIComponent(from)}&to=${encodeURIComponent(to)}`).then((r) => r.slots),
  });
  const byDay = useMemo(() => {
    const m = new Map<string, SlotView[]>();
    for (const s of slots.data ?? []) m.set(s.localDate, [...(m.get(s.localDate) ?? []), s]);
    return [...m.entries()];
  }, [slots.data]);
  const shownDay = byDay.find(([d]) => d === day) ?? byDay[0];

  const book = useRefreshingMutation(
    (c: SlotView) =>
      p.visit
        ? apiJson(`/api/visits/${p.visit.id}`, { method: "PATCH", json: { start: c.start, technicianId: c.technicianId, location } })
        : apiJson("/api/visits", { method: "POST", json: { jobId: p.jobId, technicianId: c.technicianId, start: c.start, location } }),
    {
      onSuccess: () => toast.success(p.visit ? "Visit moved. The updated invite is on its way by e-mail." : "Visit booked. The invite is on its way by e-mail."),
      // Staff land on the week calendar at the visit's week, where the visit now is.
      goTo: (_, c) => (p.audience === "staff" ? `${p.doneHref}?week=${c.localDate}` : p.doneHref),
      onError: (words, e) => {
        toast.error(words);
        // A 409 carries the times that are free now: someone else took the time, so show what is free.
        const freshSlots = isApiError(e) && e.status === 409 ? (e.body.slots as SlotView[] | undefined) : undefined;
        if (!freshSlots) return;
        client.setQueryData(key, freshSlots.filter((s) => s.start >= from && s.start < to));
        setChosen(null);
        setFresh(words);
      },
    },
  );
  const cancelVisit = useRefreshingMutation((visitId: string) => apiJson(`/api/visits/${visitId}/cancel`, { method: "POST", json: {} }), {
    onSuccess: () => {
      toast.success("Visit cancelled. The cancellation is on its way by e-mail.");
      setConfirmCancel(false);
    },
    goTo: () => p.doneHref,
    onError: (words) => {
      setConfirmCancel(false);
      toast.error(words);
    },
  });
  const busy = book.busy || cancelVisit.busy;
  const confirm = () => chosen && book.run(chosen);
  const cancel = () => p.visit && cancelVisit.run(p.visit.id);

  return (
    <div className="space-y-5">
      {p.visit ? (
        <Notice tone="info" title={`Booked for ${p.visit.when}`}>
          Pick a new time below to move it{p.audience === "owner" ? `, up to ${p.cutoffHours} hours before it starts` : ""}.{" "}
          <button type="button" className="min-h-11 font-semibold text-danger underline" onClick={() => setConfirmCancel(true)}>
            Cancel the visit
          </button>
        </Notice>
      ) : null}

      <fieldset className="space-y-2">
        <legend className="text-sm font-semibold">Where</legend>
        <div className="grid gap-2 sm:grid-cols-2">
          {(
            [
              ["owner", p.audience === "owner" ? "At my place" : "At the owner's place", p.pieceAddress || "No address on record"],
              ["studio", "At the studio", p.studioLabel],
            ] as const
          ).map(([value, label, hint]) => (
            <label key={value} className={cn("flex min-h-11 cursor-pointer gap-3 rounded-lg border bg-card p-3", location === value ? "border-resin ring-2 ring-resin/30" : "border-line", value === "owner" && !p.pieceAddress && "opacity-60")}>
              <input type="radio" name="location" value={value} checked={location === value} disabled={value === "owner" && !p.pieceAddress} onChange={() => setLocation(value)} className="mt-1 size-5 accent-[var(--color-resin)]" />
              <span>
                <span className="flex items-center gap-1.5 font-medium">
                  <SpriteIcon name="map-pin" className="size-4" />
                  {label}
                </span>
                <span className="block text-sm text-muted">{hint}</span>
              </span>
            </label>
          ))}
        </div>
      </fieldset>

      <div className="flex items-center justify-between gap-2">
        <Button variant="secondary" aria-label="Earlier dates" disabled={page === 0} onClick={() => setPage((n) => n - 1)}>
          <SpriteIcon name="chevron-left" className="size-4" /> Earlier
        </Button>
        <p className="text-center text-sm text-muted">
          Visits take about {formatDuration(p.durationMin)}. Times in {formatZone(p.timeZone)}.
        </p>
        <Button variant="secondary" aria-label="Later dates" disabled={page >= 4} onClick={() => setPage((n) => n + 1)}>
          Later <SpriteIcon name="chevron-right" className="size-4" />
        </Button>
      </div>

      {fresh ? <Notice tone="warn" title="That time was just taken">{fresh} The list below is up to date.</Notice> : null}
      {slots.isPending ? (
        <p role="status" className="text-muted">Looking for free times…</p>
      ) : slots.isError ? (
        <Notice tone="error" title="Couldn't load the free times">{loadRefusalWords(slots.error)}</Notice>
      ) : byDay.length === 0 ? (
        <Notice tone="info" title="No free times in these two weeks">Try later dates{p.audience === "owner" ? `; visits are booked at least ${p.leadTimeHours} hours ahead` : ""}.</Notice>
      ) : (
        <div className="space-y-4">
          <div role="group" aria-label="Days with free times" className="flex flex-wrap gap-2">
            {byDay.map(([date, list]) => (
              <button
                key={date}
                type="button"
                aria-pressed={shownDay?.[0] === date}
                onClick={() => setDay(date)}
                className={cn("min-h-11 rounded-lg border px-3 py-1 text-sm", shownDay?.[0] === date ? "border-resin bg-resin-soft font-semibold text-resin-dark" : "border-line bg-card hover:border-resin")}
              >
                {formatDate(date, { weekday: "short", short: true, year: false })}
                <span className="block text-xs text-muted">{list.length} free</span>
              </button>
            ))}
          </div>
          {[shownDay!].map(([date, list]) => (
            <section key={date} className="space-y-2" aria-label="Free times">
              <h2 className="font-semibold">{dayHeading(date)}</h2>
              <ul className="grid grid-cols-2 gap-2 sm:grid-cols-4">
                {list.map((s) => {
                  const on = chosen?.start === s.start && chosen.technicianId === s.technicianId;
                  return (
                    <li key={`${s.technicianId}-${s.start}`}>
                      <button
                        type="button"
                        aria-pressed={on}
                        onClick={() => setChosen(s)}
                        className={cn("min-h-11 w-full rounded-lg border px-2 py-2 text-left text-sm", on ? "border-resin bg-resin text-white" : "border-line bg-card hover:border-resin")}
                      >
                        <span className="block font-semibold">
                          {s.localStart}–{s.localEnd}
                        </span>
                        <span className={cn("block text-xs", on ? "text-white/85" : "text-muted")}>with {s.technicianName}</span>
                      </button>
                    </li>
                  );
                })}
              </ul>
            </section>
          ))}
        </div>
      )}

      <div className="sticky bottom-0 -mx-4 border-t border-line bg-paper/95 px-4 py-3 backdrop-blur sm:static sm:mx-0 sm:border-0 sm:bg-transparent sm:p-0">
        <Button className="w-full sm:w-auto" disabled={!chosen || busy} onClick={confirm}>
          <SpriteIcon name="calendar-check" className="size-4" />
          {/* The time names its zone, as every time shown does ("08:00 PST"). */}
          {busy ? "Booking…" : chosen ? `${p.visit ? "Move to" : "Book"} ${dayHeading(chosen.localDate)}, ${chosen.localStart} ${zoneAbbreviation(Date.parse(chosen.start), p.timeZone)}` : "Pick a time"}
        </Button>
      </div>

      <ConfirmDialog open={confirmCancel} title="Cancel this visit?" confirmLabel="Cancel the visit" busy={busy} onConfirm={cancel} onCancel={() => setConfirmCancel(false)}>
        <p>The technician&apos;s time is released and a cancellation goes to your calendar. The job stays open, so a new visit can be booked.</p>
      </ConfirmDialog>
    </div>
  );
}
