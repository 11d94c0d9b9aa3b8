/**
 * Sign-in brute-force limiter, in memory (one process owns the data; see docs/decisions/003-*).
 *
 * Failures are counted per account (normalised e-mail, known or not) and per client IP. When a key
 * reaches its limit it is locked: `baseLockMs` after the limit is reached, doubling with each further
 * failure up to `maxLockMs`. A key with no failure for `windowMs` is forgotten. A successful sign-in
 * clears the account's count (not the IP's: one good password must not reset an IP's guesses).
 */
export interface LimiterOptions {
  accountMaxFailures: number;
  ipMaxFailures: number;
  windowMs: number;
  baseLockMs: number;
  maxLockMs: number;
  now: () => number;
}

export const DEFAULT_LIMITER_OPTIONS: LimiterOptions = {
  accountMaxFailures: 5,
  ipMaxFailures: 20,
  windowMs: 15 * 60_000,
  baseLockMs: 30_000,
  maxLockMs: 15 * 60_000,
  now: () => Date.now(),
};

interface Entry {
  failures: number;
  lastFailureAt: number;
  lockedUntil: number;
}

export type SignInLimiter = ReturnType<typeof createSignInLimiter>;

export function createSignInLimiter(options: Partial<LimiterOptions> = {}) {
  const o = { ...DEFAULT_LIMITER_OPTIONS, ...options };
  const entries = new Map<string, Entry>();

  function live(key: string): Entry | undefined {
    const e = entries.get(key);
    if (!e) return undefined;
    const now = o.now();
    if (e.lockedUntil <= now && now - e.lastFailureAt >= o.windowMs) {
      entries.delete(key);
      return undefined;
    }
    return e;
  }

  function prune() {
    if (entries.size < 10_000) return;
    for (const key of entries.keys()) live(key);
  }

  function fail(key: string, max: number) {
    const now = o.now();
    const e = live(key) ?? { failures: 0, lastFailureAt: now, lockedUntil: 0 };
    e.failures += 1;
    e.lastFailureAt = now;
    if (e.failures >= max) {
      const lockMs = Math.min(o.maxLockMs, o.baseLockMs * 2 ** (e.failures - max));
      e.lockedUntil = now + lockMs;
    }
    entries.set(key, e);
  }

  const accountKey = (email: string) => `account:${email.trim().toLowerCase()}`;
  const ipKey = (ip: string) => `ip:${ip}`;

  return {
    /** Seconds until sign-in may be tried again for this account or IP; 0 when allowed now. */
    retryAfterSeconds(email: string, ip: string): number {
      const now = o.now();
      const until = Math.max(live(accountKey(email))?.lockedUntil ?? 0, live(ipKey(ip))?.lockedUntil ?? 0);
      return until > now ? Math.ceil((until - now) / 1000) : 0;
    },
    recordFailure(email: string, ip: string): void {
      prune();
      fail(accountKey(email), o.accountMaxFailures);
      fail(ipKey(ip), o.ipMaxFailures);
    },
    recordSuccess(email: string): void {
      entries.delete(accountKey(email));
    },
  };
}
