// Starting and stopping the product's processes for `npm run demo`, `npm run dev` and the e2e tests.
import { spawn, spawnSync } from "node:child_process";
import fs from "node:fs";
import path from "node:path";

export const root = path.resolve(import.meta.dirname, "..");
/** A local package binary, or Node itself for "node"; a path (scripts/start-command.mjs gives one) as it is. */
export const bin = (name) => (name === "node" ? process.execPath : path.isAbsolute(name) ? name : path.join(root, "node_modules", ".bin", name));

/** Runs a command to completion with the given environment; exits the script if it fails. */
export function runStep(label, cmd, args, env) {
  console.log(`\n▸ ${label}`);
  const r = spawnSync(bin(cmd), args, { cwd: root, env, stdio: "inherit" });
  if (r.status !== 0) {
    console.error(`✗ ${label} failed (exit ${r.status ?? r.signal})`);
    process.exit(r.status ?? 1);
  }
}

/** Removes a SQLite file and its WAL companions. */
export function removeDatabase(file) {
  for (const f of [file, `${file}-wal`, `${file}-shm`]) fs.rmSync(path.resolve(root, f), { force: true });
}

/**
 * Starts long-running processes in this script's process group (so whoever stops the group stops
 * them all), prefixing their output; stops all of them when one exits or on Ctrl-C / SIGTERM.
 */
export function supervise(services, env) {
  const children = services.map(({ name, cmd, args }) => {
    const child = spawn(bin(cmd), args, { cwd: root, env, stdio: ["ignore", "pipe", "pipe"] });
    const prefix = (chunk) =>
      chunk
        .toString()
        .split("\n")
        .filter(Boolean)
        .map((l) => `[${name}] ${l}`)
        .join("\n") + "\n";
    child.stdout.on("data", (c) => process.stdout.write(prefix(c)));
    child.stderr.on("data", (c) => process.stderr.write(prefix(c)));
    return { name, child };
  });
  let stopping = false;
  const stop = (code) => {
    if (stopping) return;
    stopping = true;
    for (const { child } of children) {
      try {
        child.kill("SIGTERM");
      } catch {
        // already gone
      }
    }
    setTimeout(() => process.exit(code), 1500).unref();
  };
  for (const { name, child } of children) {
    child.on("exit", (code, signal) => {
      if (!stopping) console.error(`[${name}] exited (${code ?? signal}); stopping everything.`);
      stop(code ?? 1);
    });
  }
  process.on("SIGINT", () => stop(0));
  process.on("SIGTERM", () => stop(0));
  return stop;
}
