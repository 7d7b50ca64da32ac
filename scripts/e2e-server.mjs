// The server Playwright tests run against: a production build over a fresh, seeded database, with
// the SMTP sink. Ports differ from the demo's, so both can run at once (scripts/e2e-config.mjs: fixed by
// default, E2E_PORT_BASE moves them).
import { E2E_APP_URL, E2E_DATA_DIR, E2E_DATABASE, E2E_EMPTY_DATABASE, E2E_PORTS, E2E_SINK_URL } from "./e2e-config.mjs";
import { removeDatabase, runStep, supervise } from "./services.mjs";
import { startCommand } from "./start-command.mjs";

// E2E_EMPTY_DATABASE=1: no seed, and STUDIO_SIGNUP closed, so only the first-studio rule lets a stranger
// start one (tests/e2e/studio-setup.spec.ts: E2E_EMPTY_DATABASE=1 npx playwright test tests/e2e/studio-setup.spec.ts).
const emptyDatabase = E2E_EMPTY_DATABASE;

const env = {
  ...process.env,
  NODE_ENV: "production",
  NEXT_TELEMETRY_DISABLED: "1",
  DATABASE_URL: E2E_DATABASE,
  DATA_DIR: E2E_DATA_DIR,
  APP_URL: E2E_APP_URL,
  SMTP_PORT: String(E2E_PORTS.smtp),
  MAIL_SINK_HTTP_PORT: String(E2E_PORTS.sink),
  MAIL_SINK_URL: E2E_SINK_URL,
  OUTBOX_ENABLED: "true",
  // Short rate-limit windows, so specs that trip a limit don't starve the ones after them.
  RATE_LIMIT_WINDOW_SEC: "20",
  // Playwright stands in for one proxy: specs name the client's address in X-Forwarded-For (its
  // rightmost entry) so that each gets rate-limit buckets of its own.
  TRUST_PROXY: "1",
  STRIPE_API_HOST: "127.0.0.1",
  STRIPE_API_PORT: String(E2E_PORTS.stripe),
  INBOUND_SMTP_PORT: String(E2E_PORTS.inbound),
  STUDIO_SIGNUP: emptyDatabase ? "closed" : "open",
};

removeDatabase(env.DATABASE_URL);
runStep("Migrating the e2e database", "tsx", ["db/migrate.ts"], env);
if (!emptyDatabase) runStep("Seeding the e2e database", "tsx", ["tests/support/seed-e2e.ts"], env);
const start = startCommand();
supervise(
  [
    { name: "mail", cmd: "tsx", args: ["lib/fakes/smtp-sink-cli.ts"] },
    { name: "payments", cmd: "tsx", args: ["lib/fakes/stripe-fake-cli.ts"] },
    { name: "inbound", cmd: "tsx", args: ["lib/mail/inbound-cli.ts"] },
    { name: "app", cmd: start.command, args: [...start.args, "-p", String(E2E_PORTS.app)] },
  ],
  env,
);
