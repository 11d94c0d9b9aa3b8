/**
 * The sign-in limiter on its own (server/auth/rate-limit.ts), on the test database: PGlite with the
 * memory store, or with DATABASE_URL the PostgreSQL store (schema bw_auth). The clock is Date only.
 */
import { afterAll, afterEach, beforeAll, describe, expect, it, vi } from 'vitest';
import { sql } from 'drizzle-orm';
import { createSignInLimiter, type LimiterOptions } from '../../server/auth/rate-limit';
import { createTestDatabase, type TestDatabase } from '../helpers/db';

let database: TestDatabase;
beforeAll(async () => {
  database = await createTestDatabase();
});
afterAll(async () => {
  await database?.destroy();
});
afterEach(() => {
  vi.useRealTimers();
});

let n = 0;
/** A fresh limiter and fresh names, so counts from other tests (shared on PostgreSQL) never meet. */
function fresh(options: Partial<LimiterOptions> = {}) {
  const tag = `${++n}-${Math.random().toString(36).slice(2, 8)}`;
  return { l: createSignInLimiter(database.db, options), email: (s: string) => `${s}.${tag}@x.test`, ip: (s: string) => `10.${n}.0.${s}` };
}
function clock() {
  vi.useFakeTimers({ toFake: ['Date'] });
  vi.setSystemTime(new Date('2026-03-01T08:00:00Z'));
  return { advance: (ms: number) => vi.setSystemTime(new Date(Date.now() + ms)) };
}

async function failTimes(l: ReturnType<typeof createSignInLimiter>, times: number, attempt: { email: string; ip: string; deviceId?: string | null }) {
  for (let i = 0; i < times; i++) await (await l.check(attempt)).fail();
}
const wait = async (l: ReturnType<typeof createSignInLimiter>, attempt: { email: string; ip: string; deviceId?: string | null }) => (await l.check(attempt)).retryAfterSeconds;

describe('per (account, address)', () => {
  it('locks the pair after 5 failures for 30 s, doubling with each further failure; other addresses and accounts stay open', async () => {
    const c = clock();
    const { l, email, ip } = fresh();
    const a = { email: email('a'), ip: ip('1') };
    await failTimes(l, 4, a);
    expect(await wait(l, a)).toBe(0);
    await failTimes(l, 1, a);
    expect(await wait(l, a)).toBe(30);
    expect(await wait(l, { email: a.email, ip: ip('2') })).toBe(0);
    expect(await wait(l, { email: email('b'), ip: a.ip })).toBe(0);
    c.advance(30_000);
    expect(await wait(l, a)).toBe(0);
    await failTimes(l, 1, a);
    expect(await wait(l, a)).toBe(60);
    c.advance(60_000);
    await failTimes(l, 1, a);
    expect(await wait(l, a)).toBe(120);
  });

  it('spells the account case-insensitively and forgets the count 15 minutes after the first failure', async () => {
    const c = clock();
    const { l, email, ip } = fresh();
    await failTimes(l, 4, { email: email('Case').toUpperCase(), ip: ip('1') });
    expect(await wait(l, { email: ` ${email('case')} `, ip: ip('1') })).toBe(0);
    c.advance(15 * 60_000 + 1000);
    await failTimes(l, 1, { email: email('case'), ip: ip('1') });
    expect(await wait(l, { email: email('case'), ip: ip('1') })).toBe(0);
  });

  it('a success clears its own pair only', async () => {
    clock();
    const { l, email, ip } = fresh({ ipMaxFailures: 6 });
    const a = { email: email('a'), ip: ip('1') };
    await failTimes(l, 4, a);
    await (await l.check(a)).succeed();
    await failTimes(l, 1, a);
    expect(await wait(l, a)).toBe(0); // 1 of 5 after the success
    await failTimes(l, 1, { email: email('b'), ip: a.ip });
    // The address has 6 failures (the success did not clear them): every account from it waits.
    expect(await wait(l, { email: email('c'), ip: a.ip })).toBe(30);
  });
});

