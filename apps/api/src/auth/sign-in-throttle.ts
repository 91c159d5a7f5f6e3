import type { Redis } from 'ioredis';
import { RateLimiterMemory, RateLimiterRedis, RateLimiterRes } from 'rate-limiter-flexible';

export type SignInThrottleSettings = {
  /** Failed sign-ins allowed per account (e-mail address) within the window before a lockout. */
  failuresPerAccount: number;
  /** Failed sign-ins allowed per client address within the window (one address may serve many people). */
  failuresPerAddress: number;
  windowSeconds: number;
  /** The first lockout; each further lockout within a day doubles it, up to the maximum. */
  lockoutSeconds: number;
  lockoutMaxSeconds: number;
};

export type SignInKeys = { account: string; address: string };

/**
 * Failed sign-ins counted per account and per client address in Redis, so the limit holds across API
 * instances. Reaching the limit locks the key out with exponential backoff.
 */
export function createSignInThrottle(redis: Redis, keyPrefix: string, settings: SignInThrottleSettings) {
  // While Redis is away, each instance counts in its own memory instead of waiting for it.
  const limiter = (name: string, points: number, duration: number) =>
    new RateLimiterRedis({
      storeClient: redis,
      keyPrefix: `${keyPrefix}:signin:${name}`,
      points,
      duration,
      rejectIfRedisNotReady: true,
      insuranceLimiter: new RateLimiterMemory({ keyPrefix: `signin:${name}`, points, duration }),
    });
  const failures = {
    account: limiter('account', settings.failuresPerAccount, settings.windowSeconds),
    address: limiter('address', settings.failuresPerAddress, settings.windowSeconds),
  };
  // How many lockouts a key has had in the last day: the exponent of the backoff.
  const lockouts = {
    account: limiter('account-lockouts', 1_000_000, 24 * 3600),
    address: limiter('address-lockouts', 1_000_000, 24 * 3600),
  };
  const kinds = ['account', 'address'] as const;

  /** Seconds until sign-in may be tried again for these keys; 0 when it may be tried now. */
  async function lockedFor(keys: SignInKeys): Promise<number> {
    let waitMs = 0;
    for (const kind of kinds) {
      const res = await failures[kind].get(keys[kind]);
      if (res && res.consumedPoints >= failures[kind].points) waitMs = Math.max(waitMs, res.msBeforeNext);
    }
    return Math.ceil(waitMs / 1000);
  }

  async function recordFailure(keys: SignInKeys): Promise<void> {
    for (const kind of kinds) {
      const res = await failures[kind].consume(keys[kind]).catch((rejected: unknown) => {
        if (rejected instanceof RateLimiterRes) return rejected;
        throw rejected;
      });
      if (res.consumedPoints < failures[kind].points) continue;
      const count = (await lockouts[kind].consume(keys[kind])).consumedPoints;
      const seconds = Math.min(settings.lockoutSeconds * 2 ** (count - 1), settings.lockoutMaxSeconds);
      await failures[kind].block(keys[kind], seconds);
    }
  }

  /** A successful sign-in clears the account's failures (the address keeps its count). */
  async function recordSuccess(keys: SignInKeys): Promise<void> {
    await failures.account.delete(keys.account);
  }

  return { lockedFor, recordFailure, recordSuccess };
}
export type SignInThrottle = ReturnType<typeof createSignInThrottle>;
