// Vitest global setup: one fresh, migrated SQLite file per run and the real SMTP sink on free ports.
// Workers start after this and inherit the environment set here.
import fs from "node:fs";
import net from "node:net";
import path from "node:path";
import { openDatabase } from "@/db/client";
import { applyMigrations } from "@/db/migrate";
import { startSmtpSink, type SmtpSink } from "@/lib/fakes/smtp-sink";

let sink: SmtpSink | undefined;
let dir: string | undefined;

export async function setup() {
  dir = path.resolve("tests/.tmp", `vitest-${process.pid}-${Date.now()}`);
  fs.mkdirSync(dir, { recursive: true });
  const databaseUrl = path.join(dir, "test.db");
  const db = openDatabase(databaseUrl);
  applyMigrations(db);
  db.$client.close();

  sink = await startSmtpSink();
  // A free port for the Stripe fake that payment tests start (they receive its webhooks themselves).
  const stripePort = await new Promise<number>((resolve) => {
    const probe = net.createServer().listen(0, "127.0.0.1", () => {
      const { port } = probe.address() as net.AddressInfo;
      probe.close(() => resolve(port));
    });
  });
  Object.assign(process.env, {
    NODE_ENV: "test",
    DATABASE_URL: databaseUrl,
    DATA_DIR: dir,
    APP_URL: "http://localhost:3999",
    SMTP_HOST: "127.0.0.1",
    SMTP_PORT: String(sink.smtpPort),
    MAIL_SINK_URL: sink.url,
    RATE_LIMIT_WINDOW_SEC: "2",
    STRIPE_API_HOST: "127.0.0.1",
    STRIPE_API_PORT: String(stripePort),
    STRIPE_API_PROTOCOL: "http",
    STRIPE_SECRET_KEY: "sk_test_grainward_tests",
    STRIPE_WEBHOOK_SECRET: "whsec_grainward_tests",
  });
}

export async function teardown() {
  await sink?.close();
  if (dir) fs.rmSync(dir, { recursive: true, force: true });
}
