import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import request from 'supertest';
import { count, eq } from 'drizzle-orm';
import { mailOutbox, sessions, users } from '../../server/db/schema';
import { makeTestApp, DEMO_PASSWORD, TEST_ORIGIN, type TestApp } from '../helpers/app';

let t: TestApp;
beforeAll(async () => {
  t = await makeTestApp();
});
afterAll(async () => {
  await t?.close();
});

function sessionCookie(res: request.Response): string | undefined {
  const raw = res.headers['set-cookie'] as unknown as string[] | undefined;
  return raw?.find((c) => c.startsWith('bw_session='));
}
function sessionIdOf(cookie: string | undefined): string {
  return /^bw_session=([^;]*)/.exec(cookie ?? '')?.[1] ?? '';
}

describe('health', () => {
  it('answers ok without a session', async () => {
    const res = await request(t.server).get('/api/health');
    expect(res.status).toBe(200);
    expect(res.body).toEqual({ ok: true });
  });

  it('sends security headers with a CSP allowing only the app\'s own scripts', async () => {
    const res = await request(t.server).get('/api/health');
    const csp = res.headers['content-security-policy'];
    expect(csp).toContain("script-src 'self'");
    expect(csp).not.toMatch(/script-src[^;]*unsafe-inline/);
    expect(csp).toContain("img-src 'self' data: blob:");
    expect(res.headers['x-content-type-options']).toBe('nosniff');
    expect(res.headers['x-powered-by']).toBeUndefined();
    expect(res.headers['cache-control']).toBe('no-store');
  });

  it('answers unknown API routes with the error shape', async () => {
    const res = await request(t.server).get('/api/no-such-thing');
    expect(res.status).toBe(404);
    expect(res.body.error.code).toBe('not_found');
  });
});

describe('sign-up', () => {
  it('creates the account, signs in and answers 201 with the user', async () => {
    const a = t.agent();
    const res = await a.post('/api/auth/sign-up').send({ email: '  Nadia.Brennan@Example.TEST ', password: 'a long enough pass', name: 'Nadia Brennan' });
    expect(res.status).toBe(201);
    expect(res.body.user).toMatchObject({ email: 'nadia.brennan@example.test', name: 'Nadia Brennan' });
    expect(res.body.user.passwordHash).toBeUndefined();
    const me = await a.get('/api/auth/me');
    expect(me.status).toBe(200);
    expect(me.body).toMatchObject({ user: { email: 'nadia.brennan@example.test' }, teams: [], demo: true, mailMode: 'outbox' });
    const [row] = await t.db.select().from(users).where(eq(users.email, 'nadia.brennan@example.test'));
    expect(row.passwordHash).toMatch(/^\$argon2id\$v=19\$m=19456,t=2,p=1\$/);
  });

  it('answers a known e-mail exactly as a new one (status, body shape, cookie), stores nothing and mails the owner', async () => {
    const [before] = await t.db.select({ n: count() }).from(users);
    const known = await t.agent().post('/api/auth/sign-up').send({ email: ' Owner@Demo.test', password: 'another password', name: 'Impostor' });
    const fresh = await t.agent().post('/api/auth/sign-up').send({ email: 'tevita.lolohea@example.test', password: 'another password', name: 'Impostor' });
    expect(known.status).toBe(201);
    expect(fresh.status).toBe(201);
    const shape = (r: request.Response) => ({
      keys: Object.keys(r.body.user).sort(),
      id: typeof r.body.user.id === 'string' && r.body.user.id.length,
      createdAt: typeof r.body.user.createdAt === 'string' && !Number.isNaN(Date.parse(r.body.user.createdAt)),
      name: r.body.user.name,
      cookie: sessionCookie(r)?.replace(/^bw_session=[a-z2-7]{40};/, 'bw_session=…;').replace(/Expires=[^;]+/, 'Expires=…'),
      cookies: (r.headers['set-cookie'] as unknown as string[]).length,
      type: r.headers['content-type'],
    });
    expect(shape(known)).toEqual(shape(fresh));
    expect(known.body.user.email).toBe('owner@demo.test');
    // One new account (the fresh address); the known one is untouched and still signs in with its own password.
    expect((await t.db.select({ n: count() }).from(users))[0].n).toBe(before.n + 1);
    expect((await t.agent().post('/api/auth/sign-in').send({ email: 'owner@demo.test', password: DEMO_PASSWORD })).status).toBe(200);
    // The decoy cookie is no session.
    const decoy = sessionIdOf(sessionCookie(known));
    expect((await request(t.server).get('/api/auth/me').set('Cookie', `bw_session=${decoy}`)).status).toBe(401);
    // Each address got one message: the owner of the known one is told someone tried.
    const mail = await t.db.select().from(mailOutbox).where(eq(mailOutbox.to, 'owner@demo.test'));
    expect(mail.map((m) => m.subject)).toEqual(['Someone tried to sign up with this address']);
    expect(mail[0].text).toContain('http://bankwright.test/sign-in');
    const welcome = await t.db.select().from(mailOutbox).where(eq(mailOutbox.to, 'tevita.lolohea@example.test'));
    expect(welcome.map((m) => m.subject)).toEqual(['Your Bankwright account']);
  });

  it('limits sign-ups per client address, known and new e-mails alike, with 429 and Retry-After', async () => {
    const s = await makeTestApp({ limiter: { signUpMax: 3 } });
    try {
      const emails = ['owner@demo.test', 'new.one@example.test', 'viewer@demo.test'];
      for (const email of emails) expect((await s.agent().post('/api/auth/sign-up').send({ email, password: 'long enough pw', name: 'N' })).status).toBe(201);
      const res = await s.agent().post('/api/auth/sign-up').send({ email: 'new.two@example.test', password: 'long enough pw', name: 'N' });
      expect(res.status).toBe(429);
      expect(res.body.error.code).toBe('too_many_sign_ups');
      expect(Number(res.headers['retry-after'])).toBeGreaterThan(0);
      expect((await s.db.select().from(users).where(eq(users.email, 'new.two@example.test'))).length).toBe(0);
      // A request the schema refuses is not counted, and is still answered 400.
      expect((await s.agent().post('/api/auth/sign-up').send({ email: 'x', password: 'short', name: '' })).status).toBe(400);
    } finally {
      await s.close();
    }
  });

  it('reports every invalid field in details.fields', async () => {
    const res = await t.agent().post('/api/auth/sign-up').send({ email: 'not-an-email', password: 'short', name: '' });
    expect(res.status).toBe(400);
    expect(res.body.error.code).toBe('validation_failed');
    expect(Object.keys(res.body.error.details.fields).sort()).toEqual(['email', 'name', 'password']);
    expect(res.body.error.details.fields.password).toEqual(['Password must be at least 10 characters']);
  });
});

