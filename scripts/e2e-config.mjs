// Where the end-to-end server listens and keeps its data, in one place, read by
// scripts/e2e-server.mjs, playwright.config.ts and tests/e2e/helpers.ts.
// - Ports: the fixed ones below by default; E2E_PORT_BASE=N moves them all to N..N+4 (app N, SMTP N+1,
//   mail sink HTTP N+2, inbound SMTP N+3, Stripe fake N+4), so a second run can go beside another
//   (scripts/test.mjs runs the empty-install run beside the seeded one that way).
// - Database: E2E_EMPTY_DATABASE=1 (no seed, sign-up closed) uses a file of its own, so both runs can
//   go at once.
const base = process.env.E2E_PORT_BASE ? Number(process.env.E2E_PORT_BASE) : null;
if (base !== null && !(Number.isInteger(base) && base >= 1024 && base <= 65530)) {
  throw new Error(`E2E_PORT_BASE must be a port number from 1024 to 65530 (got "${process.env.E2E_PORT_BASE}")`);
}

export const E2E_PORTS =
  base === null
    ? { app: 3100, smtp: 2625, sink: 2626, inbound: 2627, stripe: 12112 }
    : { app: base, smtp: base + 1, sink: base + 2, inbound: base + 3, stripe: base + 4 };
export const E2E_APP_URL = `http://localhost:${E2E_PORTS.app}`;
export const E2E_SINK_URL = `http://127.0.0.1:${E2E_PORTS.sink}`;

export const E2E_EMPTY_DATABASE = process.env.E2E_EMPTY_DATABASE === "1";
export const E2E_DATABASE = E2E_EMPTY_DATABASE ? "tests/.tmp/e2e-empty.db" : "tests/.tmp/e2e.db";
export const E2E_DATA_DIR = E2E_EMPTY_DATABASE ? "tests/.tmp/e2e-empty-data" : "tests/.tmp/e2e-data";