describe('per address and per account over all addresses', () => {
  it('locks an address after ipMaxFailures over different accounts, not other addresses', async () => {
    clock();
    const { l, email, ip } = fresh({ ipMaxFailures: 8 });
    for (let i = 0; i < 8; i++) await failTimes(l, 1, { email: email(`spray${i}`), ip: ip('1') });
    expect(await wait(l, { email: email('someone'), ip: ip('1') })).toBe(30);
    expect(await wait(l, { email: email('someone'), ip: ip('2') })).toBe(0);
  });

  it('locks untrusted sign-ins to one account guessed from many addresses; its device cookie still passes', async () => {
    clock();
    const { l, email, ip } = fresh({ accountAllClientsMaxFailures: 6 });
    const victim = email('victim');
    for (let i = 0; i < 6; i++) await failTimes(l, 1, { email: victim, ip: ip(String(i)) });
    expect(await wait(l, { email: victim, ip: ip('99') })).toBe(30);
    const deviceId = await l.verifyDevice(await l.issueDevice('user-victim'), 'user-victim');
    const gate = await l.check({ email: victim, ip: ip('99'), deviceId });
    expect(gate).toMatchObject({ retryAfterSeconds: 0, trusted: true });
  });
});

describe('device cookies', () => {
  it('verifies only a cookie signed for that account, unaltered', async () => {
    const { l } = fresh();
    const cookie = await l.issueDevice('user-1');
    expect(cookie).toMatch(/^user-1\.[A-Za-z0-9_-]+\.[A-Za-z0-9_-]{43}$/);
    expect(await l.verifyDevice(cookie, 'user-1')).toBe(cookie.split('.').slice(0, 2).join('.'));
    expect(await l.verifyDevice(cookie, 'user-2')).toBeNull();
    const [id, nonce, sig] = cookie.split('.');
    expect(await l.verifyDevice(`user-2.${nonce}.${sig}`, 'user-2')).toBeNull();
    expect(await l.verifyDevice(`${id}.${nonce}x.${sig}`, 'user-1')).toBeNull();
    expect(await l.verifyDevice(`${id}.${nonce}.${sig.slice(0, -1)}${sig.endsWith('A') ? 'B' : 'A'}`, 'user-1')).toBeNull();
    expect(await l.verifyDevice(undefined, 'user-1')).toBeNull();
    expect(await l.verifyDevice('garbage', 'user-1')).toBeNull();
  });

  it('a second limiter on the same database (another app server, or a restart) accepts the cookie', async () => {
    const cookie = await fresh().l.issueDevice('user-3');
    expect(await fresh().l.verifyDevice(cookie, 'user-3')).not.toBeNull();
  });

  it('counts a device\'s failures on the device; after deviceMaxFailures it is treated as untrusted', async () => {
    clock();
    const { l, email, ip } = fresh({ deviceMaxFailures: 3 });
    const deviceId = await l.verifyDevice(await l.issueDevice('user-4'), 'user-4');
    const owner = { email: email('owner'), ip: ip('1'), deviceId };
    await failTimes(l, 5, { email: owner.email, ip: owner.ip }); // a stranger on the same address locks the pair
    expect(await wait(l, { email: owner.email, ip: owner.ip })).toBe(30);
    expect(await l.check(owner)).toMatchObject({ retryAfterSeconds: 0, trusted: true });
    await failTimes(l, 3, owner);
    // The device is locked, so the attempt falls back to the untrusted counters — locked by the stranger.
    expect(await l.check(owner)).toMatchObject({ retryAfterSeconds: 30, trusted: false });
  });
});

describe('sign-up', () => {
  it('allows signUpMax sign-ups per address in the window, then names the wait', async () => {
    const c = clock();
    const { l, ip } = fresh({ signUpMax: 2, signUpWindowMs: 60_000 });
    expect(await l.signUp(ip('1'))).toBe(0);
    expect(await l.signUp(ip('1'))).toBe(0);
    expect(await l.signUp(ip('1'))).toBe(60);
    expect(await l.signUp(ip('2'))).toBe(0);
    c.advance(60_001);
    expect(await l.signUp(ip('1'))).toBe(0);
  });
});

describe.runIf(process.env.DATABASE_URL)('on PostgreSQL', () => {
  it('keeps the counts in bw_auth.rate_limits, shared by every limiter on the database, with no e-mail in the keys', async () => {
    const { l, email, ip } = fresh();
    expect(await l.storeKind()).toBe('postgres');
    const other = createSignInLimiter(database.db);
    const a = { email: email('shared'), ip: ip('1') };
    await failTimes(l, 5, a);
    expect(await wait(other, a)).toBeGreaterThan(0);
    const rows = (await database.db.execute(sql`select key from bw_auth.rate_limits`)) as unknown as { rows: { key: string }[] };
    expect(rows.rows.length).toBeGreaterThan(0);
    expect(rows.rows.filter((r) => r.key.includes('@'))).toEqual([]);
  });
});

describe.runIf(!process.env.DATABASE_URL)('on PGlite', () => {
  it('keeps the counts in this process\'s memory', async () => {
    expect(await fresh().l.storeKind()).toBe('memory');
  });
});
