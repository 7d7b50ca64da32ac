// Starts the production build (`next start`) on its own port and database, for the stress tests and
// benchmarks. The build must exist (npm run build).
import { spawn, type ChildProcess } from "node:child_process";
import path from "node:path";

export type RunningServer = { url: string; child: ChildProcess; stop(signal?: NodeJS.Signals): Promise<void> };

export async function startServer({ port, env }: { port: number; env: Record<string, string> }): Promise<RunningServer> {
  const child = spawn(path.resolve("node_modules/.bin/next"), ["start", "-p", String(port)], {
    env: { ...process.env, NODE_ENV: "production", NEXT_TELEMETRY_DISABLED: "1", ...env },
    stdio: ["ignore", "pipe", "pipe"],
  });
  let log = "";
  child.stdout!.on("data", (c) => (log += c));
  child.stderr!.on("data", (c) => (log += c));
  const url = `http://127.0.0.1:${port}`;
  const deadline = Date.now() + 60_000;
  for (;;) {
    if (child.exitCode !== null) throw new Error(`server exited early:\n${log}`);
    try {
      const res = await fetch(`${url}/api/health`);
      if (res.ok) break;
    } catch {
      // not up yet
    }
    if (Date.now() > deadline) throw new Error(`server did not start:\n${log}`);
    await new Promise((r) => setTimeout(r, 200));
  }
  return {
    url,
    child,
    stop: (signal = "SIGTERM") =>
      new Promise<void>((resolve) => {
        if (child.exitCode !== null || child.signalCode !== null) return resolve();
        child.once("exit", () => resolve());
        child.kill(signal);
      }),
  };
}
