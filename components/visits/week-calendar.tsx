"use client";

import { useMutation, useQuery, useQueryClient } from "@tanstack/react-query";
import Link from "next/link";
import { useMemo, useState } from "react";
import { useForm } from "react-hook-form";
import { toast } from "sonner";
import { ConfirmDialog } from "@/components/ui/confirm-dialog";
import { Button } from "@/components/ui/button";
import { cn } from "@/components/ui/cn";
import { SelectField, TextField } from "@/components/ui/field";
import { Notice } from "@/components/ui/notice";
import { SpriteIcon } from "@/components/ui/sprite-icon";
import { addDays, localDateTime, parseHhMm, zonedTimeToEpochMs } from "@/lib/care/dates";
import type { VisitEditFormValues } from "@/lib/validation/visits";
import { useLazyZodResolver } from "@/components/forms/lazy-zod-resolver";
import { apiJson, isApiError } from "@/components/api-client";
import { formatDate, formatZone } from "@/lib/format";
import { loadRefusalWords } from "@/components/forms/use-refreshing-mutation";

type CalVisit = { id: string; jobId: string; technicianId: string; technicianName: string; start: string; end: string; state: "booked" | "done" | "cancelled"; jobTitle: string; pieceTitle: string; ownerName: string | null; location: string; version: number; claimId?: string | null };
type Tech = { id: string; name: string };

const DAY_START = 7 * 60;
const DAY_END = 19 * 60;
const STEP = 30;
const ROW_PX = 30;
const ROWS = (DAY_END - DAY_START) / STEP;
const TECH_STYLES = ["border-resin bg-resin-soft", "border-warn bg-warn-soft", "border-ok bg-ok-soft", "border-ink/40 bg-card"];

const weekdayLabel = (date: string) => formatDate(date, { weekday: "short", short: true, year: false });
const pad = (n: number) => String(n).padStart(2, "0");
const hm = (min: number) => `${pad(Math.floor(min / 60))}:${pad(min % 60)}`;
const initials = (name: string) => name.split(/\s+/).map((w) => w[0]).join("").slice(0, 2).toUpperCase();

