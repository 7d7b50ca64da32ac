// `npm run sink`: runs the local SMTP sink on fixed ports for development and the demo.
// Reads process.env directly (not lib/env): the sink stands in for an outside service.
import { startSmtpSink } from "./smtp-sink";

function portFrom(name: string, fallback: number): number {
  const raw = process.env[name];
  if (raw === undefined || raw === "") return fallback;
  const n = Number(raw);
  if (!Number.isInteger(n) || n < 0 || n > 65535) {
    console.error(`smtp-sink: ${name} must be a port number (0-65535), got "${raw}"`);
    process.exit(1);
  }
  return n;
}

const smtpPort = portFrom("SMTP_PORT", 2525);
const httpPort = portFrom("MAIL_SINK_HTTP_PORT", 2526);

try {
  const sink = await startSmtpSink({ smtpPort, httpPort });
  console.log(`smtp-sink: SMTP on 127.0.0.1:${sink.smtpPort}, read API on ${sink.url} (development only)`);
  let stopping = false;
  const stop = () => {
    if (stopping) return;
    stopping = true;
    sink.close().then(
      () => process.exit(0),
      () => process.exit(1),
    );
  };
  process.on("SIGINT", stop);
  process.on("SIGTERM", stop);
} catch (err) {
  const code = (err as NodeJS.ErrnoException).code;
  console.error(
    code === "EADDRINUSE"
      ? `smtp-sink: port already in use (SMTP_PORT=${smtpPort}, MAIL_SINK_HTTP_PORT=${httpPort})`
      : `smtp-sink: could not start: ${String(err)}`,
  );
  process.exit(1);
}
