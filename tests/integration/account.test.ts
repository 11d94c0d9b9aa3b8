import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import request from 'supertest';
import { eq } from 'drizzle-orm';
import { sessions, users } from '../../server/db/schema';
import { makeTestApp, type Agent, type TestApp } from '../helpers/app';

let t: TestApp;
beforeAll(async () => {
  t = await makeTestApp({ seed: false });
});
afterAll(async () => {
  await t?.close();
});

let n = 0;
async function newAccount(password = 'first password 1'): Promise<{ a: Agent; email: string }> {
  const email = `account${++n}@example.test`;
  const a = t.agent();
  const res = await a.post('/api/auth/sign-up').set('User-Agent', 'BenchTester/1.0').send({ email, password, name: `Account ${n}` });
  expect(res.status).toBe(201);
  return { a, email };
}

describe('account', () => {
  it('renames the user', async () => {
    const { a, email } = await newAccount();
    const res = await a.patch('/api/account').send({ name: '  Leilani Ruiz ' });
    expect(res.status).toBe(200);
    expect(res.body.user).toMatchObject({ email, name: 'Leilani Ruiz' });
    expect((await a.get('/api/auth/me')).body.user.name).toBe('Leilani Ruiz');
  });

  it('lists sessions under a public id that is not the session id', async () => {
    const { a, email } = await newAccount();
    const second = await t.signIn(email, 'first password 1');
    const res = await a.get('/api/account/sessions');
    expect(res.status).toBe(200);
    expect(res.body.sessions).toHaveLength(2);
    expect(res.body.sessions.filter((s: { current: boolean }) => s.current)).toHaveLength(1);
    const [user] = await t.db.select().from(users).where(eq(users.email, email));
    const rows = await t.db.select().from(sessions).where(eq(sessions.userId, user.id));
    const realIds = rows.map((r) => r.id);
    for (const s of res.body.sessions) {
      expect(realIds).not.toContain(s.id);
      expect(Object.keys(s).sort()).toEqual(['createdAt', 'current', 'expiresAt', 'id', 'userAgent']);
    }
    expect(res.body.sessions.map((s: { userAgent: string }) => s.userAgent)).toContain('BenchTester/1.0');
    // Absolute expiry: never more than 30 days after creation; idle: about 7 days from now.
    for (const s of res.body.sessions) {
      const life = new Date(s.expiresAt).getTime() - new Date(s.createdAt).getTime();
      expect(life).toBeLessThanOrEqual(30 * 24 * 3600 * 1000);
      expect(life).toBeGreaterThan(6 * 24 * 3600 * 1000);
    }
    // End the other session.
    const other = res.body.sessions.find((s: { current: boolean }) => !s.current);
    expect((await a.delete(`/api/account/sessions/${other.id}`)).status).toBe(204);
    expect((await second.get('/api/auth/me')).status).toBe(401);
    expect((await a.get('/api/auth/me')).status).toBe(200);
    expect((await a.delete(`/api/account/sessions/${other.id}`)).status).toBe(404);
  });

  it('cannot end another user\'s session', async () => {
    const one = await newAccount();
    const two = await newAccount();
    const theirs = (await two.a.get('/api/account/sessions')).body.sessions[0].id;
    expect((await one.a.delete(`/api/account/sessions/${theirs}`)).status).toBe(404);
    expect((await two.a.get('/api/auth/me')).status).toBe(200);
  });

  it('refuses a session past its absolute expiry even while idle expiry is ahead', async () => {
    const { a, email } = await newAccount();
    const [user] = await t.db.select().from(users).where(eq(users.email, email));
    await t.db
      .update(sessions)
      .set({ createdAt: new Date(Date.now() - 31 * 24 * 3600 * 1000), expiresAt: new Date(Date.now() + 6 * 24 * 3600 * 1000) })
      .where(eq(sessions.userId, user.id));
    expect((await a.get('/api/auth/me')).status).toBe(401);
    expect(await t.db.select().from(sessions).where(eq(sessions.userId, user.id))).toHaveLength(0);
  });

  it('slides the idle expiry forward when half of it has passed, sending a fresh cookie', async () => {
    const { a, email } = await newAccount();
    const [user] = await t.db.select().from(users).where(eq(users.email, email));
    const soon = new Date(Date.now() + 2 * 24 * 3600 * 1000);
    await t.db.update(sessions).set({ expiresAt: soon }).where(eq(sessions.userId, user.id));
    const res = await a.get('/api/auth/me');
    expect(res.status).toBe(200);
    const cookie = (res.headers['set-cookie'] as unknown as string[]).find((c) => c.startsWith('bw_session='));
    expect(cookie).toBeDefined();
    const [row] = await t.db.select().from(sessions).where(eq(sessions.userId, user.id));
    expect(row.expiresAt.getTime()).toBeGreaterThan(soon.getTime() + 4 * 24 * 3600 * 1000);
  });

  it('changes the password: wrong current password is 401 and changes nothing; others sessions end', async () => {
    const { a, email } = await newAccount('old password 12');
    const other = await t.signIn(email, 'old password 12');
    const wrong = await a.post('/api/account/password').send({ currentPassword: 'not it at all', newPassword: 'new password 34' });
    expect(wrong.status).toBe(401);
    expect(wrong.body.error.code).toBe('invalid_credentials');
    expect((await other.get('/api/auth/me')).status).toBe(200);

    const short = await a.post('/api/account/password').send({ currentPassword: 'old password 12', newPassword: 'short' });
    expect(short.status).toBe(400);
    expect(short.body.error.details.fields.newPassword).toBeDefined();

    const ok = await a.post('/api/account/password').send({ currentPassword: 'old password 12', newPassword: 'new password 34', endOtherSessions: true });
    expect(ok.status).toBe(204);
    expect((await a.get('/api/auth/me')).status).toBe(200);
    expect((await other.get('/api/auth/me')).status).toBe(401);
    const oldPw = await t.agent().post('/api/auth/sign-in').send({ email, password: 'old password 12' });
    expect(oldPw.status).toBe(401);
    await t.signIn(email, 'new password 34');
  });

  it('keeps other sessions when endOtherSessions is false', async () => {
    const { a, email } = await newAccount('old password 56');
    const other = await t.signIn(email, 'old password 56');
    const ok = await a.post('/api/account/password').send({ currentPassword: 'old password 56', newPassword: 'new password 78', endOtherSessions: false });
    expect(ok.status).toBe(204);
    expect((await other.get('/api/auth/me')).status).toBe(200);
  });

  it('answers 401 for every account route when signed out', async () => {
    const s = request(t.server);
    expect((await s.patch('/api/account').send({ name: 'x' })).status).toBe(401);
    expect((await s.post('/api/account/password').send({})).status).toBe(401);
    expect((await s.get('/api/account/sessions')).status).toBe(401);
    expect((await s.delete('/api/account/sessions/abc')).status).toBe(401);
  });
});
