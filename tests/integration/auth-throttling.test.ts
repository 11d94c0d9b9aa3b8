/**
 * Sign-in throttling through the API with the default limits: a stranger's failures slow the stranger,
 * not the people who share their address nor an account's owner on a browser that signed in before
 * (device cookie); TRUST_PROXY decides which address counts. The limiter on its own is in
 * tests/integration/auth-limiter.test.ts.
 */
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import type request from 'supertest';
import { ConfigError, loadConfig } from '../../server/config';
import { makeTestApp, DEMO_PASSWORD, type Agent, type TestApp } from '../helpers/app';

let t: TestApp;
beforeAll(async () => {
  t = await makeTestApp();
});
afterAll(async () => {
  await t?.close();
});

const signIn = (a: Agent, email: string, password: string) => a.post('/api/auth/sign-in').send({ email, password });
function deviceCookie(res: request.Response): string | undefined {
  return (res.headers['set-cookie'] as unknown as string[] | undefined)?.find((c) => c.startsWith('bw_device='));
}
const randomEmail = () => `${Math.random().toString(36).slice(2, 10)}@spray.test`;

describe('a shared address (proxy or NAT)', () => {
  it('20 failures with random e-mails from one address do not stop a demo account signing in from it', async () => {
    for (let i = 0; i < 20; i++) expect((await signIn(t.agent(), randomEmail(), 'guess guess guess')).status).toBe(401);
    expect((await signIn(t.agent(), 'reviewer@demo.test', DEMO_PASSWORD)).status).toBe(200);
  });

  it('the address does lock at the default 100 failures, for browsers that never signed in', async () => {
    const s = await makeTestApp();
    try {
      for (let i = 0; i < 100; i++) expect((await signIn(s.agent(), randomEmail(), 'guess guess guess')).status).toBe(401);
      const res = await signIn(s.agent(), 'reviewer@demo.test', DEMO_PASSWORD);
      expect(res.status).toBe(429);
      expect(Number(res.headers['retry-after'])).toBeGreaterThan(0);
    } finally {
      await s.close();
    }
  }, 120_000);
});

describe('an account being guessed', () => {
  it("its owner's browser that signed in before still signs in while the guesser is slowed", async () => {
    const owner = t.agent();
    const first = await signIn(owner, 'trainer@demo.test', DEMO_PASSWORD);
    expect(first.status).toBe(200);
    const cookie = deviceCookie(first)!;
    expect(cookie).toMatch(/; HttpOnly/);
    expect(cookie).toMatch(/; SameSite=Strict/);
    expect(cookie).toMatch(/; Path=\/api\/auth/);
    expect((await owner.post('/api/auth/sign-out')).status).toBe(204);

    const guesser = t.agent();
    for (let i = 0; i < 5; i++) expect((await signIn(guesser, 'trainer@demo.test', `wrong guess ${i}`)).status).toBe(401);
    expect((await signIn(guesser, 'trainer@demo.test', `wrong guess 6`)).status).toBe(429);

    // Same address (127.0.0.1), the owner's browser: its device cookie lets it through.
    const back = await signIn(owner, 'trainer@demo.test', DEMO_PASSWORD);
    expect(back.status).toBe(200);
    expect((await owner.get('/api/auth/me')).body.user.email).toBe('trainer@demo.test');
    // The guesser is still slowed, even with the right password; so is any other browser without the cookie.
    expect((await signIn(guesser, 'trainer@demo.test', DEMO_PASSWORD)).status).toBe(429);
    expect((await signIn(t.agent(), 'trainer@demo.test', DEMO_PASSWORD)).status).toBe(429);
  });

  it("a device cookie for another account does not help, nor does a forged one", async () => {
    const other = t.agent();
    expect((await signIn(other, 'viewer@demo.test', DEMO_PASSWORD)).status).toBe(200); // device cookie for viewer
    const guesser = t.agent();
    for (let i = 0; i < 5; i++) await signIn(guesser, 'designer@demo.test', `wrong guess ${i}`);
    expect((await signIn(other, 'designer@demo.test', DEMO_PASSWORD)).status).toBe(429);
    const forged = await t.agent().post('/api/auth/sign-in').set('Cookie', 'bw_device=anything.at.all').send({ email: 'designer@demo.test', password: DEMO_PASSWORD });
    expect(forged.status).toBe(429);
  });
});

describe('TRUST_PROXY', () => {
  it('is a hop count from 0 to 10, 0 by default', () => {
    expect(loadConfig({}).trustProxy).toBe(0);
    expect(loadConfig({ TRUST_PROXY: '1' }).trustProxy).toBe(1);
    expect(() => loadConfig({ TRUST_PROXY: 'yes' })).toThrow(ConfigError);
    expect(() => loadConfig({ TRUST_PROXY: '11' })).toThrow(/TRUST_PROXY/);
  });

  it('off: X-Forwarded-For is ignored, every request counts on the socket address', async () => {
    const s = await makeTestApp();
    try {
      for (let i = 0; i < 5; i++) await s.agent().post('/api/auth/sign-in').set('X-Forwarded-For', '203.0.113.7').send({ email: 'owner@demo.test', password: `guess ${i}` });
      const res = await s.agent().post('/api/auth/sign-in').set('X-Forwarded-For', '203.0.113.8').send({ email: 'owner@demo.test', password: DEMO_PASSWORD });
      expect(res.status).toBe(429);
    } finally {
      await s.close();
    }
  });

  it('1: the address the proxy appended to X-Forwarded-For counts; a client-written part in front of it does not', async () => {
    const s = await makeTestApp({ config: { trustProxy: 1 } });
    try {
      for (let i = 0; i < 5; i++) {
        // A guesser rotating the part it writes itself: the proxy appends the address it really saw.
        const res = await s.agent().post('/api/auth/sign-in').set('X-Forwarded-For', `198.51.100.${i}, 203.0.113.7`).send({ email: 'owner@demo.test', password: `guess ${i}` });
        expect(res.status).toBe(401);
      }
      const guesser = await s.agent().post('/api/auth/sign-in').set('X-Forwarded-For', '203.0.113.7').send({ email: 'owner@demo.test', password: DEMO_PASSWORD });
      expect(guesser.status).toBe(429);
      const colleague = await s.agent().post('/api/auth/sign-in').set('X-Forwarded-For', '203.0.113.8').send({ email: 'owner@demo.test', password: DEMO_PASSWORD });
      expect(colleague.status).toBe(200);
    } finally {
      await s.close();
    }
  });
});
