/**
 * Sign-in and sign-up throttling (docs/decisions/013-sign-in-throttling.md), on rate-limiter-flexible:
 * RateLimiterMemory for one PGlite process, RateLimiterPostgres (schema bw_auth) when the database is a
 * PostgreSQL server, so every app server sees the same counts.
 *
 * OWASP ASVS 5.0 6.3.1 (controls against credential stuffing and password brute force) with the OWASP
 * Authentication Cheat Sheet's device cookies ("slow down online guessing attacks with device cookies"):
 * slow the guesser, not the owner.
 *
 * A sign-in attempt is *trusted* when it carries a device cookie this server signed for that account after
 * an earlier successful sign-in, and that cookie is not itself locked. Failures are counted
 *   - trusted:   per device cookie (`deviceMaxFailures`); when it locks, the browser is treated as untrusted;
 *   - untrusted: per (account, client address) (`accountMaxFailures`), per client address over all
 *     accounts (`ipMaxFailures`, high: a shared proxy or NAT holds many people) and per account over all
 *     untrusted clients (`accountAllClientsMaxFailures`, against guessing one account from many addresses).
 * A counter that reaches its limit locks for `baseLockMs`, doubling with each further failure up to
 * `maxLockMs`; a count is forgotten `windowMs` after its first failure. A locked attempt answers 429 before
 * any password check. A stranger's guesses therefore lock only the stranger's address (and, from many
 * addresses, other untrusted browsers); the owner's browser that signed in before keeps signing in.
 *
 * Accounts are keyed by the normalised e-mail, known or not, so a lock tells nothing about existence.
 * Keys are SHA-256 digests: the store holds no e-mail address.
 */
import { createHash, createHmac, randomBytes, timingSafeEqual } from 'node:crypto';
import { RateLimiterMemory, RateLimiterPostgres, RateLimiterRes, type RateLimiterAbstract } from 'rate-limiter-flexible';
import type { Db } from '../db/client';
import { AUTH_SCHEMA, RATE_LIMIT_TABLE, prepareAuthStore, sharedPool } from './shared-store';

export interface LimiterOptions {
  /** Failures per (account, client address) before that pair locks. */
  accountMaxFailures: number;
  /** Failures per client address, over all accounts, before untrusted sign-ins from it lock. */
  ipMaxFailures: number;
  /** Failures per account from all untrusted clients before untrusted sign-ins to it lock. */
  accountAllClientsMaxFailures: number;
  /** Failures through one device cookie before that cookie stops counting as trusted. */
  deviceMaxFailures: number;
  windowMs: number;
  baseLockMs: number;
  maxLockMs: number;
  /** Sign-ups accepted per client address in `signUpWindowMs`. */
  signUpMax: number;
  signUpWindowMs: number;
}

export const DEFAULT_LIMITER_OPTIONS: LimiterOptions = {
  accountMaxFailures: 5,
  ipMaxFailures: 100,
  accountAllClientsMaxFailures: 50,
  deviceMaxFailures: 10,
  windowMs: 15 * 60_000,
  baseLockMs: 30_000,
  maxLockMs: 15 * 60_000,
  signUpMax: 20,
  signUpWindowMs: 60 * 60_000,
};

export const DEVICE_COOKIE = 'bw_device';
/** A device cookie lasts a year from the last successful sign-in with it. */
export const DEVICE_COOKIE_DAYS = 365;

/** Who is trying: the e-mail as typed, the client address, and the device the request proved (if any). */
export interface Attempt {
  email: string;
  ip: string;
  /** From `verifyDevice`: set only when the request carried this account's valid device cookie. */
  deviceId?: string | null;
}

/** The verdict on one attempt, and how to record its outcome. */
export interface Gate {
  /** Seconds until this attempt may be made; 0 when allowed now. */
  retryAfterSeconds: number;
  /** Whether the attempt counts on its device cookie rather than on the untrusted counters. */
  trusted: boolean;
  fail(): Promise<void>;
  succeed(): Promise<void>;
}

export interface SignInLimiter {
  /** Where the counts live: the shared database (PostgreSQL store) or this process's memory. */
  storeKind(): Promise<'postgres' | 'memory'>;
  check(attempt: Attempt): Promise<Gate>;
  /** A device cookie value for the account (after a successful sign-in). */
  issueDevice(userId: string): Promise<string>;
  /** The device id when `cookie` is a device cookie this server signed for `userId`; otherwise null. */
  verifyDevice(cookie: string | undefined, userId: string): Promise<string | null>;
  /** Counts one sign-up from the address; seconds to wait when over the limit, else 0. */
  signUp(ip: string): Promise<number>;
}

interface Stores {
  kind: 'postgres' | 'memory';
  failures: RateLimiterAbstract;
  locks: RateLimiterAbstract;
  signUps: RateLimiterAbstract;
  deviceKey: Buffer;
}

