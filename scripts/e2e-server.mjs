// The server Playwright tests run against: a production build over a fresh, seeded database, with
// the SMTP sink. Ports are fixed and differ from the demo's, so both can run at once.
import { removeDatabase, runStep, supervise } from "./services.mjs";

// E2E_EMPTY_DATABASE=1: no seed, and STUDIO_SIGNUP closed, so only the first-studio rule lets a stranger
// start one (tests/e2e/studio-setup.spec.ts: E2E_EMPTY_DATABASE=1 npx playwright test tests/e2e/studio-setup.spec.ts).
const emptyDatabase = process.env.E2E_EMPTY_DATABASE === "1";

export const E2E = { appPort: "3100", smtpPort: "2625", sinkPort: "2626", stripePort: "12112", inboundPort: "2627" };

const env = {
  ...process.env,
  NODE_ENV: "production",
  NEXT_TELEMETRY_DISABLED: "1",
  DATABASE_URL: "tests/.tmp/e2e.db",
  DATA_DIR: "tests/.tmp/e2e-data",
  APP_URL: `http://localhost:${E2E.appPort}`,
  SMTP_PORT: E2E.smtpPort,
  MAIL_SINK_HTTP_PORT: E2E.sinkPort,
  MAIL_SINK_URL: `http://127.0.0.1:${E2E.sinkPort}`,
  OUTBOX_ENABLED: "true",
  // Short rate-limit windows, so specs that trip a limit don't starve the ones after them.
  RATE_LIMIT_WINDOW_SEC: "20",
  // Playwright stands in for one proxy: specs name the client's address in X-Forwarded-For (its
  // rightmost entry) so that each gets rate-limit buckets of its own.
  TRUST_PROXY: "1",
  STRIPE_API_HOST: "127.0.0.1",
  STRIPE_API_PORT: E2E.stripePort,
  INBOUND_SMTP_PORT: E2E.inboundPort,
  STUDIO_SIGNUP: emptyDatabase ? "closed" : "open",
};

removeDatabase(env.DATABASE_URL);
runStep("Migrating the e2e database", "tsx", ["db/migrate.ts"], env);
if (!emptyDatabase) runStep("Seeding the e2e database", "tsx", ["tests/support/seed-e2e.ts"], env);
supervise(
  [
    { name: "mail", cmd: "tsx", args: ["lib/fakes/smtp-sink-cli.ts"] },
    { name: "payments", cmd: "tsx", args: ["lib/fakes/stripe-fake-cli.ts"] },
    { name: "inbound", cmd: "tsx", args: ["lib/mail/inbound-cli.ts"] },
    { name: "app", cmd: "next", args: ["start", "-p", E2E.appPort] },
  ],
  env,
);
