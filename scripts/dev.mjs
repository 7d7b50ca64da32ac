// `npm run dev`: the development server with the local SMTP sink beside it. Migrates the database
// named by DATABASE_URL first (seed it once with `npm run db:seed`).
import { runStep, supervise } from "./services.mjs";

const port = process.env.PORT ?? "3000";
const env = { ...process.env, NEXT_TELEMETRY_DISABLED: "1", PORT: port };
runStep("Applying migrations", "tsx", ["db/migrate.ts"], env);
supervise(
  [
    { name: "mail", cmd: "tsx", args: ["lib/fakes/smtp-sink-cli.ts"] },
    { name: "payments", cmd: "tsx", args: ["lib/fakes/stripe-fake-cli.ts"] },
    { name: "inbound", cmd: "tsx", args: ["lib/mail/inbound-cli.ts"] },
    { name: "app", cmd: "next", args: ["dev", "-p", port] },
  ],
  env,
);