/** The studio's week: one column per day, visits placed by their local time; drag a visit or edit it to move it. */
export function WeekCalendar({ timeZone, technicians, initialMonday, today }: { timeZone: string; technicians: Tech[]; initialMonday: string; today: string }) {
  const client = useQueryClient();
  const [monday, setMonday] = useState(initialMonday);
  const [tech, setTech] = useState<string>("");
  const [editing, setEditing] = useState<CalVisit | null>(null);
  const [cancelling, setCancelling] = useState<CalVisit | null>(null);
  const [dragOver, setDragOver] = useState<string | null>(null);
  const days = useMemo(() => Array.from({ length: 7 }, (_, i) => addDays(monday, i)), [monday]);
  const from = new Date(zonedTimeToEpochMs(monday, 0, timeZone)).toISOString();
  const to = new Date(zonedTimeToEpochMs(addDays(monday, 7), 0, timeZone)).toISOString();
  const key = ["visits", tech, from, to];
  const visits = useQuery({
    queryKey: key,
    queryFn: () => apiJson<{ visits: CalVisit[] }>(`/api/visits?from=${encodeURIComponent(from)}&to=${encodeURIComponent(to)}${tech ? `&technician=${tech}` : ""}`).then((r) => r.visits),
  });
  const techIndex = new Map(technicians.map((t, i) => [t.id, i]));

  const move = useMutation({
    mutationFn: (v: { id: string; start: string; technicianId?: string }) => apiJson<{ visit: CalVisit }>(`/api/visits/${v.id}`, { method: "PATCH", json: { start: v.start, technicianId: v.technicianId } }),
    onSuccess: () => toast.success("Visit moved; the owner gets the updated invite."),
    onError: (e) => toast.error(isApiError(e) ? e.message : "Couldn't move the visit."),
    onSettled: () => client.invalidateQueries({ queryKey: ["visits"] }),
  });
  const cancel = useMutation({
    mutationFn: (id: string) => apiJson(`/api/visits/${id}/cancel`, { method: "POST", json: {} }),
    onSuccess: () => {
      toast.success("Visit cancelled; the owner gets the cancellation.");
      setCancelling(null);
      setEditing(null);
    },
    onError: (e) => toast.error(isApiError(e) ? e.message : "Couldn't cancel the visit."),
    onSettled: () => client.invalidateQueries({ queryKey: ["visits"] }),
  });

  function place(v: CalVisit) {
    const s = localDateTime(Date.parse(v.start), timeZone);
    const date = `${s.year}-${pad(s.month)}-${pad(s.day)}`;
    const startMin = s.hour * 60 + s.minute;
    const len = (Date.parse(v.end) - Date.parse(v.start)) / 60_000;
    return { date, startMin, len };
  }

  return (
    <div className="space-y-4">
      <div className="flex flex-wrap items-end justify-between gap-3">
        <div className="flex items-center gap-2">
          <Button variant="secondary" aria-label="Previous week" onClick={() => setMonday(addDays(monday, -7))}>
            <SpriteIcon name="chevron-left" className="size-4" />
          </Button>
          <p className="min-w-44 text-center font-semibold" aria-live="polite">
            Week of {weekdayLabel(monday)}
          </p>
          <Button variant="secondary" aria-label="Next week" onClick={() => setMonday(addDays(monday, 7))}>
            <SpriteIcon name="chevron-right" className="size-4" />
          </Button>
        </div>
        <label className="flex flex-col gap-1.5 text-sm font-medium">
          Technician
          <select className="min-h-11 rounded-lg border border-line bg-white px-3" value={tech} onChange={(e) => setTech(e.target.value)}>
            <option value="">Whole team</option>
            {technicians.map((t) => (
              <option key={t.id} value={t.id}>
                {t.name}
              </option>
            ))}
          </select>
        </label>
      </div>
      <ul className="flex flex-wrap gap-3 text-sm" aria-label="Technicians">
        {technicians.map((t, i) => (
          <li key={t.id} className="flex items-center gap-1.5">
            <span className={cn("inline-flex size-6 items-center justify-center rounded border text-xs font-bold", TECH_STYLES[i % TECH_STYLES.length])}>{initials(t.name)}</span>
            {t.name}
          </li>
        ))}
      </ul>
      {visits.isError ? <Notice tone="error" title="Couldn't load the visits">{loadRefusalWords(visits.error)}</Notice> : null}
      <div className="overflow-x-auto rounded-xl border border-line bg-card">
        <div className="grid min-w-[760px]" style={{ gridTemplateColumns: `3.5rem repeat(7, minmax(0, 1fr))` }} role="group" aria-label="Week of visits" aria-busy={visits.isPending}>
          <div />
          {days.map((d) => (
            <div key={d} className={cn("border-b border-l border-line px-2 py-2 text-sm font-semibold", d === today && "bg-resin-soft")}>
              {weekdayLabel(d)}
            </div>
          ))}
          <div className="relative" style={{ height: ROWS * ROW_PX }}>
            {Array.from({ length: ROWS / 2 }, (_, i) => (
              <span key={i} className="absolute right-1 text-xs text-muted" style={{ top: i * 2 * ROW_PX - 6 }}>
                {hm(DAY_START + i * 60)}
              </span>
            ))}
          </div>
          {days.map((d) => (
            <div key={d} className="relative border-l border-line" style={{ height: ROWS * ROW_PX }}>
              {Array.from({ length: ROWS }, (_, r) => {
                const cell = `${d}|${DAY_START + r * STEP}`;
                return (
                  <div
                    key={r}
                    data-cell={cell}
                    title={`${weekdayLabel(d)} ${hm(DAY_START + r * STEP)}`}
                    className={cn("absolute inset-x-0 border-t", r % 2 ? "border-line/40" : "border-line", dragOver === cell && "bg-resin/15")}
                    style={{ top: r * ROW_PX, height: ROW_PX }}
                    onDragOver={(e) => {
                      e.preventDefault();
                      setDragOver(cell);
                    }}
                    onDragLeave={() => setDragOver((c) => (c === cell ? null : c))}
                    onDrop={(e) => {
                      e.preventDefault();
                      setDragOver(null);
                      const id = e.dataTransfer.getData("text/visit-id");
                      if (!id) return;
                      move.mutate({ id, start: new Date(zonedTimeToEpochMs(d, DAY_START + r * STEP, timeZone)).toISOString() });
                    }}
                  />
                );
              })}
              {(visits.data ?? [])
                .filter((v) => place(v).date === d)
                .map((v) => {
                  const p = place(v);
                  const top = ((Math.max(p.startMin, DAY_START) - DAY_START) / STEP) * ROW_PX;
                  const height = Math.max(ROW_PX, (Math.min(p.len, DAY_END - p.startMin) / STEP) * ROW_PX - 2);
                  const style = TECH_STYLES[(techIndex.get(v.technicianId) ?? 3) % TECH_STYLES.length];
                  const movable = v.state === "booked";
                  return (
                    <button
                      key={v.id}
                      type="button"
                      draggable={movable}
                      onDragStart={(e) => e.dataTransfer.setData("text/visit-id", v.id)}
                      onClick={() => setEditing(v)}
                      className={cn("absolute inset-x-1 overflow-hidden rounded-md border-l-4 px-1.5 py-1 text-left text-xs shadow-sm", style, v.state === "done" && "opacity-70")}
                      style={{ top, height }}
                      aria-label={`${v.jobTitle}, ${hm(p.startMin)}, ${v.technicianName}${v.state === "done" ? ", done" : ""}. Open to move or cancel.`}
                    >
                      <span className="flex min-w-0 items-center gap-1">
                        {movable ? <SpriteIcon name="grip-vertical" className="size-3 shrink-0" /> : null}
                        <span className="shrink-0 font-semibold">
                          {hm(p.startMin)} {initials(v.technicianName)}
                          {v.state === "done" ? " · done" : ""}
                        </span>
                        {p.len < 60 ? <span className="truncate">{v.pieceTitle}</span> : null}
                      </span>
                      {p.len >= 60 ? <span className="block truncate">{v.pieceTitle}</span> : null}
                    </button>
                  );
                })}
            </div>
          ))}
        </div>
      </div>
      <p className="text-sm text-muted">Drag a visit to a new time, or open it to edit. Moves go through the same checks as booking: working hours, time off, travel buffer and other visits. Times in {formatZone(timeZone)}.</p>
      {editing ? <EditVisit key={editing.id} visit={editing} technicians={technicians} timeZone={timeZone} onClose={() => setEditing(null)} onCancel={() => setCancelling(editing)} onMoved={() => client.invalidateQueries({ queryKey: ["visits"] })} /> : null}
      <ConfirmDialog open={cancelling !== null} title="Cancel this visit?" confirmLabel="Cancel the visit" busy={cancel.isPending} onConfirm={() => cancelling && cancel.mutate(cancelling.id)} onCancel={() => setCancelling(null)}>
        <p>{cancelling ? `${cancelling.jobTitle} — ${cancelling.ownerName ?? "no owner"}. ` : ""}The owner gets a cancellation for their calendar, and the job is open for a new booking.</p>
      </ConfirmDialog>
    </div>
  );
}

