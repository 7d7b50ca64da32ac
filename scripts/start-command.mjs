// How the production server is started, in one place: the command of package.json's `start` script, so that
// `npm start`, `npm run demo` (scripts/demo.mjs), the e2e server (scripts/e2e-server.mjs) and the server
// benchmarks (tests/bench/server-harness.ts) all run Next.js with the same Node.js flags (DEVELOPERS.md,
// "The server's heap limit").
import fs from "node:fs";
import path from "node:path";
import { bin, root } from "./services.mjs";

/**
 * The program and arguments of the `start` script, ready for spawn(): `node <flags> node_modules/next/dist/bin/next start`
 * runs under this Node.js, `next start` through the package's binary. Callers add their own `-p` / `-H`.
 */
export function startCommand() {
  const script = JSON.parse(fs.readFileSync(path.join(root, "package.json"), "utf8")).scripts?.start ?? "";
  const [first, ...args] = script.trim().split(/\s+/);
  if (first !== "node" && first !== "next") {
    throw new Error(`package.json's start script (${script}) should begin with \`next\` or \`node\`: the demo, the e2e server and the benchmarks start the server with it`);
  }
  return { command: bin(first), args };
}
