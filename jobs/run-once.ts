// `npm run jobs:run-once -- --now <ISO instant>`: one reminder pass as if it were that instant, then exit.
// Prints one line per message sent (or failed) and a summary with the skipped count.
import { closeMailTransport } from "@/lib/mail";
import { describePass, remindersJob } from "./reminders";

function parseNow(argv: string[]): Date {
  const i = argv.indexOf("--now");
  const raw = i >= 0 ? argv[i + 1] : argv.find((a) => a.startsWith("--now="))?.slice(6);
  if (raw === undefined) return new Date();
  const d = new Date(raw);
  if (!raw || Number.isNaN(d.getTime())) {
    console.error(`run-once: --now must be an ISO instant like 2026-09-01T17:00:00Z, got ${JSON.stringify(raw)}`);
    process.exit(2);
  }
  return d;
}

const now = parseNow(process.argv.slice(2));
try {
  const report = await remindersJob(now);
  for (const line of describePass(report)) console.log(line);
  process.exitCode = report.failed.length > 0 ? 1 : 0;
} catch (e) {
  console.error(e instanceof Error ? e.message : e);
  process.exitCode = 2;
} finally {
  closeMailTransport();
}
