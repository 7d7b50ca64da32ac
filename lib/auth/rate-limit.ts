import { RateLimiterMemory, RateLimiterRes } from "rate-limiter-flexible";
import { env } from "@/lib/env";
import { tooManyRequests } from "@/lib/errors";

// In-memory limiters: the app is one Node.js process next to one SQLite file.
const window = env.RATE_LIMIT_WINDOW_SEC;
const limiters = {
  signInIp: new RateLimiterMemory({ keyPrefix: "signin-ip", points: 100, duration: window }),
  changePassword: new RateLimiterMemory({ keyPrefix: "change-pw", points: 5, duration: window }),
  resetAccount: new RateLimiterMemory({ keyPrefix: "reset-acct", points: 3, duration: window }),
  resetIp: new RateLimiterMemory({ keyPrefix: "reset-ip", points: 10, duration: window }),
  signUpIp: new RateLimiterMemory({ keyPrefix: "signup-ip", points: 30, duration: window }),
  /** "Someone tried to sign up with your address" mails, per address: one a window is enough. */
  signUpNotice: new RateLimiterMemory({ keyPrefix: "signup-notice", points: 1, duration: window }),
  codeAccount: new RateLimiterMemory({ keyPrefix: "code-acct", points: 10, duration: window }),
  codeIp: new RateLimiterMemory({ keyPrefix: "code-ip", points: 20, duration: window }),
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

/** Takes one attempt when there is one left; false (and nothing thrown) when the bucket is empty. */
export async function tryAttempt(name: LimiterName, key: string): Promise<boolean> {
  try {
    await limiters[name].consume(key);
    return true;
  } catch (e) {
    if (e instanceof RateLimiterRes) return false;
    throw e;
  }
}

export async function resetAttempts(name: LimiterName, key: string): Promise<void> {
  await limiters[name].delete(key);
}

// ---- sign-in ----
// Wrong passwords must stay slow to guess without letting anyone lock an account by guessing badly
// on purpose. Only failures count, and they count in two places:
// - per account and address: after SIGN_IN_LIMITS.pairFailures wrong passwords, that address waits
//   out the window for that account (and only that account);
// - per account, from every address: past SIGN_IN_LIMITS.accountFailuresFree, each further failure
//   makes every address that has already failed on the account wait twice as long as the last
//   (1 s, 2 s, 4 s … up to the window) before its next try.
// An address with no failure on the account is never held back for it, so the owner's own device
// signs in with the right password while someone elsewhere is guessing.
export const SIGN_IN_LIMITS = { pairFailures: 5, accountFailuresFree: 10, windowSec: window } as const;

const signInPair = new RateLimiterMemory({ keyPrefix: "signin-pair", points: SIGN_IN_LIMITS.pairFailures, duration: window });
const signInAccount = new RateLimiterMemory({ keyPrefix: "signin-acct", points: SIGN_IN_LIMITS.accountFailuresFree, duration: window });
/** Blocked (by block()) while the account's addresses that have failed must wait. */
const signInAccountWait = new RateLimiterMemory({ keyPrefix: "signin-wait", points: 1, duration: window });

const pairKey = (account: string, ip: string) => JSON.stringify([account, ip]);
const blocked = (res: RateLimiterRes | null, points: number) => res !== null && res.consumedPoints > points && res.msBeforeNext > 0;

/** Before a password is checked: throws a 429 when this address must wait for this account. */
export async function checkSignInAllowed(account: string, ip: string): Promise<void> {
  await consumeAttempt([["signInIp", ip]]);
  const pair = await signInPair.get(pairKey(account, ip));
  if (!pair || pair.consumedPoints === 0) return;
  if (pair.consumedPoints >= SIGN_IN_LIMITS.pairFailures) throw tooManyRequests(pair.msBeforeNext / 1000);
  const wait = await signInAccountWait.get(account);
  if (blocked(wait, 1)) throw tooManyRequests(wait!.msBeforeNext / 1000);
}

export async function recordSignInFailure(account: string, ip: string): Promise<void> {
  await signInPair.penalty(pairKey(account, ip));
  const { consumedPoints } = await signInAccount.penalty(account);
  const over = consumedPoints - SIGN_IN_LIMITS.accountFailuresFree;
  if (over > 0) await signInAccountWait.block(account, Math.min(2 ** (over - 1), window));
}

/** A right password clears this address's failures on the account (the account's own count stays). */
export async function recordSignInSuccess(account: string, ip: string): Promise<void> {
  await signInPair.delete(pairKey(account, ip));
}