describe('sign-in', () => {
  it('sets an HttpOnly, SameSite=Lax session cookie (not Secure over http)', async () => {
    const res = await t.agent().post('/api/auth/sign-in').send({ email: 'viewer@demo.test', password: DEMO_PASSWORD });
    expect(res.status).toBe(200);
    expect(res.body.user.email).toBe('viewer@demo.test');
    const cookie = sessionCookie(res)!;
    expect(cookie).toBeDefined();
    expect(cookie).toMatch(/; HttpOnly/);
    expect(cookie).toMatch(/; SameSite=Lax/);
    expect(cookie).toMatch(/; Path=\//);
    expect(cookie).not.toMatch(/; Secure/);
  });

  it('marks the cookie Secure when APP_ORIGIN is https', async () => {
    const s = await makeTestApp({ config: { appOrigin: 'https://bankwright.example.com' } });
    try {
      const res = await request(s.server)
        .post('/api/auth/sign-in')
        .set('Origin', 'https://bankwright.example.com')
        .send({ email: 'viewer@demo.test', password: DEMO_PASSWORD });
      expect(res.status).toBe(200);
      expect(sessionCookie(res)).toMatch(/; Secure/);
      expect(res.headers['strict-transport-security']).toBeDefined();
    } finally {
      await s.close();
    }
  });

  it('issues a new session id on every sign-in and ends the previous one', async () => {
    const a = t.agent();
    const first = await a.post('/api/auth/sign-in').send({ email: 'trainer@demo.test', password: DEMO_PASSWORD });
    const second = await a.post('/api/auth/sign-in').send({ email: 'trainer@demo.test', password: DEMO_PASSWORD });
    const id1 = sessionIdOf(sessionCookie(first));
    const id2 = sessionIdOf(sessionCookie(second));
    expect(id1).toMatch(/^[a-z0-9]{20,}$/);
    expect(id2).toMatch(/^[a-z0-9]{20,}$/);
    expect(id2).not.toBe(id1);
    const stale = await request(t.server).get('/api/auth/me').set('Cookie', `bw_session=${id1}`);
    expect(stale.status).toBe(401);
  });

  it('gives the same 401 message for a wrong password and an unknown e-mail', async () => {
    const wrong = await t.agent().post('/api/auth/sign-in').send({ email: 'reviewer@demo.test', password: 'not the password' });
    const unknown = await t.agent().post('/api/auth/sign-in').send({ email: 'nobody@demo.test', password: 'not the password' });
    expect(wrong.status).toBe(401);
    expect(unknown.status).toBe(401);
    expect(wrong.body).toEqual({ error: { code: 'invalid_credentials', message: 'E-mail or password is incorrect.' } });
    expect(unknown.body).toEqual(wrong.body);
    expect(sessionCookie(wrong)).toBeUndefined();
  });
});

describe('brute-force limit', () => {
  it('answers 429 with Retry-After after 5 failures for one account from one address, even for the right password', async () => {
    const email = 'designer@demo.test';
    for (let i = 0; i < 5; i++) {
      const res = await t.agent().post('/api/auth/sign-in').send({ email, password: `guess number ${i}` });
      expect(res.status).toBe(401);
    }
    const blocked = await t.agent().post('/api/auth/sign-in').send({ email, password: DEMO_PASSWORD });
    expect(blocked.status).toBe(429);
    expect(blocked.body.error.code).toBe('too_many_attempts');
    const retryAfter = Number(blocked.headers['retry-after']);
    expect(retryAfter).toBeGreaterThanOrEqual(1);
    expect(retryAfter).toBeLessThanOrEqual(30);
    // Another account from the same address is not locked by this account's failures.
    const other = await t.agent().post('/api/auth/sign-in').send({ email: 'owner@demo.test', password: DEMO_PASSWORD });
    expect(other.status).toBe(200);
  });

  it('limits unknown e-mails the same way (no enumeration through 429)', async () => {
    for (let i = 0; i < 5; i++) await t.agent().post('/api/auth/sign-in').send({ email: 'ghost@demo.test', password: `guess ${i}` });
    const res = await t.agent().post('/api/auth/sign-in').send({ email: 'ghost@demo.test', password: 'guess 6' });
    expect(res.status).toBe(429);
  });

  it('limits one address across accounts at ipMaxFailures (the default is in tests/integration/auth-throttling.test.ts)', async () => {
    const s = await makeTestApp({ limiter: { ipMaxFailures: 25 } });
    try {
      for (let i = 0; i < 25; i++) {
        const res = await s.agent().post('/api/auth/sign-in').send({ email: `spray${i}@demo.test`, password: 'bankwright-demo' });
        expect(res.status).toBe(401);
      }
      const res = await s.agent().post('/api/auth/sign-in').send({ email: 'viewer@demo.test', password: DEMO_PASSWORD });
      expect(res.status).toBe(429);
      expect(res.headers['retry-after']).toBeDefined();
    } finally {
      await s.close();
    }
  });
});

describe('sign-out and me', () => {
  it('me answers 401 unauthenticated without a session', async () => {
    const res = await request(t.server).get('/api/auth/me');
    expect(res.status).toBe(401);
    expect(res.body.error.code).toBe('unauthenticated');
  });

  it('me lists the user\'s teams with role and unit system', async () => {
    const a = await t.agentFor('reviewer');
    const res = await a.get('/api/auth/me');
    expect(res.status).toBe(200);
    expect(res.body.user).toMatchObject({ email: 'reviewer@demo.test', name: 'Priya Halvorsen' });
    expect(res.body.teams).toEqual([{ id: expect.any(String), name: 'Kestrel Bay Energy Works', role: 'reviewer', unitSystem: 'metric' }]);
  });

  it('sign-out deletes the session on the server: the old cookie no longer works', async () => {
    const a = t.agent();
    const signIn = await a.post('/api/auth/sign-in').send({ email: 'viewer@demo.test', password: DEMO_PASSWORD });
    const id = sessionIdOf(sessionCookie(signIn));
    const out = await a.post('/api/auth/sign-out');
    expect(out.status).toBe(204);
    expect(sessionCookie(out)).toMatch(/^bw_session=;/);
    const [{ n }] = await t.db.select({ n: count() }).from(sessions).where(eq(sessions.id, id));
    expect(n).toBe(0);
    const replay = await request(t.server).get('/api/auth/me').set('Cookie', `bw_session=${id}`);
    expect(replay.status).toBe(401);
  });
});

describe('origin check', () => {
  it('refuses a cookie-authenticated mutation from another origin with 403 origin_rejected', async () => {
    const a = await t.signIn('owner@demo.test');
    const res = await a.post('/api/teams').set('Origin', 'https://evil.example').send({ name: 'Hijacked', unitSystem: 'metric' });
    expect(res.status).toBe(403);
    expect(res.body.error.code).toBe('origin_rejected');
    const list = await a.get('/api/teams');
    expect(list.body.teams.map((x: { name: string }) => x.name)).not.toContain('Hijacked');
  });

  it('refuses a cookie-authenticated mutation without Origin or Sec-Fetch-Site', async () => {
    const signIn = await t.agent().post('/api/auth/sign-in').send({ email: 'owner@demo.test', password: DEMO_PASSWORD });
    const cookie = sessionCookie(signIn)!.split(';')[0];
    const res = await request(t.server).post('/api/teams').set('Cookie', cookie).send({ name: 'No origin', unitSystem: 'metric' });
    expect(res.status).toBe(403);
    expect(res.body.error.code).toBe('origin_rejected');
  });

  it('accepts Sec-Fetch-Site: same-origin, and the request\'s own host as Origin', async () => {
    const signIn = await t.agent().post('/api/auth/sign-in').send({ email: 'owner@demo.test', password: DEMO_PASSWORD });
    const cookie = sessionCookie(signIn)!.split(';')[0];
    const viaFetchMeta = await request(t.server).post('/api/teams').set('Cookie', cookie).set('Sec-Fetch-Site', 'same-origin').send({ name: 'Fetch metadata team' });
    expect(viaFetchMeta.status).toBe(201);
    const port = (t.server.address() as { port: number }).port;
    const viaHost = await request(t.server).post('/api/teams').set('Cookie', cookie).set('Origin', `http://127.0.0.1:${port}`).send({ name: 'Own host team' });
    expect(viaHost.status).toBe(201);
  });

  it('refuses a cross-site sign-in form post (login CSRF) even without a cookie', async () => {
    const res = await request(t.server).post('/api/auth/sign-in').set('Origin', 'https://evil.example').send({ email: 'owner@demo.test', password: DEMO_PASSWORD });
    expect(res.status).toBe(403);
    expect(res.body.error.code).toBe('origin_rejected');
  });

  it('lets reads through without Origin', async () => {
    const a = await t.agentFor('viewer');
    const res = await a.get('/api/teams').set('Origin', 'https://evil.example');
    expect(res.status).toBe(200);
  });

  it('uses TEST_ORIGIN as APP_ORIGIN in tests', () => {
    expect(t.config.appOrigin).toBe(TEST_ORIGIN);
  });
});

describe('request bodies', () => {
  it('answers malformed JSON with 400 malformed_json', async () => {
    const a = await t.agentFor('owner');
    const res = await a.post('/api/teams').set('Content-Type', 'application/json').send('{"name": "Broken",');
    expect(res.status).toBe(400);
    expect(res.body.error.code).toBe('malformed_json');
    expect(JSON.stringify(res.body)).not.toMatch(/at .*\.(js|ts):\d+/);
  });

  it('answers a body over 1 MB with 413 payload_too_large', async () => {
    const a = await t.agentFor('owner');
    const res = await a.post('/api/teams').send({ name: 'Big', unitSystem: 'metric', padding: 'x'.repeat(1_100_000) });
    expect(res.status).toBe(413);
    expect(res.body.error.code).toBe('payload_too_large');
  });

  it('treats a non-JSON body as an empty one (validation, not 500)', async () => {
    const a = await t.agentFor('owner');
    const res = await a.post('/api/teams').set('Content-Type', 'text/plain').send('name=Plain');
    expect(res.status).toBe(400);
    expect(res.body.error.code).toBe('validation_failed');
    expect(res.body.error.details.fields.name).toBeDefined();
  });
});

describe('hostile input never yields 500', () => {
  it('refuses NUL characters in bodies and URLs with 400 validation_failed, storing nothing', async () => {
    const a = await t.agentFor('owner');
    const [before] = await t.db.select({ n: count() }).from(users);
    const signUp = await t.agent().post('/api/auth/sign-up').send({ email: 'nul@example.test', password: 'long enough pw', name: 'a\u0000b' });
    expect(signUp.status).toBe(400);
    expect(signUp.body.error.details.fields).toEqual({ name: ['Text must not contain NUL characters'] });
    expect((await t.db.select({ n: count() }).from(users))[0].n).toBe(before.n);
    const nested = await a.post('/api/teams').send({ name: 'Fine name', extra: { list: ['ok', 'bad\u0000'] } });
    expect(nested.status).toBe(400);
    expect(nested.body.error.details.fields).toEqual({ 'extra.list.1': ['Text must not contain NUL characters'] });
    for (const url of ['/api/projects/%00abc', '/api/projects?teamId=a%00', '/api/invites/x%00y']) {
      const res = await a.get(url);
      expect(res.status).toBe(400);
      expect(res.body.error.code).toBe('validation_failed');
    }
  });

  it('answers a malformed percent-encoding in the path with 400, and a garbage cookie as signed out', async () => {
    const a = await t.agentFor('owner');
    const res = await a.get('/api/projects/%E0%A4%A');
    expect(res.status).toBe(400);
    expect(res.body.error.code).toBe('bad_request');
    const junk = await request(t.server).get('/api/auth/me').set('Cookie', 'bw_session=%00%27;%20drop');
    expect(junk.status).toBe(401);
    expect(junk.body.error.code).toBe('unauthenticated');
  });
});
