// `npm run jobs`: the scheduler process. node-cron runs the reminder pass at minute 5 of every hour
// (and once at start), visit reminders every 15 minutes and the retry of queued mail every minute,
// never two of a kind at once in this process; the ledger keeps passes in other processes
// from sending anything twice. SIGTERM/SIGINT stop the schedule and abort the running passes: each
// finishes the message in hand, puts back what it had claimed but not sent, and returns at once (see
// "Stopping" in lib/reminders/pass.ts); then the process exits 0 and the next pass does the rest.
import cron from "node-cron";
import { getDb } from "@/db/client";
import { closeMailTransport, retryQueuedMail } from "@/lib/mail";
import { describePass, remindersJob } from "./reminders";
import { planVisitsJob } from "./plan-visits";
import { describeHandoverMailings, handoverMailingsJob } from "./handover-mailings";
import { describeVisitPass, visitRemindersJob } from "./visit-reminders";

const log = (line: string) => console.log(`${new Date().toISOString()} ${line}`);

/** Aborted on SIGTERM/SIGINT; every pass this process starts gets its signal. */
const shutdown = new AbortController();

let running: Promise<unknown> | undefined;
async function tick(): Promise<void> {
  if (running || shutdown.signal.aborted) return; // a pass is still going (the start-up pass and the first tick can meet)
  const pass = remindersJob(new Date(), shutdown.signal)
    .then((r) => describePass(r).forEach(log))
    .catch((e: unknown) => log(`reminder pass failed: ${e instanceof Error ? (e.stack ?? e.message) : String(e)}`))
    .finally(() => {
      running = undefined;
    });
  running = pass;
  await pass;
}

// Visit reminders (24 h before each booked visit): every 15 minutes, one pass at a time.
let visitRunning: Promise<unknown> | undefined;
async function visitTick(): Promise<void> {
  if (visitRunning || shutdown.signal.aborted) return;
  const pass = visitRemindersJob(new Date(), shutdown.signal)
    .then((r) => describeVisitPass(r).forEach(log))
    .catch((e: unknown) => log(`visit reminder pass failed: ${e instanceof Error ? (e.stack ?? e.message) : String(e)}`))
    .finally(() => {
      visitRunning = undefined;
    });
  visitRunning = pass;
  await pass;
}

// Mail SMTP refused when it was sent (lib/mail sendMail): every minute, what is due.
let mailRunning: Promise<unknown> | undefined;
async function mailTick(): Promise<void> {
  if (mailRunning || shutdown.signal.aborted) return;
  const pass = retryQueuedMail({ signal: shutdown.signal })
    .then((r) => {
      if (r.sent + r.failed + r.gaveUp + r.stale > 0) log(`mail retry: sent ${r.sent}, failed again ${r.failed}, given up ${r.gaveUp}, cut-off tries taken up again ${r.stale}`);
    })
    .catch((e: unknown) => log(`mail retry failed: ${e instanceof Error ? (e.stack ?? e.message) : String(e)}`))
    .finally(() => {
      mailRunning = undefined;
    });
  mailRunning = pass;
  await pass;
}

getDb(); // refuses an unmigrated database before anything is scheduled
const task = cron.schedule("5 * * * *", tick, { name: "care-reminders", noOverlap: true });
const visitTask = cron.schedule("*/15 * * * *", visitTick, { name: "visit-reminders", noOverlap: true });
const mailTask = cron.schedule("* * * * *", mailTick, { name: "mail-retry", noOverlap: true });
// Care plans: included visits become jobs ahead of their due date, hourly at minute 25.
const planTask = cron.schedule("25 * * * *", () => planVisitsJob(new Date()).then((lines) => lines.forEach(log), (e: unknown) => log(`plan visit pass failed: ${e instanceof Error ? e.message : String(e)}`)), { name: "plan-visits", noOverlap: true });
// Bulk hand-over mailings left half-sent (the server stopped): finished every 5 minutes, each piece once.
cron.schedule("*/5 * * * *", () => handoverMailingsJob(new Date(), shutdown.signal).then((r) => describeHandoverMailings(r).forEach(log), (e: unknown) => log(`hand-over mailing pass failed: ${e instanceof Error ? e.message : String(e)}`)), { name: "handover-mailings", noOverlap: true });
void visitTick();
log("scheduler: care reminders hourly at minute 5; running one pass now");
void tick();

let stopping = false;
async function stop(signal: string): Promise<void> {
  if (stopping) return;
  stopping = true;
  log(`scheduler: ${signal}, stopping${running || visitRunning || mailRunning ? " (the running pass stops after the message in hand)" : ""}`);
  shutdown.abort();
  await task.stop();
  await task.destroy();
  await visitTask.stop();
  await visitTask.destroy();
  await mailTask.stop();
  await mailTask.destroy();
  await planTask.stop();
  await planTask.destroy();
  await running;
  await visitRunning;
  await mailRunning;
  closeMailTransport();
  getDb().$client.close();
  log("scheduler: stopped");
  process.exit(0);
}
process.on("SIGTERM", () => void stop("SIGTERM"));
process.on("SIGINT", () => void stop("SIGINT"));