const digest = (s: string) => createHash('sha256').update(s).digest('hex');
const seconds = (ms: number) => Math.max(1, Math.ceil(ms / 1000));

export function createSignInLimiter(db: Db, options: Partial<LimiterOptions> = {}): SignInLimiter {
  const o = { ...DEFAULT_LIMITER_OPTIONS, ...options };
  let ready: Promise<Stores> | undefined;

  function stores(): Promise<Stores> {
    ready ??= (async (): Promise<Stores> => {
      const pool = sharedPool(db);
      const deviceKey = await prepareAuthStore(db, pool !== undefined);
      // `points` of the failure counter is never reached: the locks below are set by this module.
      const failures = { keyPrefix: 'fail', points: 1e9, duration: Math.ceil(o.windowMs / 1000) };
      const locks = { keyPrefix: 'lock', points: 1, duration: 1 };
      const signUps = { keyPrefix: 'signup', points: o.signUpMax, duration: Math.ceil(o.signUpWindowMs / 1000) };
      if (!pool) {
        return { kind: 'memory', failures: new RateLimiterMemory(failures), locks: new RateLimiterMemory(locks), signUps: new RateLimiterMemory(signUps), deviceKey };
      }
      const pgStore = { storeClient: pool, storeType: 'pool', schemaName: AUTH_SCHEMA, tableName: RATE_LIMIT_TABLE, tableCreated: true };
      return {
        kind: 'postgres',
        failures: new RateLimiterPostgres({ ...pgStore, ...failures }),
        locks: new RateLimiterPostgres({ ...pgStore, ...locks }),
        signUps: new RateLimiterPostgres({ ...pgStore, ...signUps }),
        deviceKey,
      };
    })();
    // A failed start (database unreachable) is tried again on the next request.
    ready.catch(() => (ready = undefined));
    return ready;
  }

  async function lockedFor(s: Stores, key: string): Promise<number> {
    const res = await s.locks.get(key);
    return res && res.consumedPoints > 1 && res.msBeforeNext > 0 ? seconds(res.msBeforeNext) : 0;
  }

  async function fail(s: Stores, key: string, max: number): Promise<void> {
    const res = await s.failures.consume(key);
    if (res.consumedPoints >= max) {
      const lockMs = Math.min(o.maxLockMs, o.baseLockMs * 2 ** Math.min(30, res.consumedPoints - max));
      await s.locks.block(key, lockMs / 1000);
    }
  }

  const account = (email: string) => digest(`account:${email.trim().toLowerCase()}`);
  const keys = (a: Attempt) => ({
    pair: `pair:${digest(`${account(a.email)}|${a.ip}`)}`,
    ip: `ip:${digest(a.ip)}`,
    account: `acct:${account(a.email)}`,
    device: a.deviceId ? `dev:${digest(a.deviceId)}` : null,
  });

  const sign = (key: Buffer, payload: string) => createHmac('sha256', key).update(payload).digest('base64url');

  return {
    async storeKind() {
      return (await stores()).kind;
    },

    async check(attempt) {
      const s = await stores();
      const k = keys(attempt);
      if (k.device && (await lockedFor(s, k.device)) === 0) {
        const device = k.device;
        return {
          retryAfterSeconds: 0,
          trusted: true,
          fail: () => fail(s, device, o.deviceMaxFailures),
          succeed: async () => {
            await s.failures.delete(device);
          },
        };
      }
      const waits = await Promise.all([lockedFor(s, k.pair), lockedFor(s, k.ip), lockedFor(s, k.account)]);
      return {
        retryAfterSeconds: Math.max(...waits),
        trusted: false,
        fail: async () => {
          await fail(s, k.pair, o.accountMaxFailures);
          await fail(s, k.ip, o.ipMaxFailures);
          await fail(s, k.account, o.accountAllClientsMaxFailures);
        },
        // One good password clears its own pair only: not the address's guesses at other accounts, nor
        // the account's failures from other addresses.
        succeed: async () => {
          await s.failures.delete(k.pair);
        },
      };
    },

    async issueDevice(userId) {
      const s = await stores();
      const payload = `${userId}.${randomBytes(18).toString('base64url')}`;
      return `${payload}.${sign(s.deviceKey, payload)}`;
    },

    async verifyDevice(cookie, userId) {
      if (!cookie || cookie.length > 200) return null;
      const parts = cookie.split('.');
      if (parts.length !== 3 || parts[0] !== userId) return null;
      const s = await stores();
      const payload = `${parts[0]}.${parts[1]}`;
      const expected = Buffer.from(sign(s.deviceKey, payload));
      const given = Buffer.from(parts[2]);
      return given.length === expected.length && timingSafeEqual(given, expected) ? payload : null;
    },

    async signUp(ip) {
      const s = await stores();
      try {
        await s.signUps.consume(`ip:${digest(ip)}`);
        return 0;
      } catch (err) {
        if (err instanceof RateLimiterRes) return seconds(err.msBeforeNext);
        throw err;
      }
    },
  };
}
