// Types for scripts/start-command.mjs (imported by tests/bench/server-harness.ts).
export declare function startCommand(): { command: string; args: string[] };
