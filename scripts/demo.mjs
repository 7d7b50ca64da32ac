// `npm run demo`: a fresh demo database with the invented studio, a production build, then the app,
// the local SMTP sink, the scheduler (care reminders, hourly) and the other local services, until Ctrl-C.
import { removeDatabase, runStep, supervise } from "./services.mjs";
import { startCommand } from "./start-command.mjs";

const port = process.env.PORT ?? "3000";
const env = {
  ...process.env,
  NODE_ENV: "production",
  NEXT_TELEMETRY_DISABLED: "1",
  PORT: port,
  DATABASE_URL: process.env.DATABASE_URL ?? "./data/demo.db",
  APP_URL: process.env.APP_URL ?? `http://localhost:${port}`,
  SMTP_PORT: process.env.SMTP_PORT ?? "2525",
  MAIL_SINK_HTTP_PORT: process.env.MAIL_SINK_HTTP_PORT ?? "2526",
  MAIL_SINK_URL: process.env.MAIL_SINK_URL ?? `http://127.0.0.1:${process.env.MAIL_SINK_HTTP_PORT ?? "2526"}`,
  OUTBOX_ENABLED: "true",
  STRIPE_API_HOST: "127.0.0.1",
  STRIPE_API_PORT: process.env.STRIPE_API_PORT ?? "12111",
};
// The Stripe fake starts knowing the seed's invented payments, so they can be refunded (lib/fakes/seeded-charges.ts).
env.STRIPE_FAKE_SEEDED_FROM = env.DATABASE_URL;

removeDatabase(env.DATABASE_URL);
runStep("Migrating a fresh demo database", "tsx", ["db/migrate.ts"], env);
runStep("Seeding the invented demo studio", "tsx", ["db/seed/index.ts"], env);
if (!process.env.SKIP_BUILD) runStep("Building the app", "next", ["build"], env);

const start = startCommand();
console.log(`\n▸ Starting Grainward on ${env.APP_URL} (outbox at ${env.APP_URL}/studio/outbox). Ctrl-C stops everything.\n`);
supervise(
  [
    { name: "mail", cmd: "tsx", args: ["lib/fakes/smtp-sink-cli.ts"] },
    { name: "payments", cmd: "tsx", args: ["lib/fakes/stripe-fake-cli.ts"] },
    { name: "inbound", cmd: "tsx", args: ["lib/mail/inbound-cli.ts"] },
    { name: "app", cmd: start.command, args: [...start.args, "-p", port] },
    // The scheduler runs in Node itself with tsx as a loader, not under the tsx CLI: the CLI relays SIGTERM
    // and kills its child if a busy pass has not answered within 30 ms, which cut passes off mid-message.
    { name: "jobs", cmd: "node", args: ["--import", "tsx", "jobs/index.ts"] },
  ],
  env,
);
