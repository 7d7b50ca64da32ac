// The inbound mail listener as a process (`npm run demo`, `npm run dev`, the e2e server): owners'
// e-mailed replies on INBOUND_SMTP_HOST:INBOUND_SMTP_PORT (default 127.0.0.1:2527).
import { env } from "@/lib/env";
import { startInboundListener } from "./inbound";

try {
  const listener = await startInboundListener({ host: env.INBOUND_SMTP_HOST, port: env.INBOUND_SMTP_PORT });
  console.log(`inbound: SMTP on ${listener.host}:${listener.port}, replies to reply+…@${env.INBOUND_MAIL_DOMAIN}`);
  let stopping = false;
  const stop = () => {
    if (stopping) return;
    stopping = true;
    listener.close().then(
      () => process.exit(0),
      () => process.exit(1),
    );
  };
  process.on("SIGINT", stop);
  process.on("SIGTERM", stop);
} catch (err) {
  const code = (err as NodeJS.ErrnoException).code;
  console.error(code === "EADDRINUSE" ? `inbound: port already in use (INBOUND_SMTP_PORT=${env.INBOUND_SMTP_PORT})` : `inbound: could not start: ${String(err)}`);
  process.exit(1);
}
