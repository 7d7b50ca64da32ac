import { after } from "next/server";

// Work whose cost would tell a caller something (whether an address has an account) runs after the
// answer has gone: Next.js's after() inside a request, the next turn of the event loop outside one
// (scripts, tests). Failures are logged; sendMail already keeps what SMTP refuses for a retry.

const running = new Set<Promise<void>>();

export function afterAnswer(task: () => Promise<void>): void {
  const run = () => {
    const p = task()
      .catch((e: unknown) => console.error("Background account work failed:", e))
      .finally(() => running.delete(p));
    running.add(p);
    return p;
  };
  try {
    after(run);
  } catch {
    setImmediate(run);
  }
}

/** Resolves when every task started so far (and any they start) has finished. For tests and scripts. */
export async function settleAfterAnswer(): Promise<void> {
  await new Promise<void>((r) => setImmediate(r));
  while (running.size) {
    await Promise.all([...running]);
    await new Promise<void>((r) => setImmediate(r));
  }
}
