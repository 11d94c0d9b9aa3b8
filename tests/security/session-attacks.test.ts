/**
 * Attacks on sessions: fixation (an attacker plants a session id in the victim's browser before the
 * victim signs in), replay of ended sessions, revoking by the secret id, and account takeover through
 * changing the e-mail without the current password.
 * Also covered elsewhere: a new id on every sign-in and sign-out deleting the session
 * (tests/integration/auth.test.ts), listing and ending sessions and ending the others on a password
 * change (tests/integration/account.test.ts).
 */
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import request from 'supertest';
import { eq } from 'drizzle-orm';
import { sessions, users } from '../../server/db/schema';
import { makeTestApp, DEMO_PASSWORD, TEST_ORIGIN, type TestApp } from '../helpers/app';

let t: TestApp;
beforeAll(async () => {
  t = await makeTestApp();
});
afterAll(async () => {
  await t?.close();
});

function sessionIdOf(res: request.Response): string | undefined {
  const c = (res.headers['set-cookie'] as unknown as string[] | undefined)?.find((x) => x.startsWith('bw_session='));
  return c ? /^bw_session=([^;]*)/.exec(c)?.[1] : undefined;
}
const me = (id: string) => request(t.server).get('/api/auth/me').set('Cookie', `bw_session=${id}`);
const signInWith = (planted: string, email: string, password = DEMO_PASSWORD) =>
  request(t.server).post('/api/auth/sign-in').set('Origin', TEST_ORIGIN).set('Cookie', `bw_session=${planted}`).send({ email, password });

describe('session fixation', () => {
  it("the attacker's own valid session planted in the victim's browser is replaced on sign-in and ended", async () => {
    const attacker = await request(t.server).post('/api/auth/sign-in').set('Origin', TEST_ORIGIN).send({ email: 'viewer@demo.test', password: DEMO_PASSWORD });
    const planted = sessionIdOf(attacker)!;
    const victim = await signInWith(planted, 'owner@demo.test');
    expect(victim.status).toBe(200);
    const fresh = sessionIdOf(victim)!;
    expect(fresh).toMatch(/^[a-z0-9]{20,}$/);
    expect(fresh).not.toBe(planted);
    // The planted id never becomes the victim's session; it is ended.
    expect((await me(planted)).status).toBe(401);
    expect((await me(fresh)).body.user.email).toBe('owner@demo.test');
  });

  it('an attacker-chosen id that was never issued is not adopted', async () => {
    const planted = 'attackerchosensessionid0000000';
    const victim = await signInWith(planted, 'owner@demo.test');
    expect(victim.status).toBe(200);
    expect(sessionIdOf(victim)).not.toBe(planted);
    expect((await me(planted)).status).toBe(401);
    expect(await t.db.select().from(sessions).where(eq(sessions.id, planted))).toHaveLength(0);
  });

  it('sign-up also issues a fresh id and ends a planted one', async () => {
    const attacker = await request(t.server).post('/api/auth/sign-in').set('Origin', TEST_ORIGIN).send({ email: 'viewer@demo.test', password: DEMO_PASSWORD });
    const planted = sessionIdOf(attacker)!;
    const res = await request(t.server)
      .post('/api/auth/sign-up')
      .set('Origin', TEST_ORIGIN)
      .set('Cookie', `bw_session=${planted}`)
      .send({ email: 'fixation.victim@example.test', password: 'victim password 1', name: 'Victim' });
    expect(res.status).toBe(201);
    expect(sessionIdOf(res)).not.toBe(planted);
    expect((await me(planted)).status).toBe(401);
  });
});

describe('ended sessions cannot be replayed', () => {
  it('a password change without endOtherSessions ends the other sessions by default', async () => {
    const a = t.agent();
    expect((await a.post('/api/auth/sign-up').send({ email: 'default.end@example.test', password: 'first password 9', name: 'D' })).status).toBe(201);
    const stolen = await t.signIn('default.end@example.test', 'first password 9');
    const res = await a.post('/api/account/password').send({ currentPassword: 'first password 9', newPassword: 'second password 9' });
    expect(res.status).toBe(204);
    expect((await stolen.get('/api/auth/me')).status).toBe(401);
    expect((await a.get('/api/auth/me')).status).toBe(200);
  });

  it('a session cannot be ended by its secret id in the URL (only by its public id), and the secret is never listed', async () => {
    const a = await t.signIn('reviewer@demo.test');
    const other = await request(t.server).post('/api/auth/sign-in').set('Origin', TEST_ORIGIN).send({ email: 'reviewer@demo.test', password: DEMO_PASSWORD });
    const secret = sessionIdOf(other)!;
    const list = await a.get('/api/account/sessions');
    expect(JSON.stringify(list.body)).not.toContain(secret);
    expect((await a.delete(`/api/account/sessions/${secret}`)).status).toBe(404);
    expect((await me(secret)).status).toBe(200);
  });
});

