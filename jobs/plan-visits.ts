// The care plan job: one pass of lib/plans/visits at an instant (included visits become studio jobs
// ahead of their due date; plans paid by other means end at their period's end), with a summary.
import { runPlanVisits } from "@/lib/plans/visits";

export async function planVisitsJob(now: Date): Promise<string[]> {
  const r = await runPlanVisits(now);
  return [...r.jobs.map((id) => `created  plan visit job ${id}`), `plan visit pass at ${now.toISOString()}: ${r.jobs.length} jobs created, ${r.ended} plans paid by other means ended`];
}
