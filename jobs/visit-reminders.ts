// The visit reminder job: one pass of lib/visits/reminders at an instant, with a printable summary.
import { runVisitReminderPass, type VisitReminderReport } from "@/lib/visits/reminders";

export async function visitRemindersJob(now: Date, signal?: AbortSignal): Promise<VisitReminderReport> {
  return runVisitReminderPass({ now, signal });
}

export function describeVisitPass(r: VisitReminderReport): string[] {
  const lines = r.sent.map((s) => `sent     ${s.to}  visit reminder  [${s.visitId} seq ${s.sequence}]`);
  for (const f of r.failed) lines.push(`failed   visit ${f.visitId}  ${f.error}`);
  lines.push(`visit reminder pass at ${r.now}: sent ${r.sent.length}, skipped ${r.skipped}, failed ${r.failed.length}${r.stopped ? " — stopped before the end" : ""}`);
  return lines;
}
