import { RateLimiterMemory, RateLimiterRes } from "rate-limiter-flexible";
import { env } from "@/lib/env";
import { tooManyRequests } from "@/lib/errors";

// In-memory limiters: the app is one Node.js process next to one SQLite file.
const limiters = {
  signInAccount: new RateLimiterMemory({ keyPrefix: "signin-acct", points: 5, duration: env.RATE_LIMIT_WINDOW_SEC }),
  signInIp: new RateLimiterMemory({ keyPrefix: "signin-ip", points: 100, duration: env.RATE_LIMIT_WINDOW_SEC }),
  resetAccount: new RateLimiterMemory({ keyPrefix: "reset-acct", points: 3, duration: env.RATE_LIMIT_WINDOW_SEC }),
  resetIp: new RateLimiterMemory({ keyPrefix: "reset-ip", points: 10, duration: env.RATE_LIMIT_WINDOW_SEC }),
  signUpIp: new RateLimiterMemory({ keyPrefix: "signup-ip", points: 30, duration: env.RATE_LIMIT_WINDOW_SEC }),
  codeAccount: new RateLimiterMemory({ keyPrefix: "code-acct", points: 10, duration: env.RATE_LIMIT_WINDOW_SEC }),
  codeIp: new RateLimiterMemory({ keyPrefix: "code-ip", points: 20, duration: env.RATE_LIMIT_WINDOW_SEC }),
} as const;

export type LimiterName = keyof typeof limiters;

export const rateLimits = Object.fromEntries(
  Object.entries(limiters).map(([k, l]) => [k, { points: l.points, durationSec: l.duration }]),
) as Record<LimiterName, { points: number; durationSec: number }>;

/** Takes one attempt from each named bucket; throws a 429 AppError when any is empty. */
export async function consumeAttempt(buckets: [LimiterName, string][]): Promise<void> {
  for (const [name, key] of buckets) {
    try {
      await limiters[name].consume(key);
    } catch (e) {
      if (e instanceof RateLimiterRes) throw tooManyRequests(e.msBeforeNext / 1000);
      throw e;
    }
  }
}

export async function resetAttempts(name: LimiterName, key: string): Promise<void> {
  await limiters[name].delete(key);
}