function EditVisit({ visit, technicians, timeZone, onClose, onCancel, onMoved }: { visit: CalVisit; technicians: Tech[]; timeZone: string; onClose: () => void; onCancel: () => void; onMoved: () => void }) {
  const s = localDateTime(Date.parse(visit.start), timeZone);
  const form = useForm<VisitEditFormValues>({
    resolver: useLazyZodResolver(() => import("@/lib/validation/visits").then((m) => m.visitEditFormSchema)),
    defaultValues: { date: `${s.year}-${pad(s.month)}-${pad(s.day)}`, time: `${pad(s.hour)}:${pad(s.minute)}`, technicianId: visit.technicianId },
    // Checked on pressing the button, then as fields are fixed: an error shown on leaving a field moved the
    // button during the press (the same choice as components/claims/claim-form.tsx).
    mode: "onSubmit",
    reValidateMode: "onChange",
  });
  const [error, setError] = useState<string | null>(null);
  const errors = form.formState.errors;
  const submit = form.handleSubmit(async (v) => {
    setError(null);
    try {
      const start = new Date(zonedTimeToEpochMs(v.date, parseHhMm(v.time), timeZone)).toISOString();
      await apiJson(`/api/visits/${visit.id}`, { method: "PATCH", json: { start, technicianId: v.technicianId } });
      toast.success("Visit moved; the owner gets the updated invite.");
      onMoved();
      onClose();
    } catch (e) {
      setError(isApiError(e) ? e.message : "Couldn't move the visit.");
      if (isApiError(e) && e.fieldErrors?.technicianId?.[0]) form.setError("technicianId", { message: e.fieldErrors.technicianId[0] });
    }
  });
  return (
    <section aria-label="Edit visit" className="space-y-4 rounded-xl border border-resin/40 bg-card p-4">
      <div className="flex flex-wrap items-start justify-between gap-2">
        <div>
          <h2 className="font-semibold">{visit.jobTitle}</h2>
          <p className="text-sm text-muted">
            {visit.pieceTitle} · {visit.ownerName ?? "no owner"} · {visit.location}
          </p>
        </div>
        <span className="flex flex-wrap gap-x-4">
          <Link className="inline-flex min-h-11 items-center text-sm text-resin underline" href={`/studio/jobs/${visit.jobId}`}>
            Open the job
          </Link>
          {visit.claimId ? (
            <Link className="inline-flex min-h-11 items-center text-sm text-resin underline" href={`/studio/claims/${visit.claimId}`}>
              Open the claim
            </Link>
          ) : null}
        </span>
      </div>
      {visit.state !== "booked" ? (
        <p className="text-sm">This visit is {visit.state}; it can&apos;t be moved.</p>
      ) : (
        <form onSubmit={submit} noValidate className="space-y-3">
          {error ? <Notice tone="error" title="Not moved">{error}</Notice> : null}
          <div className="grid gap-3 sm:grid-cols-3">
            <TextField label="Date" type="date" error={errors.date?.message} {...form.register("date")} />
            <TextField label="Start time" type="time" step={1800} error={errors.time?.message} {...form.register("time")} />
            <SelectField label="Technician" error={errors.technicianId?.message} {...form.register("technicianId")}>
              {technicians.map((t) => (
                <option key={t.id} value={t.id}>
                  {t.name}
                </option>
              ))}
            </SelectField>
          </div>
          <div className="flex flex-wrap gap-2">
            <Button type="submit" disabled={form.formState.isSubmitting}>
              {form.formState.isSubmitting ? "Moving…" : "Move the visit"}
            </Button>
            <Button variant="secondary" onClick={onClose}>
              Close
            </Button>
            <Button variant="danger" onClick={onCancel}>
              Cancel the visit
            </Button>
          </div>
        </form>
      )}
    </section>
  );
}
