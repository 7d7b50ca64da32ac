// Who may decode an image, and when. Decoding is the expensive step of an upload (up to a second of
// CPU for a large photo), so at most MAX_RUNNING run at once across the server, at most one per
// account, and waiting uploads are started account by account in turn: one account sending many
// photos waits behind itself, never in front of someone else. An account with PER_ACCOUNT uploads
// already running or waiting, or a server with MAX_WAITING waiting, is told to retry shortly (429).
import { tooManyRequests } from "@/lib/errors";

export const IMAGE_QUEUE = {
  /** Decoders at once, across the server (each may hold a large image's rows in memory). */
  MAX_RUNNING: 2,
  /** Uploads of one account running or waiting; one more is a 429. */
  PER_ACCOUNT: 3,
  /** Uploads waiting across the server; one more is a 429. */
  MAX_WAITING: 24,
  /** What the 429 asks for: about the time the account's own queue takes to drain. */
  RETRY_AFTER_SEC: 5,
} as const;

let runningTotal = 0;
let waitingTotal = 0;
const runningBy = new Map<string, number>();
/** Waiting uploads per account, in the order the accounts will be served (an account moves to the back when one of its uploads starts). */
const waitingBy = new Map<string, (() => void)[]>();

const busy = (whose: "yours" | "everyone's") =>
  tooManyRequests(
    IMAGE_QUEUE.RETRY_AFTER_SEC,
    `${whose === "yours" ? "We're still processing your earlier photos" : "We're processing a lot of photos right now"}. Wait about ${IMAGE_QUEUE.RETRY_AFTER_SEC} seconds, then send this one again.`,
  );

function canStart(account: string): boolean {
  return runningTotal < IMAGE_QUEUE.MAX_RUNNING && (runningBy.get(account) ?? 0) < 1;
}

function start(account: string): void {
  runningTotal++;
  runningBy.set(account, (runningBy.get(account) ?? 0) + 1);
}

function finish(account: string): void {
  runningTotal--;
  const n = (runningBy.get(account) ?? 1) - 1;
  if (n === 0) runningBy.delete(account);
  else runningBy.set(account, n);
}

/** Starts waiting uploads, one account at a time in turn, while there is room. */
function dispatch(): void {
  for (const [account, queue] of waitingBy) {
    if (runningTotal >= IMAGE_QUEUE.MAX_RUNNING) return;
    if (!canStart(account)) continue;
    const next = queue.shift()!;
    waitingTotal--;
    waitingBy.delete(account);
    if (queue.length > 0) waitingBy.set(account, queue); // to the back of the line
    start(account);
    next();
  }
}

/** Runs `decode` for `account` when its turn comes; a 429 (with Retry-After) when the account or the server has too many waiting. */
export async function withImageSlot<T>(account: string, decode: () => Promise<T>): Promise<T> {
  const mine = (runningBy.get(account) ?? 0) + (waitingBy.get(account)?.length ?? 0);
  if (mine >= IMAGE_QUEUE.PER_ACCOUNT) throw busy("yours");
  if (canStart(account) && waitingTotal === 0) {
    start(account);
  } else {
    if (waitingTotal >= IMAGE_QUEUE.MAX_WAITING) throw busy("everyone's");
    waitingTotal++;
    await new Promise<void>((resolve) => {
      const queue = waitingBy.get(account);
      if (queue) queue.push(resolve);
      else waitingBy.set(account, [resolve]);
      dispatch();
    });
  }
  try {
    return await decode();
  } finally {
    finish(account);
    dispatch();
  }
}
