// `npm run jobs`: the scheduler process. node-cron runs the reminder pass at minute 5 of every hour
// (and once at start), visit reminders every 15 minutes (and once at start), the retry of queued mail
// every minute, the care-plan visit pass at minute 25, unfinished plan changes of hands, job refunds left pending, payment pages left open by a
// release and stalled hand-over mailings every 5 minutes,
// the merge of the search indexes and then the refresh of the query planner's statistics at 03:40 (server time) every night,
// never two of a kind at once in this process; the ledger keeps passes in other processes
// from sending anything twice. SIGTERM/SIGINT stop the schedule and abort the running passes, and
// the process waits for each of them: each finishes the message in hand, puts back what it had claimed but not sent, and returns at once (see
// "Stopping" in lib/reminders/pass.ts); then the process exits 0 and the next pass does the rest.
import cron from "node-cron";
import { getDb } from "@/db/client";
import { closeMailTransport, retryQueuedMail } from "@/lib/mail";
import { describePass, remindersJob } from "./reminders";
import { planVisitsJob } from "./plan-visits";
import { planTransfersJob } from "./plan-transfers";
import { jobRefundsJob } from "./job-refunds";
import { checkoutClosesJob } from "./checkout-closes";
import { describeHandoverMailings, handoverMailingsJob } from "./handover-mailings";
import { describeVisitPass, visitRemindersJob } from "./visit-reminders";
import { searchIndexesJob } from "./search-indexes";

const log = (line: string) => console.log(`${new Date().toISOString()} ${line}`);
const failure = (e: unknown) => (e instanceof Error ? (e.stack ?? e.message) : String(e));

/** Aborted on SIGTERM/SIGINT; every pass this process starts gets its signal. */
const shutdown = new AbortController();

/**
 * One kind of pass on a cron line: never two of it at once in this process (the start-up run and the
 * first tick can meet), none started once stopping, and the running one kept so that stop() waits for it.
 */
function pass(name: string, cronLine: string, run: (now: Date, signal: AbortSignal) => Promise<string[]>) {
  let running: Promise<void> | undefined;
  const tick = async (): Promise<void> => {
    if (running || shutdown.signal.aborted) return;
    running = run(new Date(), shutdown.signal)
      .then((lines) => lines.forEach(log), (e: unknown) => log(`${name} failed: ${failure(e)}`))
      .finally(() => {
        running = undefined;
      });
    await running;
  };
  const task = cron.schedule(cronLine, tick, { name, noOverlap: true });
  return { tick, running: () => running, stop: async () => { await task.stop(); await task.destroy(); } };
}

getDb(); // refuses an unmigrated database before anything is scheduled
const passes = [
  pass("reminder pass", "5 * * * *", (now, signal) => remindersJob(now, signal).then(describePass)),
  // Visit reminders (24 h before each booked visit).
  pass("visit reminder pass", "*/15 * * * *", (now, signal) => visitRemindersJob(now, signal).then(describeVisitPass)),
  // Mail SMTP refused when it was sent (lib/mail sendMail): what is due.
  pass("mail retry", "* * * * *", (_now, signal) =>
    retryQueuedMail({ signal }).then((r) => (r.sent + r.failed + r.gaveUp + r.stale > 0 ? [`mail retry: sent ${r.sent}, failed again ${r.failed}, given up ${r.gaveUp}, cut-off tries taken up again ${r.stale}`] : [])),
  ),
  // Care plans: included visits become jobs ahead of their due date.
  pass("plan visit pass", "25 * * * *", (now) => planVisitsJob(now)),
  // Care plans whose change of hands Stripe couldn't be told of at the time: finished.
  pass("plan transfer pass", "*/5 * * * *", () => planTransfersJob()),
  // Refunds on repair jobs the payment service didn't answer and nobody finished: asked again, same key.
  pass("job refund pass", "*/5 * * * *", (now) => jobRefundsJob(now)),
  // Payment pages a release couldn't close at Stripe: asked again until closed or expired.
  pass("payment page close pass", "*/5 * * * *", (now) => checkoutClosesJob(now)),
  // Bulk hand-over mailings left half-sent (the server stopped): finished, each piece once.
  pass("hand-over mailing pass", "*/5 * * * *", (now, signal) => handoverMailingsJob(now, signal).then(describeHandoverMailings)),
  // The registry's and the clients list's search indexes merged to one segment each (db/search-indexes.ts),
  // then the planner's statistics of the tables that grew or shrank tenfold analyzed again (db/client.ts).
  pass("search index merge", "40 3 * * *", (_now, signal) => searchIndexesJob(signal)),
];
const [reminders, visitReminders] = passes;
void visitReminders!.tick();
log("scheduler: care reminders hourly at minute 5; running one pass now");
void reminders!.tick();

let stopping = false;
async function stop(signal: string): Promise<void> {
  if (stopping) return;
  stopping = true;
  const busy = passes.some((p) => p.running());
  log(`scheduler: ${signal}, stopping${busy ? " (a running pass stops after the message in hand)" : ""}`);
  shutdown.abort();
  for (const p of passes) await p.stop();
  await Promise.all(passes.map((p) => p.running()));
  closeMailTransport();
  getDb().$client.close();
  log("scheduler: stopped");
  process.exit(0);
}
process.on("SIGTERM", () => void stop("SIGTERM"));
process.on("SIGINT", () => void stop("SIGINT"));
