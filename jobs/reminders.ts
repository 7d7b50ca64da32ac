// The reminder job: one pass of lib/reminders at an instant, with a printable summary.
import { runReminderPass, type PassReport } from "@/lib/reminders/pass";

/** `signal`: aborting it stops the pass cleanly (lib/reminders/pass.ts, "Stopping"). */
export async function remindersJob(now: Date, signal?: AbortSignal): Promise<PassReport> {
  return runReminderPass({ now, signal });
}

export function describePass(r: PassReport): string[] {
  const lines = r.sent.map((m) => `sent     ${m.to}  "${m.subject}"  [${m.reminderKey}]${m.offerId ? " + refresh offer" : ""}`);
  for (const f of r.failed) lines.push(`failed   ${f.to}  [${f.reminderKey}]  ${f.error}${f.willRetry ? " (will retry)" : ""}`);
  for (const e of r.errors) lines.push(`error    piece ${e.pieceId}: ${e.message}`);
  lines.push(
    `reminder pass at ${r.now}: ${r.pieces} pieces, ${r.tasks} tasks — sent ${r.sent.length}, skipped ${r.skipped}, failed ${r.failed.length}, ` +
      `cancelled ${r.cancelled}, offers ${r.offers}, recovered ${r.recovered}, interrupted ${r.interrupted}, lost ${r.lost} (${Math.round(r.ms)} ms)` +
      (r.stopped ? ` — stopped before the end; ${r.released} reminders it held for sending put back for the next pass` : ""),
  );
  return lines;
}
