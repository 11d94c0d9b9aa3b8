/**
 * Attack: password guessing. Sign-in is limited per (account, client address) and per client address, and the
 * answers do not tell whether an account exists (the same status, body and headers for a locked real account and a
 * locked unknown one). Basic lock-outs (5 per account and address, the per-address limit, unknown e-mails limited alike)
 * are in tests/integration/auth.test.ts ("brute-force limit"); this file adds enumeration through the
 * lock, spoofed client addresses, e-mail spelling variants and the password-change route.
 */
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import type request from 'supertest';
import { makeTestApp, DEMO_PASSWORD, type TestApp } from '../helpers/app';

let t: TestApp;
beforeAll(async () => {
  // The per-address limit gets its own app below; here it is raised so it cannot be what locks.
  t = await makeTestApp({ limiter: { ipMaxFailures: 1000 } });
});
afterAll(async () => {
  await t?.close();
});

const attempt = (email: string, password: string, headers: Record<string, string> = {}) => t.agent().post('/api/auth/sign-in').set(headers).send({ email, password });

/** What an attacker can observe of a refusal (the cookie and date headers aside). */
function observable(res: request.Response) {
  const h = res.headers;
  return { status: res.status, body: res.body, retryAfter: h['retry-after'], contentType: h['content-type'], setCookie: h['set-cookie'] };
}

describe('brute force', () => {
  it('a locked real account and a locked unknown e-mail answer identically', async () => {
    for (let i = 0; i < 5; i++) {
      const real = await attempt('trainer@demo.test', `wrong guess ${i}`);
      const ghost = await attempt('no.such.person@demo.test', `wrong guess ${i}`);
      expect(observable(ghost)).toEqual(observable(real));
    }
    const real = await attempt('trainer@demo.test', DEMO_PASSWORD);
    const ghost = await attempt('no.such.person@demo.test', DEMO_PASSWORD);
    expect(real.status).toBe(429);
    expect(observable(ghost)).toEqual(observable(real));
  });

  it('spelling the e-mail differently does not reset the account count', async () => {
    const variants = ['viewer@demo.test', 'VIEWER@demo.test', ' Viewer@Demo.Test ', 'viewer@DEMO.TEST', 'vIeWeR@demo.test'];
    for (const v of variants) expect((await attempt(v, 'not the password')).status).toBe(401);
    expect((await attempt('viewer@demo.test', DEMO_PASSWORD)).status).toBe(429);
  });

  it('wrong current passwords on the password-change route count toward the same lock', async () => {
    const a = t.agent();
    expect((await a.post('/api/auth/sign-up').send({ email: 'pw.guess@example.test', password: 'real password 77', name: 'G' })).status).toBe(201);
    for (let i = 0; i < 5; i++) {
      const res = await a.post('/api/account/password').send({ currentPassword: `guess ${i} guess`, newPassword: 'attacker password' });
      expect(res.status).toBe(401);
    }
    const locked = await a.post('/api/account/password').send({ currentPassword: 'real password 77', newPassword: 'attacker password' });
    expect(locked.status).toBe(429);
    expect((await attempt('pw.guess@example.test', 'real password 77')).status).toBe(429);
  });

  it('rotating X-Forwarded-For does not escape the per-address limit (trust proxy is off)', async () => {
    // The per-address limit set to 20 here so 20 spoofed addresses reach it (the default is higher: tests/integration/auth-throttling.test.ts).
    const s = await makeTestApp({ limiter: { ipMaxFailures: 20 } });
    try {
      for (let i = 0; i < 20; i++) {
        const res = await s.agent().post('/api/auth/sign-in').set('X-Forwarded-For', `203.0.113.${i}`).set('X-Real-IP', `198.51.100.${i}`).send({ email: `spray${i}@demo.test`, password: 'guess guess' });
        expect(res.status).toBe(401);
      }
      const res = await s.agent().post('/api/auth/sign-in').set('X-Forwarded-For', '192.0.2.99').send({ email: 'owner@demo.test', password: DEMO_PASSWORD });
      expect(res.status).toBe(429);
      expect(Number(res.headers['retry-after'])).toBeGreaterThan(0);
    } finally {
      await s.close();
    }
  });
});