// Validated sessions are reused for a moment (server/auth/sessions.ts SESSION_CACHE_MS): each case
// uses the session just before ending it, so a stale reuse would let the next request through.
describe('a session used a moment ago ends at once', () => {
  async function pair(email: string, password: string) {
    const a = t.agent();
    expect((await a.post('/api/auth/sign-up').send({ email, password, name: 'P' })).status).toBe(201);
    const other = await t.signIn(email, password);
    expect((await other.get('/api/auth/me')).status).toBe(200);
    expect((await a.get('/api/auth/me')).status).toBe(200);
    return { a, other };
  }

  it('on sign-out', async () => {
    await pair('warm.signout@example.test', 'warm password 1');
    const id = sessionIdOf(await request(t.server).post('/api/auth/sign-in').set('Origin', TEST_ORIGIN).send({ email: 'warm.signout@example.test', password: 'warm password 1' }))!;
    expect((await me(id)).status).toBe(200);
    expect((await request(t.server).post('/api/auth/sign-out').set('Origin', TEST_ORIGIN).set('Cookie', `bw_session=${id}`)).status).toBe(204);
    expect((await me(id)).status).toBe(401);
  });

  it('when revoked from the sessions list', async () => {
    const { a, other } = await pair('warm.revoke@example.test', 'warm password 1');
    const list = (await a.get('/api/account/sessions')).body.sessions as { id: string; current: boolean }[];
    const target = list.find((s) => !s.current)!;
    expect((await a.delete(`/api/account/sessions/${target.id}`)).status).toBe(204);
    expect((await other.get('/api/auth/me')).status).toBe(401);
  });

  it('when the password changes (other sessions end)', async () => {
    const { a, other } = await pair('warm.password@example.test', 'warm password 1');
    expect((await a.post('/api/account/password').send({ currentPassword: 'warm password 1', newPassword: 'warm password 2' })).status).toBe(204);
    expect((await other.get('/api/auth/me')).status).toBe(401);
    expect((await a.get('/api/auth/me')).status).toBe(200);
  });

  it('and a changed e-mail or name shows in the next answer', async () => {
    const { a, other } = await pair('warm.rename@example.test', 'warm password 1');
    expect((await a.patch('/api/account').send({ name: 'Renamed' })).status).toBe(200);
    expect((await other.get('/api/auth/me')).body.user.name).toBe('Renamed');
    expect((await a.patch('/api/account/email').send({ email: 'warm.renamed@example.test', currentPassword: 'warm password 1' })).status).toBe(200);
    expect((await other.get('/api/auth/me')).body.user.email).toBe('warm.renamed@example.test');
  });
});

describe('account takeover through the e-mail address', () => {
  it('PATCH /api/account cannot change the e-mail (it is not an accepted field)', async () => {
    const a = t.agent();
    expect((await a.post('/api/auth/sign-up').send({ email: 'keeps.email@example.test', password: 'keeps password 1', name: 'Keeps' })).status).toBe(201);
    const res = await a.patch('/api/account').send({ name: 'Keeps', email: 'attacker@evil.example' });
    expect(res.status).toBeLessThan(500);
    const rows = await t.db.select().from(users).where(eq(users.email, 'attacker@evil.example'));
    expect(rows).toHaveLength(0);
    expect((await a.get('/api/auth/me')).body.user.email).toBe('keeps.email@example.test');
  });

  it('changing the e-mail asks for the current password: without it 400, with a wrong one 401, and the address stays', async () => {
    const a = t.agent();
    expect((await a.post('/api/auth/sign-up').send({ email: 'owns.email@example.test', password: 'owns password 1', name: 'Owns' })).status).toBe(201);
    const without = await a.patch('/api/account/email').send({ email: 'attacker@evil.example' });
    expect(without.status).toBe(400);
    expect(Object.keys(without.body.error.details.fields)).toEqual(['currentPassword']);
    const wrong = await a.patch('/api/account/email').send({ email: 'attacker@evil.example', currentPassword: 'guessed password' });
    expect(wrong.status).toBe(401);
    expect(wrong.body.error.code).toBe('invalid_credentials');
    expect(await t.db.select().from(users).where(eq(users.email, 'attacker@evil.example'))).toHaveLength(0);
    expect((await a.get('/api/auth/me')).body.user.email).toBe('owns.email@example.test');
    // The right password changes it, and sign-in then works with the new address only.
    const ok = await a.patch('/api/account/email').send({ email: 'Owns.New@Example.test', currentPassword: 'owns password 1' });
    expect(ok.status).toBe(200);
    expect(ok.body.user.email).toBe('owns.new@example.test');
    expect((await request(t.server).post('/api/auth/sign-in').set('Origin', TEST_ORIGIN).send({ email: 'owns.email@example.test', password: 'owns password 1' })).status).toBe(401);
    expect((await request(t.server).post('/api/auth/sign-in').set('Origin', TEST_ORIGIN).send({ email: 'owns.new@example.test', password: 'owns password 1' })).status).toBe(200);
  });

  it('e-mail change guesses count against the sign-in limiter (a stolen session is no password oracle)', async () => {
    const a = t.agent();
    expect((await a.post('/api/auth/sign-up').send({ email: 'guessed.email@example.test', password: 'guessed right 1', name: 'G' })).status).toBe(201);
    let last: request.Response | undefined;
    for (let i = 0; i < 12; i++) {
      last = await a.patch('/api/account/email').send({ email: 'mallory@evil.example', currentPassword: `wrong guess ${i}` });
      if (last.status === 429) break;
    }
    expect(last!.status).toBe(429);
    expect(last!.body.error.code).toBe('too_many_attempts');
    // Even the right password is refused while locked.
    expect((await a.patch('/api/account/email').send({ email: 'mallory@evil.example', currentPassword: 'guessed right 1' })).status).toBe(429);
    expect(await t.db.select().from(users).where(eq(users.email, 'mallory@evil.example'))).toHaveLength(0);
  });

  it("the e-mail cannot be changed to another account's address (409 email_taken), in any spelling", async () => {
    const a = t.agent();
    expect((await a.post('/api/auth/sign-up').send({ email: 'wants.owner@example.test', password: 'wants password 1', name: 'W' })).status).toBe(201);
    const res = await a.patch('/api/account/email').send({ email: ' OWNER@demo.test ', currentPassword: 'wants password 1' });
    expect(res.status).toBe(409);
    expect(res.body.error.code).toBe('email_taken');
    expect((await a.get('/api/auth/me')).body.user.email).toBe('wants.owner@example.test');
  });
});
